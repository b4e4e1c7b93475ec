import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useComparisonQuery, useVersionQuery } from '../../hooks/api/notebooks';
import { cellKindTitles, type CellComparison } from '../../shared/notebook';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { cellSummary } from './cellSummary';
import { monoFont } from './monoFont';
import { NoteView } from './NoteView';
import { ResultView } from './outputs/ResultView';
import { TextChanges, ValueChangesSummary } from './TextChanges';

/** An old version as it was, read-only. */
export function VersionReader({ notebookId, versionId }: { notebookId: string; versionId: string }) {
  const version = useVersionQuery(notebookId, versionId);
  if (version.isError) return <Notice tone="error" message={version.error.message} />;
  if (!version.data) return <Text style={styles.muted}>Loading the version…</Text>;
  const v = version.data;
  return (
    <View style={styles.panel} testID="version-reader">
      <Text style={styles.heading}>Version {v.number}: {v.message}</Text>
      <Text style={styles.muted}>Read-only · {v.title} · {v.cells.length} cells</Text>
      {v.cells.map((cell) => (
        <Card key={cell.label} testID={`version-cell-${cell.label}`}>
          <View style={styles.cellHead}>
            <Text style={styles.kind}>{cellKindTitles[cell.kind]}</Text>
            <Text style={styles.label}>{cell.label}</Text>
          </View>
          {cell.input.kind === 'note' ? <NoteView text={cell.input.text} /> : <Text style={styles.summary}>{cellSummary(cell.input)}</Text>}
          {cell.output !== null && cell.output !== undefined ? <ResultView kind={cell.kind} result={cell.output} label={`v${v.number}-${cell.label}`} /> : null}
        </Card>
      ))}
    </View>
  );
}

const changeWords: Record<CellComparison['change'], string> = { added: 'added', removed: 'removed', changed: 'changed', unchanged: 'unchanged' };
const changeColors: Record<CellComparison['change'], string> = { added: colors.success, removed: colors.danger, changed: colors.amberDeep, unchanged: colors.inkFaint };

/** Two versions side by side, cell by cell: what changed in each cell's inputs and results. */
export function VersionComparisonView({ notebookId, from, to }: { notebookId: string; from: string; to: string }) {
  const comparison = useComparisonQuery(notebookId, { from, to });
  if (comparison.isError) return <Notice tone="error" message={comparison.error.message} />;
  if (!comparison.data) return <Text style={styles.muted}>Comparing…</Text>;
  const c = comparison.data;
  const changed = c.cells.filter((cell) => cell.change !== 'unchanged').length;
  return (
    <View style={styles.panel} testID="version-comparison">
      <Text style={styles.heading}>Version {c.from.number} → version {c.to.number}</Text>
      <Text style={styles.muted}>{changed === 0 ? 'No cell differs.' : `${changed} of ${c.cells.length} cells differ.`}</Text>
      {c.cells.map((cell) => (
        <Card key={cell.label} testID={`compare-${cell.label}`}>
          <View style={styles.cellHead}>
            <Text style={styles.label}>{cell.label}</Text>
            <Text style={[styles.change, { color: changeColors[cell.change] }]} testID={`compare-${cell.label}-change`}>{changeWords[cell.change]}</Text>
          </View>
          {cell.change !== 'unchanged' ? (
            <>
              <Text style={styles.part}>Inputs</Text>
              {cell.inputSummarised ? (
                <ValueChangesSummary values={cell.inputValues} testID={`compare-${cell.label}-input-summary`} />
              ) : (
                <TextChanges changes={cell.input} testID={`compare-${cell.label}-input`} />
              )}
              {cell.outputSummarised ? (
                <>
                  <Text style={styles.part}>Results</Text>
                  <ValueChangesSummary values={cell.outputValues} testID={`compare-${cell.label}-output-summary`} />
                </>
              ) : cell.output.some((change) => change.added || change.removed) ? (
                <>
                  <Text style={styles.part}>Results</Text>
                  <TextChanges changes={cell.output} testID={`compare-${cell.label}-output`} />
                </>
              ) : <Text style={styles.muted}>Results unchanged.</Text>}
            </>
          ) : null}
        </Card>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  panel: { gap: spacing.md },
  heading: { fontFamily: fonts.semibold, fontSize: 18, color: colors.ink },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  cellHead: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm, flexWrap: 'wrap' },
  kind: { fontFamily: fonts.semibold, fontSize: 15, color: colors.ink },
  label: { fontFamily: monoFont, fontSize: 13, color: colors.inkSoft, backgroundColor: colors.paper, paddingHorizontal: 6, borderRadius: 4 },
  summary: { fontFamily: fonts.regular, fontSize: 14, color: colors.inkSoft },
  change: { fontFamily: fonts.semibold, fontSize: 13 },
  part: { fontFamily: fonts.medium, fontSize: 13, color: colors.inkSoft },
});
