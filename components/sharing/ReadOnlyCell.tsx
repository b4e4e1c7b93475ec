import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { isRunActive } from '../../hooks/api/notebooks';
import { cellKindTitles, type CellView, type NotebookDetail } from '../../shared/notebook';
import { runsJob } from '../notebook/CellCard';
import { CellOutput } from '../notebook/CellOutput';
import { CellStateBadge } from '../notebook/CellStateBadge';
import { cellSummary } from '../notebook/cellSummary';
import { monoFont } from '../notebook/monoFont';
import { NoteView } from '../notebook/NoteView';

/**
 * One cell as a reader sees it: inputs and the last result, nothing to press. A running cell is not
 * followed (its run belongs to someone with access); its result shows when the page is opened again.
 */
export function ReadOnlyCell({ notebook, cell }: { notebook: NotebookDetail; cell: CellView }) {
  const prefix = `cell-${cell.label}`;
  return (
    <View style={[styles.card, cell.state === 'out-of-date' && styles.stale]} testID={prefix}>
      <View style={styles.head}>
        <Text style={styles.kind}>{cellKindTitles[cell.kind]}</Text>
        <Text style={styles.label} testID={`${prefix}-label`}>{cell.label}</Text>
        {runsJob(cell) ? <CellStateBadge state={cell.state} run={cell.lastRun} testID={`${prefix}-state`} /> : null}
      </View>
      {cell.state === 'out-of-date' ? <Text style={styles.staleText} testID={`${prefix}-stale`}>Inputs changed since this was computed.</Text> : null}
      {cell.input.kind === 'note' ? (
        cell.input.text ? <NoteView text={cell.input.text} testID={`${prefix}-note`} /> : <Text style={styles.meta}>An empty note.</Text>
      ) : (
        <Text style={styles.summary}>{cellSummary(cell.input)}</Text>
      )}
      <ReadOnlyOutput notebook={notebook} cell={cell} />
    </View>
  );
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
