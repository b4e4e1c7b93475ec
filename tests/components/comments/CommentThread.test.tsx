import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { CommentComposer } from '../../../components/comments/CommentComposer';
import { CommentThread } from '../../../components/comments/CommentThread';
import { groupThreads } from '../../../components/comments/threads';
import { COMMENT_EDIT_WINDOW_MS, type CommentView } from '../../../shared/notebook/sharing';
import { renderWithQueryClient } from '../testUtils';
import { comment, fakeApi } from './fakeApi';

const people = [
  { id: 'u000000002', name: 'Imre Sample', handle: 'imre' },
  { id: 'u000000003', name: 'Sunniva Sample', handle: 'sunniva' },
  { id: 'u000000004', name: 'Ines Sample', handle: 'ines.k' },
];

function renderComposer() {
  const onSubmit = jest.fn(async () => undefined);
  const view = renderWithQueryClient(
    <CommentComposer notebookId="nb00000001" mentions placeholder="Comment" submitLabel="Comment" onSubmit={onSubmit} boxTestID="comment-box" sendTestID="comment-send" />,
  );
  return { ...view, onSubmit };
}

describe('mention autocomplete', () => {
  beforeEach(() => {
    // Like the server: handle starts with, or name contains, the letters typed after @.
    fakeApi({
      'GET /api/notebooks/nb00000001/mention-candidates': (url) => {
        const wanted = new URL(url, 'http://x').searchParams.get('q')!.toLowerCase();
        return { status: 200, body: { people: people.filter((p) => p.handle.startsWith(wanted) || p.name.toLowerCase().includes(wanted)) } };
      },
    });
  });

  it('offers people after @ and inserts the chosen handle on tap', async () => {
    const { onSubmit } = renderComposer();
    fireEvent.changeText(screen.getByTestId('comment-box'), 'Please check this @Im');
    fireEvent.press(await screen.findByTestId('mention-option-imre'));
    expect(screen.getByTestId('comment-box')).toHaveProp('value', 'Please check this @imre ');
    expect(global.fetch).toHaveBeenCalledWith('/api/notebooks/nb00000001/mention-candidates?q=Im', expect.anything());
    // Once inserted, the list closes; sending hands over the text with the handle.
    expect(screen.queryByTestId('mention-option-imre')).toBeNull();
    fireEvent.press(screen.getByTestId('comment-send'));
    await waitFor(() => expect(onSubmit).toHaveBeenCalledWith('Please check this @imre'));
  });

  it('moves through the choices with the arrow keys and takes one with Enter', async () => {
    renderComposer();
    const box = screen.getByTestId('comment-box');
    fireEvent.changeText(box, '@i');
    // Offered in the server's order: imre, sunniva (name contains i), ines.k; the first is highlighted.
    await screen.findByTestId('mention-option-ines.k');
    expect(screen.getByTestId('mention-option-imre')).toHaveProp('accessibilityState', { selected: true });
    const preventDefault = jest.fn();
    for (const key of ['ArrowDown', 'ArrowDown', 'ArrowDown', 'ArrowUp']) fireEvent(box, 'keyPress', { nativeEvent: { key }, preventDefault });
    // Down three times wraps back to imre; up once from there lands on the last, ines.k.
    expect(screen.getByTestId('mention-option-ines.k')).toHaveProp('accessibilityState', { selected: true });
    fireEvent(box, 'keyPress', { nativeEvent: { key: 'Enter' }, preventDefault });
    expect(screen.getByTestId('comment-box')).toHaveProp('value', '@ines.k ');
    expect(preventDefault).toHaveBeenCalledTimes(5);
  });

  it('does not open for an address being typed', async () => {
    renderComposer();
    fireEvent.changeText(screen.getByTestId('comment-box'), 'mail imre@');
    await waitFor(() => expect(global.fetch).not.toHaveBeenCalled());
    expect(screen.queryByTestId('mention-option-imre')).toBeNull();
  });
});

function renderThread(comments: CommentView[], role: 'viewer' | 'commenter' | 'owner' = 'commenter') {
  const [thread] = groupThreads(comments);
  return renderWithQueryClient(<CommentThread notebookId="nb00000001" role={role} thread={thread} />);
}

const minutesAgo = (minutes: number) => new Date(Date.now() - minutes * 60_000).toISOString();

describe('CommentThread', () => {
  beforeEach(() => {
    fakeApi({});
  });

  it('offers Edit on an own comment inside the edit window and not after it', () => {
    const insideMinutes = COMMENT_EDIT_WINDOW_MS / 60_000 - 5;
    const fresh = comment({ id: 'cmt0000001', canEdit: true, canDelete: true, createdAt: minutesAgo(insideMinutes) });
    const old = comment({ id: 'cmt0000002', parentId: 'cmt0000001', canEdit: true, canDelete: true, createdAt: minutesAgo(COMMENT_EDIT_WINDOW_MS / 60_000 + 1) });
    renderThread([fresh, old]);
    expect(screen.getByTestId('comment-edit-cmt0000001')).toBeTruthy();
    expect(screen.queryByTestId('comment-edit-cmt0000002')).toBeNull();
    // Deleting an own comment has no window.
    expect(screen.getByTestId('comment-delete-cmt0000002')).toBeTruthy();
  });

  it('shows a comment written as HTML as its text', () => {
    const body = '<img src=x onerror=alert(1)>';
    renderThread([comment({ body })]);
    expect(screen.getByTestId('comment-body-cmt0000001')).toHaveTextContent(body);
  });

  it('says when the cell has changed since the comment was written', () => {
    renderThread([comment({ cellId: 'cell000001', cellLabel: 'flow', cellRevision: 2, cellChangedSince: true })]);
    expect(screen.getByTestId('comment-changed-cmt0000001')).toHaveTextContent('The cell has changed since this was written.');
  });

  it('lets a viewer read but not reply, resolve, edit or delete', () => {
    renderThread([comment({ canEdit: false, canDelete: false })], 'viewer');
    expect(screen.getByTestId('comment-thread-cmt0000001')).toBeTruthy();
    expect(screen.queryByTestId('comment-reply-cmt0000001')).toBeNull();
    expect(screen.queryByTestId('comment-resolve-cmt0000001')).toBeNull();
    expect(screen.queryByTestId('comment-edit-cmt0000001')).toBeNull();
    expect(screen.queryByTestId('comment-delete-cmt0000001')).toBeNull();
  });

  it('resolves an open thread and offers to reopen a resolved one', async () => {
    const patch = jest.fn(() => ({ status: 200, body: { comment: comment({}) } }));
    fakeApi({ 'PATCH /api/comments/cmt0000001': patch });
    const { unmount } = renderThread([comment({})]);
    expect(screen.getByTestId('comment-resolve-cmt0000001')).toHaveTextContent('Resolve');
    fireEvent.press(screen.getByTestId('comment-resolve-cmt0000001'));
    await waitFor(() => expect(patch).toHaveBeenCalledTimes(1));
    expect(JSON.parse(String((global.fetch as jest.Mock).mock.calls[0][1].body))).toEqual({ resolved: true });
    unmount();
    renderThread([comment({ resolvedAt: minutesAgo(1), resolvedByName: 'Invented Lead' })]);
    expect(screen.getByTestId('comment-resolve-cmt0000001')).toHaveTextContent('Reopen');
    expect(screen.getByTestId('comment-resolved-cmt0000001')).toHaveTextContent('Resolved by Invented Lead');
  });

  it('posts a reply to the thread root on the same cell', async () => {
    const post = jest.fn(() => ({ status: 201, body: { comment: comment({ id: 'cmt0000009' }) } }));
    fakeApi({ 'POST /api/notebooks/nb00000001/comments': post });
    renderThread([comment({ cellId: 'cell000001', cellLabel: 'flow' })]);
    fireEvent.press(screen.getByTestId('comment-reply-cmt0000001'));
    fireEvent.changeText(screen.getByTestId('comment-reply-box-cmt0000001'), 'Agreed, $\\nu$ moves.');
    fireEvent.press(screen.getByTestId('comment-reply-send-cmt0000001'));
    await waitFor(() => expect(post).toHaveBeenCalledTimes(1));
    const [, init] = (global.fetch as jest.Mock).mock.calls[0];
    expect(JSON.parse(String(init.body))).toEqual({ body: 'Agreed, $\\nu$ moves.', parentId: 'cmt0000001', cellId: 'cell000001' });
    await waitFor(() => expect(screen.queryByTestId('comment-reply-box-cmt0000001')).toBeNull());
  });
});
