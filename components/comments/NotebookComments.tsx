import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useCommentsQuery, usePostCommentMutation } from '../../hooks/api/comments';
import { can, type NotebookRole } from '../../shared/notebook/sharing';
import { ChipButton } from '../notebook/ChipButton';
import { Notice } from '../ui/Notice';
import { CommentComposer } from './CommentComposer';
import { CommentThread } from './CommentThread';
import { groupThreads, isResolved, type CommentThreadData } from './threads';

export interface NotebookCommentsProps {
  notebookId: string;
  role: NotebookRole;
  shareToken?: string;
  /** Bring a cell into view (threads on cells offer it). */
  onShowCell?: (cellId: string) => void;
}

type ThreadFilter = 'open' | 'resolved';

/** Threads on the notebook as a whole with a box for a new one, then every thread on its cells; open or resolved. */
export function NotebookComments({ notebookId, role, shareToken, onShowCell }: NotebookCommentsProps) {
  const [filter, setFilter] = useState<ThreadFilter>('open');
  const comments = useCommentsQuery({ notebookId, shareToken });
  const post = usePostCommentMutation({ notebookId, shareToken });
  const threads = groupThreads(comments.data ?? []);
  const shown = threads.filter((thread) => isResolved(thread) === (filter === 'resolved'));
  const onNotebook = shown.filter((thread) => thread.root.cellId === null && thread.root.cellLabel === null);
  const onCells = shown.filter((thread) => !onNotebook.includes(thread));
  const openCount = threads.filter((thread) => !isResolved(thread)).length;
  const mayComment = can(role, 'comment');
  const renderThread = (thread: CommentThreadData, showCell: boolean) => (
    <View key={thread.root.id} style={styles.threadWrap}>
      <CommentThread notebookId={notebookId} role={role} thread={thread} shareToken={shareToken} showCell={showCell} />
      {showCell && onShowCell && thread.root.cellId ? (
        <View style={styles.showCell}>
          <ChipButton label="Show cell" onPress={() => onShowCell(thread.root.cellId!)} testID={`comment-show-cell-${thread.root.id}`} />
        </View>
      ) : null}
    </View>
  );

  return (
    <View style={styles.panel} testID="notebook-comments">
      <View style={styles.header}>
        <Text style={styles.title} accessibilityRole="header">
          Comments
        </Text>
        <View style={styles.filters}>
          <ChipButton label={`Open (${openCount})`} selected={filter === 'open'} onPress={() => setFilter('open')} testID="comments-filter-open" />
          <ChipButton label={`Resolved (${threads.length - openCount})`} selected={filter === 'resolved'} onPress={() => setFilter('resolved')} testID="comments-filter-resolved" />
        </View>
      </View>
      {comments.isError ? <Notice tone="error" message={comments.error.message} /> : null}
      {comments.isPending ? <Text style={styles.muted}>Loading comments…</Text> : null}

      <Text style={styles.section}>On the notebook</Text>
      {comments.data && onNotebook.length === 0 ? <Text style={styles.muted}>{filter === 'open' ? 'No open threads on the notebook as a whole.' : 'No resolved threads on the notebook as a whole.'}</Text> : null}
      {onNotebook.map((thread) => renderThread(thread, false))}
      {mayComment && filter === 'open' ? (
        <CommentComposer
          notebookId={notebookId}
          mentions={!shareToken}
          placeholder="Comment on the whole notebook…"
          submitLabel="Comment"
          onSubmit={(body) => post.mutateAsync({ body })}
          boxTestID="notebook-comment-box"
          sendTestID="notebook-comment-send"
        />
      ) : null}

      <Text style={styles.section}>On cells</Text>
      {comments.data && onCells.length === 0 ? <Text style={styles.muted}>{filter === 'open' ? 'No open threads on cells.' : 'No resolved threads on cells.'}</Text> : null}
      {onCells.map((thread) => renderThread(thread, true))}
    </View>
  );
}

const styles = StyleSheet.create({
  panel: { gap: spacing.md },
  header: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', flexWrap: 'wrap', gap: spacing.sm },
  title: { fontFamily: fonts.semibold, fontSize: 18, color: colors.ink },
  filters: { flexDirection: 'row', gap: spacing.sm },
  section: { fontFamily: fonts.medium, fontSize: 13, color: colors.inkSoft, textTransform: 'uppercase', letterSpacing: 0.6, marginTop: spacing.sm },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  threadWrap: { gap: spacing.xs },
  showCell: { alignSelf: 'flex-start' },
});
