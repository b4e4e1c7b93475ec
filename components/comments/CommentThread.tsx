import { useEffect, useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useDeleteCommentMutation, useEditCommentMutation, usePostCommentMutation, useResolveCommentMutation } from '../../hooks/api/comments';
import { can, type CommentView, type NotebookRole } from '../../shared/notebook/sharing';
import { ChipButton } from '../notebook/ChipButton';
import { monoFont } from '../notebook/monoFont';
import { Notice } from '../ui/Notice';
import { CommentBody } from './CommentBody';
import { CommentComposer } from './CommentComposer';
import { canStillEdit, editWindowEnds, isResolved, type CommentThreadData } from './threads';
import { when } from './when';

export interface CommentThreadProps {
  notebookId: string;
  role: NotebookRole;
  thread: CommentThreadData;
  /** Set when the notebook was opened through a share link. */
  shareToken?: string;
  /** Name the cell the thread is on (in lists that mix cells). */
  showCell?: boolean;
}

/** Re-render when the first of these edit windows closes, so the Edit action disappears on time. */
function useEditClock(comments: CommentView[]): number {
  const [now, setNow] = useState(() => Date.now());
  const closing = comments.filter((comment) => canStillEdit(comment, now)).map(editWindowEnds);
  const next = closing.length ? Math.min(...closing) : null;
  useEffect(() => {
    if (next === null) return;
    const timer = setTimeout(() => setNow(Date.now()), Math.max(0, next - Date.now()) + 50);
    return () => clearTimeout(timer);
  }, [next]);
  return now;
}

/** A thread: its first comment, the replies, a reply box, resolve / reopen. */
export function CommentThread({ notebookId, role, thread, shareToken, showCell = false }: CommentThreadProps) {
  const { root, replies } = thread;
  const [replying, setReplying] = useState(false);
  const post = usePostCommentMutation({ notebookId, shareToken });
  const resolve = useResolveCommentMutation(notebookId);
  const now = useEditClock([root, ...replies]);
  const resolved = isResolved(thread);
  const mayComment = can(role, 'comment');
  // Resolving, editing and deleting need a role of one's own on the notebook: a share link only lets one read and post.
  const throughLink = Boolean(shareToken);

  return (
    <View style={[styles.thread, resolved && styles.resolvedThread]} testID={`comment-thread-${root.id}`}>
      {showCell && root.cellLabel ? (
        <Text style={styles.place}>
          On cell <Text style={styles.cellLabel}>{root.cellLabel}</Text>
        </Text>
      ) : null}
      {resolved ? <Text style={styles.resolvedNote} testID={`comment-resolved-${root.id}`}>Resolved{root.resolvedByName ? ` by ${root.resolvedByName}` : ''}</Text> : null}
      {[root, ...replies].map((comment) => (
        <CommentItem key={comment.id} notebookId={notebookId} comment={comment} now={now} mayEdit={mayComment && !throughLink} throughLink={throughLink} />
      ))}
      {replying ? (
        <CommentComposer
          notebookId={notebookId}
          mentions={!shareToken}
          placeholder="Reply…"
          submitLabel="Reply"
          onSubmit={async (body) => {
            await post.mutateAsync({ body, parentId: root.id, cellId: root.cellId ?? undefined });
            setReplying(false);
          }}
          onCancel={() => setReplying(false)}
          boxTestID={`comment-reply-box-${root.id}`}
          sendTestID={`comment-reply-send-${root.id}`}
        />
      ) : null}
      {mayComment ? (
        <View style={styles.actions}>
          {replying ? null : <ChipButton label="Reply" onPress={() => setReplying(true)} testID={`comment-reply-${root.id}`} />}
          {throughLink ? null : (
            <ChipButton
              label={resolved ? 'Reopen' : 'Resolve'}
              disabled={resolve.isPending}
              onPress={() => resolve.mutate({ commentId: root.id, resolved: !resolved })}
              testID={`comment-resolve-${root.id}`}
            />
          )}
        </View>
      ) : null}
      {resolve.error ? <Notice tone="error" message={resolve.error.message} /> : null}
    </View>
  );
}

function CommentItem({ notebookId, comment, now, mayEdit, throughLink }: { notebookId: string; comment: CommentView; now: number; mayEdit: boolean; throughLink: boolean }) {
  const [editing, setEditing] = useState(false);
  const [confirmDelete, setConfirmDelete] = useState(false);
  const edit = useEditCommentMutation(notebookId);
  const remove = useDeleteCommentMutation(notebookId);
  const editable = mayEdit && canStillEdit(comment, now);
  const deletable = !throughLink && comment.canDelete;

  if (comment.deleted) {
    return (
      <View style={styles.comment} testID={`comment-${comment.id}`}>
        <Text style={styles.deleted}>Comment deleted.</Text>
      </View>
    );
  }
  return (
    <View style={styles.comment} testID={`comment-${comment.id}`}>
      <View style={styles.byline}>
        <Text style={styles.author}>{comment.authorName}</Text>
        <Text style={styles.meta}>
          {when(comment.createdAt, now)}
          {comment.editedAt ? ' · edited' : ''}
        </Text>
      </View>
      {comment.cellChangedSince ? (
        <Text style={styles.changed} testID={`comment-changed-${comment.id}`}>
          The cell has changed since this was written.
        </Text>
      ) : null}
      {editing && editable ? (
        <CommentComposer
          notebookId={notebookId}
          mentions
          placeholder="Edit the comment"
          submitLabel="Save"
          initialText={comment.body}
          onSubmit={async (body) => {
            await edit.mutateAsync({ commentId: comment.id, body });
            setEditing(false);
          }}
          onCancel={() => setEditing(false)}
          boxTestID={`comment-edit-box-${comment.id}`}
          sendTestID={`comment-edit-save-${comment.id}`}
        />
      ) : (
        <CommentBody text={comment.body} testID={`comment-body-${comment.id}`} />
      )}
      {(editable && !editing) || deletable ? (
        <View style={styles.actions}>
          {editable && !editing ? <ChipButton label="Edit" onPress={() => setEditing(true)} testID={`comment-edit-${comment.id}`} /> : null}
          {deletable ? (
            confirmDelete ? (
              <>
                <ChipButton label="Really delete" tone="danger" disabled={remove.isPending} onPress={() => remove.mutate(comment.id)} testID={`comment-delete-confirm-${comment.id}`} />
                <ChipButton label="Keep" onPress={() => setConfirmDelete(false)} />
              </>
            ) : (
              <ChipButton label="Delete" tone="danger" onPress={() => setConfirmDelete(true)} testID={`comment-delete-${comment.id}`} />
            )
          ) : null}
        </View>
      ) : null}
      {remove.error ? <Notice tone="error" message={remove.error.message} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  thread: { gap: spacing.sm, paddingLeft: spacing.md, borderLeftWidth: 3, borderLeftColor: colors.amber, paddingVertical: spacing.xs },
  resolvedThread: { borderLeftColor: colors.rule, opacity: 0.85 },
  place: { fontFamily: fonts.medium, fontSize: 13, color: colors.inkSoft },
  cellLabel: { fontFamily: monoFont, fontSize: 12, color: colors.inkSoft },
  resolvedNote: { fontFamily: fonts.medium, fontSize: 12, color: colors.success },
  comment: { gap: spacing.xs },
  byline: { flexDirection: 'row', alignItems: 'baseline', gap: spacing.sm, flexWrap: 'wrap' },
  author: { fontFamily: fonts.semibold, fontSize: 14, color: colors.ink },
  meta: { fontFamily: fonts.regular, fontSize: 12, color: colors.inkFaint },
  changed: { fontFamily: fonts.medium, fontSize: 12, color: colors.amberDeep },
  deleted: { fontFamily: fonts.regular, fontSize: 13, fontStyle: 'italic', color: colors.inkFaint },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm },
});
