import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useCommentsQuery } from '../../hooks/api/comments';
import { isRunActive } from '../../hooks/api/notebooks';
import { cellKindTitles, type CellView, type NotebookDetail } from '../../shared/notebook';
import { can, type NotebookRole } from '../../shared/notebook/sharing';
import { CellComments } from '../comments/CellComments';
import { groupThreads, visibleCount } from '../comments/threads';
import { ChipButton } from '../notebook/ChipButton';
import { runsJob } from '../notebook/CellCard';
import { CellOutput } from '../notebook/CellOutput';
import { CellStateBadge } from '../notebook/CellStateBadge';
import { cellSummary } from '../notebook/cellSummary';
import { monoFont } from '../notebook/monoFont';
import { NoteView } from '../notebook/NoteView';

interface ReadOnlyCellProps {
  notebook: NotebookDetail;
  cell: CellView;
  /** The link the notebook was opened through: the cell's threads are read (and posted) through it. */
  shareToken: string;
  /** What the reader may do with comments here (a commenter link only comments once signed in). */
  commentRole: NotebookRole;
}

/**
 * One cell as a reader sees it: inputs, the last result and the cell's comments; nothing else to press.
 * A running cell's result shows when the link's live updates say it changed.
 */
export function ReadOnlyCell({ notebook, cell, shareToken, commentRole }: ReadOnlyCellProps) {
  const prefix = `cell-${cell.label}`;
  const comments = useReadOnlyCellComments(notebook.id, cell.id, shareToken, commentRole);
  return (
    <View style={[styles.card, cell.state === 'out-of-date' && styles.stale]} testID={prefix}>
      <View style={styles.head}>
        <Text style={styles.kind}>{cellKindTitles[cell.kind]}</Text>
        <Text style={styles.label} testID={`${prefix}-label`}>{cell.label}</Text>
        {runsJob(cell) ? <CellStateBadge state={cell.state} run={cell.lastRun} testID={`${prefix}-state`} /> : null}
        {comments.hidden ? null : (
          <ChipButton label={comments.label} selected={comments.open} accessibilityLabel={comments.open ? 'Hide comments' : `${comments.label} on ${cell.label}`} onPress={comments.toggle} testID={`cell-comments-${cell.label}`} />
        )}
      </View>
      {cell.state === 'out-of-date' ? <Text style={styles.staleText} testID={`${prefix}-stale`}>Inputs changed since this was computed.</Text> : null}
      {cell.input.kind === 'note' ? (
        cell.input.text ? <NoteView text={cell.input.text} testID={`${prefix}-note`} /> : <Text style={styles.meta}>An empty note.</Text>
      ) : (
        <Text style={styles.summary}>{cellSummary(cell.input)}</Text>
      )}
      <ReadOnlyOutput notebook={notebook} cell={cell} />
      {comments.open ? <CellComments notebookId={notebook.id} role={commentRole} cellId={cell.id} cellLabel={cell.label} shareToken={shareToken} /> : null}
    </View>
  );
}

/** The cell's threads behind a count read from the page's comment list (no request per cell). */
function useReadOnlyCellComments(notebookId: string, cellId: string, shareToken: string, role: NotebookRole) {
  const [open, setOpen] = useState(false);
  const comments = useCommentsQuery({ notebookId, shareToken }, { enabled: open });
  const count = visibleCount(groupThreads((comments.data ?? []).filter((comment) => comment.cellId === cellId)));
  const mayComment = can(role, 'comment');
  const hidden = !open && !mayComment && count === 0;
  const label = count ? `${count} comment${count === 1 ? '' : 's'}` : mayComment ? 'Comment' : 'Comments';
  return { open, toggle: () => setOpen(!open), hidden, label };
}

function ReadOnlyOutput({ notebook, cell }: { notebook: NotebookDetail; cell: CellView }) {
  const prefix = `cell-${cell.label}`;
  if (cell.kind === 'note') return null;
  if (cell.kind === 'setup') return <CellOutput notebook={notebook} cell={cell} />;
  if (cell.state === 'broken-reference') return <Text style={styles.meta}>{'Refers to a model & parameters cell that is not in the notebook.'}</Text>;
  if (!cell.lastRun) return <Text style={styles.meta}>Not computed yet.</Text>;
  if (isRunActive(cell.lastRun)) return <Text style={styles.meta} testID={`${prefix}-running`}>Being computed; open the link again later for the result.</Text>;
  return <CellOutput notebook={notebook} cell={cell} />;
}

const styles = StyleSheet.create({
  card: { backgroundColor: colors.surface, borderRadius: 8, borderWidth: 1, borderColor: colors.rule, borderLeftWidth: 4, borderLeftColor: colors.rule, padding: spacing.lg, gap: spacing.md },
  stale: { borderLeftColor: colors.amber },
  head: { flexDirection: 'row', alignItems: 'center', flexWrap: 'wrap', gap: spacing.sm },
  kind: { fontFamily: fonts.semibold, fontSize: 15, color: colors.ink },
  label: { fontFamily: monoFont, fontSize: 13, color: colors.inkSoft, backgroundColor: colors.paper, paddingHorizontal: 6, borderRadius: 4 },
  meta: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  staleText: { fontFamily: fonts.medium, fontSize: 13, color: colors.amberDeep },
  summary: { fontFamily: fonts.regular, fontSize: 14, color: colors.inkSoft },
});
