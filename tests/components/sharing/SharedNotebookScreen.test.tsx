import type { QueryClient } from '@tanstack/react-query';
import { act, fireEvent, screen, waitFor, within } from '@testing-library/react-native';
import { SharedNotebookScreen } from '../../../components/screens/SharedNotebookScreen';
import type { CellView, NotebookDetail } from '../../../shared/notebook';
import type { CommentView, LiveEvent, PresenterState } from '../../../shared/notebook/sharing';
import { comment } from '../comments/fakeApi';
import { renderWithQueryClient } from '../testUtils';
import { fakeServer } from './fakeServer';
import { FakeEventSource } from '../fakeEventSource';

// Links render as a View carrying their target, so a test can see where they lead.
jest.mock('expo-router', () => {
  const { createElement } = require('react');
  const { View } = require('react-native');
  return { router: { push: jest.fn() }, Link: ({ children, href, testID }: { children: unknown; href: string; testID?: string }) => createElement(View, { testID, accessibilityHint: href }, children) };
});
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
  return { id: 'nb00000001', title: 'Invented two-loop check', summary: 'Shared for reading', ownerId: 'own0000001', ownerName: 'Invented Owner', groupId: null, groupName: null, cellCount: 2, updatedAt: '2026-01-01T00:00:00Z', role, sharedBy: null, canEdit: false, cells: [setup, exponents], datasets: [] };
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
    // -0.33333333333333333333 is the 20-digit rounding of -1/3 (hand division): the table shows −1/3
    // (real minus sign, U+2212) and a tap, allowed to readers too, shows every computed digit.
    fireEvent.press(screen.getByText('\u22121/3'));
    expect(screen.getByText('-0.33333333333333333333')).toBeTruthy();
    // The stored result has an earlier shape than today's contract (no notices, relations, sources): it says so.
    expect(screen.getByTestId('cell-exponents-earlier')).toBeTruthy();
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
    expect(await screen.findByTestId('shared-comment-sign-in')).toHaveTextContent(/Sign in to comment/);
    // Signing in comes back to this page: /sign-in?next=/shared/<token>.
    const back = `/sign-in?next=${encodeURIComponent(`/shared/${TOKEN}`)}`;
    expect(screen.getByTestId('shared-sign-in').props.accessibilityHint).toBe(back);
    expect(screen.getByTestId('shared-nav').props.accessibilityHint).toBe(back);
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

describe('SharedNotebookScreen, live', () => {
  const presenter: PresenterState = { userId: 'own0000001', name: 'Invented Owner', cellId: 'c2', since: '2026-01-01T10:00:00Z' };
  let served: { notebook: NotebookDetail; comments: CommentView[] };

  beforeEach(() => {
    FakeEventSource.instances = [];
    (global as unknown as { EventSource: unknown }).EventSource = FakeEventSource;
    served = { notebook: sharedNotebook('viewer'), comments: [] };
  });
  afterEach(() => {
    delete (global as unknown as { EventSource?: unknown }).EventSource;
  });

  function serve(me: { status: number; body: unknown } = signedOut) {
    return fakeServer({
      'GET /me': me,
      [`GET /shared/${TOKEN}`]: () => ({ status: 200, body: { notebook: served.notebook } }),
      [`GET /shared/${TOKEN}/comments`]: () => ({ status: 200, body: { comments: served.comments } }),
      [`POST /shared/${TOKEN}/comments`]: { status: 201, body: {} },
    });
  }

  async function open() {
    const view = renderWithQueryClient(<SharedNotebookScreen token={TOKEN} />);
    await screen.findByTestId('shared-title');
    const stream = FakeEventSource.instances[0];
    act(() => {
      stream.readyState = FakeEventSource.OPEN;
      stream.onopen?.();
    });
    return { ...view, stream };
  }

  it("follows the link's own read-only stream and refetches the notebook and its comments when it changes", async () => {
    const server = serve();
    const { client, stream } = await open();
    expect(FakeEventSource.instances).toHaveLength(1);
    expect(stream.url).toBe(`/api/shared/${TOKEN}/events`);
    stream.emit({ type: 'hello', role: 'viewer', viewers: [], presenter: null });
    expect(screen.getByTestId('live-status')).toHaveTextContent('Live');
    await settled(client);
    const reads = (path: string) => server.sent('GET', path).length;
    const before = { notebook: reads(`/shared/${TOKEN}`), comments: reads(`/shared/${TOKEN}/comments`) };

    served.notebook = { ...sharedNotebook('viewer'), title: 'Renamed by the owner' };
    served.comments = [comment({ id: 'cmtlive001', notebookId: 'nb00000001', body: 'A new remark' })];
    stream.emit({ type: 'changed', kind: 'comment-added', actorId: 'own0000001', actorName: 'Invented Owner', cellId: null, comments: true });
    await waitFor(() => expect(screen.getByTestId('shared-title')).toHaveTextContent('Renamed by the owner'));
    expect(await screen.findByTestId('comment-body-cmtlive001')).toHaveTextContent('A new remark');
    expect(reads(`/shared/${TOKEN}`)).toBe(before.notebook + 1);
    expect(reads(`/shared/${TOKEN}/comments`)).toBe(before.comments + 1);
    // The link reader never asks the notebook's own routes, which would refuse them.
    expect(server.requests.filter((r) => r.path.startsWith('/notebooks'))).toEqual([]);
    await settled(client);
  });

  it('shows the unknown-link message once the link is revoked, and stops listening', async () => {
    serve();
    const { client, stream } = await open();
    stream.emit({ type: 'hello', role: 'viewer', viewers: [], presenter: null });
    stream.emit({ type: 'revoked' });
    expect(screen.getByTestId('shared-unknown')).toHaveTextContent(UNKNOWN);
    expect(screen.queryByTestId('shared-notebook')).toBeNull();
    expect(stream.readyState).toBe(FakeEventSource.CLOSED);
    await settled(client);
  });

  it("lets a link reader follow a presenter to the presenter's cell, and stop", async () => {
    serve();
    const { client, stream } = await open();
    stream.emit({ type: 'hello', role: 'viewer', viewers: [], presenter });
    expect(screen.getByTestId('presenter-bar')).toHaveTextContent(/^Invented Owner is presenting — at exponents/);
    expect(screen.queryByTestId('highlighted-cell')).toBeNull();
    fireEvent.press(screen.getByTestId('follow-presenter'));
    expect(within(screen.getByTestId('highlighted-cell')).getByTestId('cell-exponents')).toBeTruthy();
    expect(screen.getByTestId('cell-exponents-presenter')).toHaveTextContent('Invented Owner is here');

    stream.emit({ type: 'presenter', presenter: { ...presenter, cellId: 'c1' } });
    expect(within(screen.getByTestId('highlighted-cell')).getByTestId('cell-setup')).toBeTruthy();
    expect(screen.queryByTestId('cell-exponents-presenter')).toBeNull();

    fireEvent.press(screen.getByTestId('stop-following'));
    expect(screen.queryByTestId('highlighted-cell')).toBeNull();
    expect(screen.getByTestId('follow-presenter')).toBeTruthy();
    await settled(client);
  });

  it("shows a cell's threads through the link, with reply but without resolve, edit or delete", async () => {
    served.notebook = sharedNotebook('commenter');
    // The server marks the reader's own fresh comment editable and deletable; through a link it refuses both.
    served.comments = [comment({ id: 'cmtcell001', notebookId: 'nb00000001', cellId: 'c1', cellLabel: 'setup', body: 'On the setup', canEdit: true, canDelete: true })];
    const server = serve({ status: 200, body: { user: { id: 'u000000001', name: 'Invented Author', email: 'a@y.example', siteRole: 'member', emailVerified: true } } });
    const { client } = await open();
    await settled(client);
    fireEvent.press(screen.getByTestId('cell-comments-setup'));
    const panel = await screen.findByTestId('cell-comments-setup-panel');
    expect(await within(panel).findByTestId('comment-body-cmtcell001')).toHaveTextContent('On the setup');
    expect(within(panel).getByTestId('comment-reply-cmtcell001')).toBeTruthy();
    for (const control of ['comment-resolve-cmtcell001', 'comment-edit-cmtcell001', 'comment-delete-cmtcell001']) expect(within(panel).queryByTestId(control)).toBeNull();

    fireEvent.changeText(within(panel).getByTestId('comment-box'), 'Agreed');
    fireEvent.press(within(panel).getByTestId('comment-send'));
    await waitFor(() => expect(server.sent('POST', `/shared/${TOKEN}/comments`).map((r) => r.body)).toEqual([{ body: 'Agreed', cellId: 'c1' }]));
    await settled(client);
  });

  it('gives a signed-out commenter-link reader the threads of a cell read-only', async () => {
    served.notebook = sharedNotebook('commenter');
    served.comments = [comment({ id: 'cmtcell002', notebookId: 'nb00000001', cellId: 'c2', cellLabel: 'exponents', body: 'Check the sign' })];
    serve();
    const { client } = await open();
    await settled(client);
    // A settled client is not a rendered screen: React Query tells the components after a timer, so wait for the count.
    expect(await screen.findByTestId('cell-comments-exponents')).toHaveTextContent('1 comment');
    // No comments on setup and nothing a signed-out reader could write: no button there.
    expect(screen.queryByTestId('cell-comments-setup')).toBeNull();
    fireEvent.press(screen.getByTestId('cell-comments-exponents'));
    const panel = await screen.findByTestId('cell-comments-exponents-panel');
    expect(await within(panel).findByTestId('comment-body-cmtcell002')).toHaveTextContent('Check the sign');
    expect(within(panel).queryByTestId('comment-box')).toBeNull();
    expect(within(panel).queryByTestId('comment-reply-cmtcell002')).toBeNull();
    await settled(client);
  });
});

const UNKNOWN = 'This link does not open anything (it may have expired or been revoked).';
