import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { NotebookComments } from '../../../components/comments/NotebookComments';
import { CellCard } from '../../../components/notebook/CellCard';
import { commentKeys } from '../../../hooks/api/comments';
import type { CellView, NotebookDetail } from '../../../shared/notebook';
import type { NotebookRole } from '../../../shared/notebook/sharing';
import { renderWithQueryClient } from '../testUtils';
import { comment, fakeApi } from './fakeApi';

jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
jest.mock('d3-scale', () => ({ scaleLinear: jest.fn() }));
jest.mock('d3-shape', () => ({ line: jest.fn() }));

const note: CellView = { id: 'cell000001', position: 0, label: 'remark', kind: 'note', input: { kind: 'note', text: 'A remark.' }, revision: 1, state: 'never-run', dependents: [], lastRun: null, updatedAt: '2026-01-01T00:00:00Z' };

function notebookAs(role: NotebookRole): NotebookDetail {
  const canEdit = role === 'editor' || role === 'owner';
  return { id: 'nb00000001', title: 'Invented check', summary: '', ownerId: 'u000000009', ownerName: 'Invented Lead', groupId: null, groupName: null, cellCount: 1, updatedAt: '2026-01-01T00:00:00Z', role, sharedBy: null, canEdit, cells: [note], datasets: [] };
}

const onCell = comment({ id: 'cmt0000001', cellId: 'cell000001', cellLabel: 'remark', body: 'Is the sign right?' });
const reply = comment({ id: 'cmt0000002', cellId: 'cell000001', cellLabel: 'remark', parentId: 'cmt0000001', body: 'Yes.' });
const onNotebook = comment({ id: 'cmt0000003', body: 'Whole notebook looks fine.' });
const resolvedOnCell = comment({ id: 'cmt0000004', cellId: 'cell000001', cellLabel: 'remark', body: 'Typo.', resolvedAt: '2026-11-30T10:00:00.000Z', resolvedByName: 'Invented Lead' });

const renderCard = (role: NotebookRole) => renderWithQueryClient(<CellCard notebook={notebookAs(role)} cell={note} index={0} wide selected={false} onSelect={jest.fn()} />);

describe('comments on a cell', () => {
  it('counts the cell’s comments from what the notebook already loaded, without a request per cell', async () => {
    const fetchMock = fakeApi({});
    const { client } = renderCard('commenter');
    expect(screen.getByTestId('cell-comments-remark')).toHaveTextContent('Comment');
    // Two visible comments on this cell (root + reply); the notebook-wide one does not count.
    client.setQueryData(commentKeys.list('nb00000001'), [onCell, reply, onNotebook]);
    await waitFor(() => expect(screen.getByTestId('cell-comments-remark')).toHaveTextContent('2 comments'));
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('opens the cell’s threads inline with a box for a new one', async () => {
    fakeApi({ 'GET /api/notebooks/nb00000001/comments': { status: 200, body: { comments: [onCell, reply, onNotebook] } } });
    renderCard('commenter');
    fireEvent.press(screen.getByTestId('cell-comments-remark'));
    expect(await screen.findByTestId('comment-thread-cmt0000001')).toBeTruthy();
    expect(screen.getByTestId('comment-body-cmt0000002')).toHaveTextContent('Yes.');
    expect(screen.queryByTestId('comment-thread-cmt0000003')).toBeNull();
    expect(screen.getByTestId('comment-box')).toBeTruthy();
  });

  it('is read-only for a viewer', async () => {
    fakeApi({ 'GET /api/notebooks/nb00000001/comments': { status: 200, body: { comments: [onCell] } } });
    renderCard('viewer');
    fireEvent.press(screen.getByTestId('cell-comments-remark'));
    expect(await screen.findByTestId('comment-thread-cmt0000001')).toBeTruthy();
    expect(screen.queryByTestId('comment-box')).toBeNull();
    expect(screen.queryByTestId('comment-reply-cmt0000001')).toBeNull();
  });

  it('posts a new thread anchored on the cell', async () => {
    const post = jest.fn(() => ({ status: 201, body: { comment: onCell } }));
    fakeApi({ 'GET /api/notebooks/nb00000001/comments': { status: 200, body: { comments: [] } }, 'POST /api/notebooks/nb00000001/comments': post });
    renderCard('commenter');
    fireEvent.press(screen.getByTestId('cell-comments-remark'));
    fireEvent.changeText(await screen.findByTestId('comment-box'), 'Check $\\eta$ at two loops');
    fireEvent.press(screen.getByTestId('comment-send'));
    await waitFor(() => expect(post).toHaveBeenCalledTimes(1));
    const call = (global.fetch as jest.Mock).mock.calls.find(([, init]) => init?.method === 'POST');
    expect(JSON.parse(String(call[1].body))).toEqual({ body: 'Check $\\eta$ at two loops', cellId: 'cell000001' });
  });
});

describe('NotebookComments', () => {
  it('shows notebook threads and cell threads, open or resolved', async () => {
    fakeApi({ 'GET /api/notebooks/nb00000001/comments': { status: 200, body: { comments: [onCell, reply, onNotebook, resolvedOnCell] } } });
    renderWithQueryClient(<NotebookComments notebookId="nb00000001" role="commenter" />);
    expect(await screen.findByTestId('comment-thread-cmt0000003')).toBeTruthy();
    expect(screen.getByTestId('comment-thread-cmt0000001')).toBeTruthy();
    expect(screen.queryByTestId('comment-thread-cmt0000004')).toBeNull();
    expect(screen.getByTestId('comments-filter-open')).toHaveTextContent('Open (2)');
    fireEvent.press(screen.getByTestId('comments-filter-resolved'));
    expect(screen.getByTestId('comment-thread-cmt0000004')).toBeTruthy();
    expect(screen.queryByTestId('comment-thread-cmt0000001')).toBeNull();
  });

  it('reads and writes through the share link when opened by one', async () => {
    const fetchMock = fakeApi({ 'GET /api/shared/tok/comments': { status: 200, body: { comments: [onNotebook] } } });
    renderWithQueryClient(<NotebookComments notebookId="nb00000001" role="viewer" shareToken="tok" />);
    expect(await screen.findByTestId('comment-thread-cmt0000003')).toBeTruthy();
    expect(fetchMock).toHaveBeenCalledWith('/api/shared/tok/comments', expect.anything());
    expect(screen.queryByTestId('notebook-comment-box')).toBeNull();
  });
});
