import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useCommentsQuery, usePostCommentMutation } from '../../hooks/api/comments';
import { can, type NotebookRole } from '../../shared/notebook/sharing';
import { ChipButton } from '../notebook/ChipButton';
import { Notice } from '../ui/Notice';
import { CommentComposer } from './CommentComposer';
import { CommentThread } from './CommentThread';
import { groupThreads, isResolved } from './threads';

export interface CellCommentsProps {
  notebookId: string;
  role: NotebookRole;
  cellId: string;
  cellLabel: string;
  shareToken?: string;
}

/** The threads on one cell, open ones first, and a box to start a new one (commenters and up). */
export function CellComments({ notebookId, role, cellId, cellLabel, shareToken }: CellCommentsProps) {
  const [showResolved, setShowResolved] = useState(false);
  const comments = useCommentsQuery({ notebookId, shareToken });
  const post = usePostCommentMutation({ notebookId, shareToken });
  const threads = groupThreads((comments.data ?? []).filter((comment) => comment.cellId === cellId));
  const open = threads.filter((thread) => !isResolved(thread));
  const resolved = threads.filter(isResolved);
  const mayComment = can(role, 'comment');

  return (
    <View style={styles.panel} testID={`cell-comments-${cellLabel}-panel`}>
      {comments.isError ? <Notice tone="error" message={comments.error.message} /> : null}
      {comments.isPending ? <Text style={styles.muted}>Loading comments…</Text> : null}
      {comments.data && threads.length === 0 ? <Text style={styles.muted}>{mayComment ? 'No comments on this cell yet.' : 'No comments on this cell.'}</Text> : null}
      {open.map((thread) => (
        <CommentThread key={thread.root.id} notebookId={notebookId} role={role} thread={thread} shareToken={shareToken} />
      ))}
      {resolved.length ? (
        <ChipButton
          label={showResolved ? 'Hide resolved' : `Show ${resolved.length} resolved`}
          selected={showResolved}
          onPress={() => setShowResolved(!showResolved)}
          testID={`cell-comments-${cellLabel}-resolved`}
        />
      ) : null}
      {showResolved ? resolved.map((thread) => <CommentThread key={thread.root.id} notebookId={notebookId} role={role} thread={thread} shareToken={shareToken} />) : null}
      {mayComment ? (
        <CommentComposer
          notebookId={notebookId}
          mentions={!shareToken}
          placeholder={`Comment on ${cellLabel}…`}
          submitLabel="Comment"
          onSubmit={(body) => post.mutateAsync({ body, cellId })}
          boxTestID="comment-box"
          sendTestID="comment-send"
        />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  panel: { gap: spacing.md, borderTopWidth: 1, borderTopColor: colors.rule, paddingTop: spacing.md },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
});
