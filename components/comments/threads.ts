import { COMMENT_EDIT_WINDOW_MS, type CommentView } from '../../shared/notebook/sharing';

/** A thread: its first comment and the replies to it, oldest first. */
export interface CommentThreadData {
  root: CommentView;
  replies: CommentView[];
}

const byTime = (a: CommentView, b: CommentView) => a.createdAt.localeCompare(b.createdAt);

/** Roots with their replies, oldest thread first; replies whose root is missing are left out. */
export function groupThreads(comments: CommentView[]): CommentThreadData[] {
  const replies = new Map<string, CommentView[]>();
  for (const comment of comments) {
    if (comment.parentId) replies.set(comment.parentId, [...(replies.get(comment.parentId) ?? []), comment]);
  }
  return comments
    .filter((comment) => comment.parentId === null)
    .sort(byTime)
    .map((root) => ({ root, replies: (replies.get(root.id) ?? []).sort(byTime) }));
}

export const isResolved = (thread: CommentThreadData) => thread.root.resolvedAt !== null;

/** Comments someone can still read in the threads (deleted ones kept as placeholders do not count). */
export const visibleCount = (threads: CommentThreadData[]) => threads.reduce((sum, { root, replies }) => sum + [root, ...replies].filter((comment) => !comment.deleted).length, 0);

/** When the author can no longer edit a comment (the server refuses after the window too). */
export const editWindowEnds = (comment: Pick<CommentView, 'createdAt'>) => Date.parse(comment.createdAt) + COMMENT_EDIT_WINDOW_MS;

export const canStillEdit = (comment: CommentView, now: number) => comment.canEdit && !comment.deleted && now < editWindowEnds(comment);
