import type { QueryClient } from '@tanstack/react-query';
import { screen, waitFor } from '@testing-library/react-native';
import { SharedNotebookScreen } from '../../../components/screens/SharedNotebookScreen';
import type { CellView, NotebookDetail } from '../../../shared/notebook';
import { renderWithQueryClient } from '../testUtils';
import { fakeServer } from './fakeServer';

jest.mock('expo-router', () => ({ router: { push: jest.fn() }, Link: ({ children }: { children: unknown }) => children }));
jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
jest.mock('d3-scale', () => ({ scaleLinear: jest.fn() }));
jest.mock('d3-shape', () => ({ line: jest.fn() }));

const TOKEN = 'Abcdefghijklmnopqrstuvwxyz0123456789_-ABCDE';
const run = { id: 'run0000001', status: 'done' as const, progress: 1, cached: false, engineVersion: 'engine-test', durationMs: 210, error: null, startedAt: null, finishedAt: null, queue: null };
const setup: CellView = { id: 'c1', position: 0, label: 'setup', kind: 'setup', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 30 }, revision: 1, state: 'never-run', dependents: ['exponents'], lastRun: null, updatedAt: '2026-01-01T00:00:00Z' };
const exponents: CellView = {
  ...setup, id: 'c2', position: 1, label: 'exponents', kind: 'exponents', input: { kind: 'exponents', uses: 'setup' }, state: 'up-to-date', dependents: [],
  lastRun: { ...run, result: { eps: '0.5', fixedPoint: 'Ising', series: { nuInv: ['1.75', '-0.33333333333333333333'] }, values: { nuInv: '1.58' } } },
};

function sharedNotebook(role: 'viewer' | 'commenter'): NotebookDetail {
  return { id: 'nb00000001', title: 'Invented two-loop check', summary: 'Shared for reading', ownerId: 'own0000001', ownerName: 'Invented Owner', groupId: null, groupName: null, cellCount: 2, updatedAt: '2026-01-01T00:00:00Z', role, sharedBy: null, canEdit: false, cells: [setup, exponents] };
}

const signedOut = { status: 401, body: { error: { code: 'unauthenticated', message: 'Sign in first' } } };
const settled = (client: QueryClient) => waitFor(() => expect(client.isFetching()).toBe(0));

describe('SharedNotebookScreen', () => {
  it('shows the notebook read-only: banner, cells and results, no editing or running', async () => {
    fakeServer({ 'GET /me': signedOut, [`GET /shared/${TOKEN}`]: { status: 200, body: { notebook: sharedNotebook('viewer') } } });
    const { client } = renderWithQueryClient(<SharedNotebookScreen token={TOKEN} />);
    expect(await screen.findByTestId('shared-title')).toHaveTextContent('Invented two-loop check');
    expect(screen.getByTestId('shared-banner')).toHaveTextContent('Read-only view through a shared link');
    expect(screen.getByTestId('cell-exponents-state')).toHaveTextContent('Up to date');
    expect(screen.getByText('-0.33333333333333333333')).toBeTruthy();
    for (const label of ['setup', 'exponents']) {
      for (const control of ['run', 'edit', 'menu', 'save', 'cancel']) expect(screen.queryByTestId(`cell-${label}-${control}`)).toBeNull();
    }
    expect(screen.queryByRole('button', { name: /^(Run|Edit|Delete|Cancel|Move)|^Save$/ })).toBeNull();
    expect(screen.queryByTestId('shared-comment-sign-in')).toBeNull();
    await settled(client);
  });

  it('asks a signed-out holder of a commenter link to sign in to comment', async () => {
    fakeServer({ 'GET /me': signedOut, [`GET /shared/${TOKEN}`]: { status: 200, body: { notebook: sharedNotebook('commenter') } } });
    const { client } = renderWithQueryClient(<SharedNotebookScreen token={TOKEN} />);
    // The link itself (testID shared-sign-in on web) is reduced to its text by the expo-router mock.
    expect(await screen.findByTestId('shared-comment-sign-in')).toHaveTextContent(/Sign in to comment/);
    await settled(client);
  });

  it('says plainly that an unknown, expired or revoked link opens nothing', async () => {
    fakeServer({ 'GET /me': signedOut, [`GET /shared/${TOKEN}`]: { status: 404, body: { error: { code: 'not_found', message: 'No such notebook.' } } } });
    const { client } = renderWithQueryClient(<SharedNotebookScreen token={TOKEN} />);
    expect(await screen.findByTestId('shared-unknown')).toHaveTextContent('This link does not open anything (it may have expired or been revoked).');
    expect(screen.queryByTestId('shared-notebook')).toBeNull();
    await settled(client);
  });

  it('does not even ask the server about a malformed link', async () => {
    const server = fakeServer({ 'GET /me': signedOut });
    const { client } = renderWithQueryClient(<SharedNotebookScreen token="too-short" />);
    expect(await screen.findByTestId('shared-unknown')).toHaveTextContent(/does not open anything/);
    await settled(client);
    expect(server.requests.filter((r) => r.path.startsWith('/shared'))).toEqual([]);
  });
});
