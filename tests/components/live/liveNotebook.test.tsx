import { act, fireEvent, screen, waitFor, within } from '@testing-library/react-native';
import { NotebookEditorScreen } from '../../../components/screens/NotebookEditorScreen';
import { NotebookPresentScreen } from '../../../components/screens/NotebookPresentScreen';
import type { CellView, NotebookDetail } from '../../../shared/notebook';
import type { LiveEvent, NotebookRole, PresenterState } from '../../../shared/notebook/sharing';
import { renderWithQueryClient } from '../testUtils';
import { FakeEventSource } from '../fakeEventSource';

jest.mock('expo-router', () => ({ router: { push: jest.fn(), navigate: jest.fn() } }));
const { router } = jest.requireMock<{ router: { push: jest.Mock } }>('expo-router');
jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
jest.mock('d3-scale', () => ({ scaleLinear: jest.fn() }));
jest.mock('d3-shape', () => ({ line: jest.fn() }));
// The comment and history panels have their own tests; here they only need to be present.
jest.mock('../../../components/comments/NotebookComments', () => ({ NotebookComments: () => null }));
jest.mock('../../../components/activity/NotebookActivity', () => ({ NotebookActivity: () => null }));

// The first render loads every screen module, which can take long on a busy machine.
jest.setTimeout(30_000);

const me = { id: 'umeinvented01', name: 'Ada Invented', email: 'ada@invented.example', siteRole: 'user', emailVerified: true };
const lead: PresenterState = { userId: 'uleadinvented1', name: 'Invented Lead', cellId: 'cellsetup0001', since: '2026-01-01T10:00:00Z' };

function cell(overrides: Partial<CellView>): CellView {
  return { id: 'cellsetup0001', position: 0, label: 'setup', kind: 'setup', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 30 }, revision: 1, state: 'never-run', dependents: [], lastRun: null, updatedAt: '2026-01-01T00:00:00Z', ...overrides };
}
const cells = [cell({ dependents: ['exponents'] }), cell({ id: 'cellexpon0002', position: 1, label: 'exponents', kind: 'exponents', input: { kind: 'exponents', uses: 'setup' } })];

function notebookAs(role: NotebookRole, title = 'Invented check'): NotebookDetail {
  return { id: 'nbinvented01', title, summary: '', ownerId: 'uleadinvented1', ownerName: 'Invented Lead', groupId: null, groupName: null, cellCount: 2, updatedAt: '2026-01-01T00:00:00Z', role, sharedBy: role === 'owner' ? null : { personName: 'Invented Lead', groupName: null }, canEdit: role === 'owner' || role === 'editor', cells, datasets: [] };
}

/** What the fake server answers; a test changes it between events. */
let served: { notebook: NotebookDetail; holdNotebook: boolean };
let requests: { method: string; path: string; body: unknown }[];

function reply(status: number, body: unknown) {
  return Promise.resolve({ ok: status >= 200 && status < 300, status, json: async () => body });
}

beforeEach(() => {
  FakeEventSource.instances = [];
  (global as unknown as { EventSource: unknown }).EventSource = FakeEventSource;
  served = { notebook: notebookAs('owner'), holdNotebook: false };
  requests = [];
  global.fetch = jest.fn((url: string, init: { method: string; body?: string }) => {
    const path = url.replace(/^\/api/, '');
    requests.push({ method: init.method, path, body: init.body ? JSON.parse(init.body) : undefined });
    if (path === '/me') return reply(200, { user: me });
    if (path === `/notebooks/${served.notebook.id}`) return served.holdNotebook ? new Promise(() => undefined) : reply(200, { notebook: served.notebook });
    if (path.endsWith('/presentation')) return reply(204, null);
    return reply(404, { error: { code: 'not_found', message: 'No such thing' } });
  }) as unknown as typeof fetch;
});

afterEach(() => {
  delete (global as unknown as { EventSource?: unknown }).EventSource;
});

const notebookReads = () => requests.filter((request) => request.method === 'GET' && request.path === `/notebooks/${served.notebook.id}`).length;
const presentationCalls = () => requests.filter((request) => request.path.endsWith('/presentation')).map(({ method, body }) => ({ method, body }));

async function openEditor(focusCellId?: string) {
  const view = renderWithQueryClient(<NotebookEditorScreen notebookId={served.notebook.id} focusCellId={focusCellId} />);
  await screen.findByText(served.notebook.title);
  await waitFor(() => expect(requests.some((request) => request.path === '/me')).toBe(true));
  const stream = FakeEventSource.instances[0];
  return { ...view, stream };
}

function hello(stream: FakeEventSource, role: NotebookRole, presenter: PresenterState | null = null) {
  stream.open();
  stream.emit({ type: 'hello', role, presenter, viewers: [{ userId: me.id, name: me.name, presenting: false }, { userId: lead.userId, name: lead.name, presenting: presenter !== null }] });
}

describe('the notebook live stream', () => {
  it('opens the notebook\'s event stream with the session cookie and lists the others looking at it', async () => {
    const { stream } = await openEditor();
    expect(FakeEventSource.instances).toHaveLength(1);
    expect(stream.url).toBe('/api/notebooks/nbinvented01/events');
    expect(stream.init).toEqual({ withCredentials: true });
    hello(stream, 'owner');
    expect(screen.getByTestId('live-status')).toHaveTextContent('Live');
    expect(screen.getByTestId('presence-list')).toHaveTextContent(/Invented Lead$/);
    expect(screen.getByTestId('presence-list')).not.toHaveTextContent(/Ada Invented/);
    expect(screen.getByTestId(`presence-${lead.userId}`)).toHaveTextContent('IL');
    expect(screen.queryByTestId(`presence-${me.id}`)).toBeNull();
  });

  it('refetches the notebook when someone changes it', async () => {
    const { stream } = await openEditor();
    hello(stream, 'owner');
    expect(notebookReads()).toBe(1);
    served.notebook = notebookAs('owner', 'Renamed by a colleague');
    stream.emit({ type: 'changed', kind: 'notebook-edited', actorId: lead.userId, actorName: lead.name, cellId: null, comments: false });
    expect(await screen.findByText('Renamed by a colleague')).toBeTruthy();
    expect(notebookReads()).toBe(2);
  });

  it('shows reconnecting when the stream drops and refetches the notebook once it is back', async () => {
    const { stream } = await openEditor();
    hello(stream, 'owner');
    stream.drop();
    expect(screen.getByTestId('live-status')).toHaveTextContent('Reconnecting…');
    served.notebook = notebookAs('owner', 'Edited while the stream was down');
    hello(stream, 'owner');
    expect(await screen.findByText('Edited while the stream was down')).toBeTruthy();
    expect(screen.getByTestId('live-status')).toHaveTextContent('Live');
  });

  it('takes editing away at once when the role drops to viewer, and gives it back', async () => {
    const { stream } = await openEditor();
    hello(stream, 'owner');
    for (const control of ['run-all', 'add-cell', 'save-version', 'share-button', 'notebook-rename', 'cell-setup-menu']) expect(screen.getByTestId(control)).toBeTruthy();
    expect(screen.getByTestId('role-badge')).toHaveTextContent('Owner');
    // The refetch never answers: the controls must follow the event itself.
    served.holdNotebook = true;
    stream.emit({ type: 'role', role: 'viewer' });
    expect(screen.getByTestId('role-badge')).toHaveTextContent('Viewer');
    for (const control of ['run-all', 'add-cell', 'save-version', 'share-button', 'notebook-rename', 'cell-setup-menu']) expect(screen.queryByTestId(control)).toBeNull();
    expect(screen.getByTestId('cell-setup')).toBeTruthy();
    stream.emit({ type: 'role', role: 'editor' });
    expect(screen.getByTestId('role-badge')).toHaveTextContent('Editor');
    expect(screen.getByTestId('run-all')).toBeTruthy();
    expect(screen.getByTestId('cell-setup-menu')).toBeTruthy();
  });

  it('gives every role the way to the people with access: Share for those who manage it, People for the others', async () => {
    served.notebook = notebookAs('commenter');
    const { stream } = await openEditor();
    hello(stream, 'commenter');
    expect(screen.queryByTestId('share-button')).toBeNull();
    expect(screen.getByTestId('role-badge')).toHaveTextContent('Commenter');
    router.push.mockClear();
    fireEvent.press(screen.getByTestId('people-button'));
    expect(router.push).toHaveBeenCalledWith('/notebooks/nbinvented01/sharing');
    stream.emit({ type: 'role', role: 'editor' });
    expect(screen.queryByTestId('people-button')).toBeNull();
    router.push.mockClear();
    fireEvent.press(screen.getByTestId('share-button'));
    expect(router.push).toHaveBeenCalledWith('/notebooks/nbinvented01/sharing');
  });

  it('says access was removed and stops listening', async () => {
    const { stream } = await openEditor();
    hello(stream, 'editor');
    stream.emit({ type: 'revoked' });
    expect(screen.getByTestId('access-removed')).toHaveTextContent(/Your access to this notebook was removed/);
    expect(screen.queryByTestId('cell-setup')).toBeNull();
    expect(stream.readyState).toBe(FakeEventSource.CLOSED);
  });

  it('highlights the cell named by the link it was opened with', async () => {
    await openEditor('cellexpon0002');
    expect(within(screen.getByTestId('highlighted-cell')).getByTestId('cell-exponents')).toBeTruthy();
  });
});

describe('following a presenter', () => {
  it('moves the notebook to the presenter\'s cell until following stops', async () => {
    const { stream } = await openEditor();
    hello(stream, 'commenter', lead);
    expect(screen.getByTestId('presenter-bar')).toHaveTextContent(/^Invented Lead is presenting — at setup/);
    expect(screen.queryByTestId('cell-setup-presenter')).toBeNull();

    fireEvent.press(screen.getByTestId('follow-presenter'));
    expect(screen.getByTestId('cell-setup-presenter')).toBeTruthy();
    stream.emit({ type: 'presenter', presenter: { ...lead, cellId: 'cellexpon0002' } });
    expect(screen.getByTestId('presenter-bar')).toHaveTextContent(/^Following Invented Lead — at exponents/);
    expect(within(screen.getByTestId('highlighted-cell')).getByTestId('cell-exponents')).toBeTruthy();
    expect(screen.getByTestId('cell-exponents-presenter')).toBeTruthy();
    expect(screen.queryByTestId('cell-setup-presenter')).toBeNull();

    fireEvent.press(screen.getByTestId('stop-following'));
    expect(screen.queryByTestId('cell-exponents-presenter')).toBeNull();
    stream.emit({ type: 'presenter', presenter: { ...lead, cellId: 'cellsetup0001' } });
    expect(within(screen.getByTestId('highlighted-cell')).getByTestId('cell-exponents')).toBeTruthy();
    expect(screen.getByTestId('follow-presenter')).toBeTruthy();
  });

  it('ends following when the presenter stops', async () => {
    const { stream } = await openEditor();
    hello(stream, 'viewer', lead);
    fireEvent.press(screen.getByTestId('follow-presenter'));
    stream.emit({ type: 'presenter', presenter: null });
    expect(screen.queryByTestId('presenter-bar')).toBeNull();
    expect(screen.getByTestId('presenter-ended')).toHaveTextContent('Invented Lead stopped presenting.');
  });

  it('turns the slides of someone following the presentation, who never presents themselves', async () => {
    served.notebook = notebookAs('commenter');
    renderWithQueryClient(<NotebookPresentScreen notebookId={served.notebook.id} />);
    expect(await screen.findByTestId('presentation-counter')).toHaveTextContent('1 / 2');
    await waitFor(() => expect(requests.some((request) => request.path === '/me')).toBe(true));
    hello(FakeEventSource.instances[0], 'commenter', lead);
    fireEvent.press(screen.getByTestId('follow-presenter'));
    FakeEventSource.instances[0].emit({ type: 'presenter', presenter: { ...lead, cellId: 'cellexpon0002' } });
    expect(screen.getByTestId('presentation-counter')).toHaveTextContent('2 / 2');
    expect(screen.getByTestId('slide-exponents')).toBeTruthy();
    expect(presentationCalls()).toEqual([]);
  });

  async function presentAsOwner() {
    const view = renderWithQueryClient(<NotebookPresentScreen notebookId={served.notebook.id} />);
    await screen.findByTestId('presentation-counter');
    await waitFor(() => expect(requests.some((request) => request.path === '/me')).toBe(true));
    expect(presentationCalls()).toEqual([]);
    const stream = FakeEventSource.instances[0];
    hello(stream, 'owner');
    await waitFor(() => expect(presentationCalls()).toEqual([{ method: 'POST', body: { cellId: 'cellsetup0001' } }]));
    stream.emit({ type: 'presenter', presenter: { userId: me.id, name: me.name, cellId: 'cellsetup0001', since: '2026-01-01T10:00:00Z' } });
    return { ...view, stream };
  }

  it('posts the presenter\'s current cell as they move and stops on leaving', async () => {
    const view = await presentAsOwner();
    expect(screen.getByTestId('presenting-self')).toHaveTextContent(/1 other person has the notebook open/);
    fireEvent.press(screen.getByTestId('presentation-next'));
    await waitFor(() => expect(presentationCalls()).toHaveLength(2));
    expect(presentationCalls()[1]).toEqual({ method: 'POST', body: { cellId: 'cellexpon0002' } });
    view.unmount();
    expect(presentationCalls()[2]).toEqual({ method: 'DELETE', body: undefined });
  });

  it('leaves a presentation someone else took over running', async () => {
    const view = await presentAsOwner();
    view.stream.emit({ type: 'presenter', presenter: lead });
    expect(screen.getByTestId('presenter-bar')).toHaveTextContent(/^Invented Lead is presenting/);
    fireEvent.press(screen.getByTestId('presentation-next'));
    view.unmount();
    expect(presentationCalls()).toEqual([{ method: 'POST', body: { cellId: 'cellsetup0001' } }]);
  });

  it('does not take over while someone else presents', async () => {
    renderWithQueryClient(<NotebookPresentScreen notebookId={served.notebook.id} />);
    await screen.findByTestId('presentation-counter');
    await waitFor(() => expect(requests.some((request) => request.path === '/me')).toBe(true));
    hello(FakeEventSource.instances[0], 'owner', lead);
    fireEvent.press(screen.getByTestId('presentation-next'));
    expect(screen.getByTestId('presenter-bar')).toHaveTextContent(/^Invented Lead is presenting/);
    expect(presentationCalls()).toEqual([]);
  });
});

describe('without EventSource (native)', () => {
  it('says updates come by polling and refetches the notebook every 5 s', async () => {
    delete (global as unknown as { EventSource?: unknown }).EventSource;
    jest.useFakeTimers();
    try {
      renderWithQueryClient(<NotebookEditorScreen notebookId={served.notebook.id} />);
      await screen.findByText(served.notebook.title);
      expect(screen.getByTestId('live-status')).toHaveTextContent('Updates every 5 s');
      const before = notebookReads();
      await act(async () => {
        jest.advanceTimersByTime(5000);
      });
      await waitFor(() => expect(notebookReads()).toBe(before + 1));
    } finally {
      jest.useRealTimers();
    }
  });
});
