import type { QueryClient } from '@tanstack/react-query';
import { fireEvent, screen } from '@testing-library/react-native';
import { NotebooksScreen } from '../../../components/screens/NotebooksScreen';
import type { NotebookSummary } from '../../../shared/notebook';
import { renderWithQueryClient } from '../testUtils';
import { fakeServer } from './fakeServer';

jest.mock('expo-router', () => ({ router: { push: jest.fn() }, Link: ({ children }: { children: unknown }) => children }));
jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText>{tex}</MockText> };
});

function summary(overrides: Partial<NotebookSummary>): NotebookSummary {
  return { id: 'nb00000001', title: 'Mine', summary: '', ownerId: 'me00000001', ownerName: 'Invented Me', groupId: null, groupName: null, cellCount: 2, updatedAt: '2026-01-01T00:00:00Z', role: 'owner', sharedBy: null, canEdit: true, ...overrides };
}

const mine = summary({});
const fromPerson = summary({ id: 'nb00000002', title: 'From a colleague', ownerId: 'col0000001', ownerName: 'Invented Colleague', role: 'commenter', sharedBy: { personName: 'Invented Colleague', groupName: null }, canEdit: false });
const throughGroup = summary({ id: 'nb00000003', title: 'Group work', ownerId: 'ldr0000001', ownerName: 'Invented Lead', role: 'editor', sharedBy: { personName: 'Invented Lead', groupName: 'Invented Group' }, canEdit: true });
const group = { id: 'grp0000001', name: 'Invented Group', description: '', myRole: 'member', memberCount: 3 };

const settled = (client: QueryClient) => eventually(() => expect(client.isFetching()).toBe(0));

/**
 * Poll with plain sleeps. waitFor (and polling inside act) never saw the filtered list arrive in this
 * screen, while plain sleeps see it within a few polls.
 */
async function eventually(check: () => void, attempts = 100) {
  for (let attempt = 1; ; attempt++) {
    try {
      return check();
    } catch (error) {
      if (attempt >= attempts) throw error;
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
  }
}

describe('NotebooksScreen filters', () => {
  it('shows my role on every row and how shared notebooks reach me', async () => {
    fakeServer({ 'GET /notebooks': { status: 200, body: { notebooks: [mine, fromPerson, throughGroup] } } });
    const { client } = renderWithQueryClient(<NotebooksScreen />);
    expect(await screen.findByTestId('notebook-nb00000001-role')).toHaveTextContent('Owner');
    expect(screen.queryByTestId('notebook-nb00000001-shared-by')).toBeNull();
    expect(screen.getByTestId('notebook-nb00000002-role')).toHaveTextContent('Commenter');
    expect(screen.getByTestId('notebook-nb00000002-shared-by')).toHaveTextContent('shared by Invented Colleague');
    expect(screen.getByTestId('notebook-nb00000003-role')).toHaveTextContent('Editor');
    expect(screen.getByTestId('notebook-nb00000003-shared-by')).toHaveTextContent('via Invented Group');
    await settled(client);
  });

  it('asks the server for filter=shared, then for one of my groups, keeping the search', async () => {
    const server = fakeServer({
      'GET /notebooks': { status: 200, body: { notebooks: [mine, fromPerson, throughGroup] } },
      'GET /notebooks?filter=shared': { status: 200, body: { notebooks: [fromPerson, throughGroup] } },
      'GET /notebooks?q=work&filter=shared': { status: 200, body: { notebooks: [throughGroup] } },
      'GET /notebooks?q=work&filter=group': { status: 200, body: { notebooks: [throughGroup] } },
      'GET /notebooks?q=work&filter=group&groupId=grp0000001': { status: 200, body: { notebooks: [] } },
      'GET /groups': { status: 200, body: { groups: [group] } },
    });
    const { client } = renderWithQueryClient(<NotebooksScreen />);
    fireEvent.press(await screen.findByTestId('notebook-filter-shared'));
    await eventually(() => expect(screen.queryByTestId('notebook-nb00000001')).toBeNull());
    expect(server.requests.map((r) => r.path)).toContain('/notebooks?filter=shared');

    fireEvent.changeText(screen.getByTestId('notebook-search'), 'work');
    await eventually(() => expect(screen.queryByTestId('notebook-nb00000002')).toBeNull());
    fireEvent.press(screen.getByTestId('notebook-filter-group'));
    await eventually(() => screen.getByTestId(`notebook-filter-group-${group.id}`));
    fireEvent.press(screen.getByTestId(`notebook-filter-group-${group.id}`));
    await eventually(() => screen.getByTestId('notebooks-no-match'));
    expect(screen.getByTestId('notebooks-no-match')).toHaveTextContent('No notebook shared with your groups matches “work”.');
    expect(server.requests.map((r) => r.path)).toEqual(expect.arrayContaining(['/notebooks?q=work&filter=group', `/notebooks?q=work&filter=group&groupId=${group.id}`]));
    await settled(client);
  }, 30_000);
});
