import { fireEvent, screen } from '@testing-library/react-native';
import { NotebookEditorScreen } from '../../../components/screens/NotebookEditorScreen';
import type { NotebookDetail } from '../../../shared/notebook';
import type { NotebookRole } from '../../../shared/notebook/sharing';
import { renderWithQueryClient } from '../testUtils';
import { FakeEventSource } from '../fakeEventSource';

jest.mock('expo-router', () => ({ router: { push: jest.fn(), navigate: jest.fn() } }));
jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
jest.mock('d3-scale', () => ({ scaleLinear: jest.fn() }));
jest.mock('d3-shape', () => ({ line: jest.fn() }));
jest.mock('../../../components/comments/NotebookComments', () => ({ NotebookComments: () => null }));
jest.mock('../../../components/activity/NotebookActivity', () => ({ NotebookActivity: () => null }));

// The first render loads every screen module, which can take long on a busy machine.
jest.setTimeout(30_000);

// Invented notebook and person for this test.
const me = { id: 'umeinvented01', name: 'Ada Invented', email: 'ada@invented.example', siteRole: 'user', emailVerified: true };

function notebookAs(role: NotebookRole): NotebookDetail {
  return { id: 'nbinvented01', title: 'Invented check', summary: '', ownerId: 'uleadinvented1', ownerName: 'Invented Lead', groupId: null, groupName: null, cellCount: 0, updatedAt: '2026-01-01T00:00:00Z', role, sharedBy: null, canEdit: role === 'owner' || role === 'editor', cells: [], datasets: [] };
}

let served: NotebookDetail;
beforeEach(() => {
  (global as unknown as { EventSource: unknown }).EventSource = FakeEventSource;
  global.fetch = jest.fn((url: string) => {
    const path = url.replace(/^\/api/, '');
    const body = path === '/me' ? { user: me } : path === `/notebooks/${served.id}` ? { notebook: served } : null;
    return Promise.resolve({ ok: body !== null, status: body ? 200 : 404, json: async () => body ?? { error: { code: 'not_found', message: 'No such thing' } } });
  }) as unknown as typeof fetch;
});
afterEach(() => {
  delete (global as unknown as { EventSource?: unknown }).EventSource;
});

describe('the Data chip of the notebook', () => {
  it('opens the Data panel above the cells, with the upload form for an editor', async () => {
    served = notebookAs('editor');
    renderWithQueryClient(<NotebookEditorScreen notebookId={served.id} />);
    await screen.findByText(served.title);
    expect(screen.queryByTestId('dataset-panel')).toBeNull();
    fireEvent.press(screen.getByTestId('data-toggle'));
    expect(screen.getByTestId('dataset-panel')).toBeTruthy();
    expect(screen.getByTestId('dataset-paste')).toBeTruthy();
    fireEvent.press(screen.getByTestId('data-toggle'));
    expect(screen.queryByTestId('dataset-panel')).toBeNull();
  });

  it('shows a commenter the panel without the upload form', async () => {
    served = notebookAs('commenter');
    renderWithQueryClient(<NotebookEditorScreen notebookId={served.id} />);
    await screen.findByText(served.title);
    fireEvent.press(screen.getByTestId('data-toggle'));
    expect(screen.getByTestId('dataset-none')).toHaveTextContent('No datasets yet.');
    expect(screen.queryByTestId('dataset-paste')).toBeNull();
  });
});
