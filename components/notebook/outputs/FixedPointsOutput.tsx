import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { CopyableFormula } from '../CopyableFormula';
import type { FixedPointShape } from '../resultShapes';
import { seriesTex } from '../texFormat';
import { CoefficientTable } from './CoefficientTable';
import { type ResultNotice, Notices } from './ExponentsOutput';

/** A fixed point with the caveats the job attaches (complex at ε, undecided stability, merging at one loop). */
type PointWithCaveats = FixedPointShape & { caveats?: ResultNotice[] };

function stabilityText(point: PointWithCaveats): string {
  if (point.status === 'complex') return 'complex: not physical';
  if (point.stable === null) return point.caveats?.length ? 'undecided' : '';
  return point.stable ? 'IR-stable' : 'unstable';
}

/** Every fixed point: its caveats first, couplings as ε-series, a table of values and stability. */
export function FixedPointsOutput({ eps, points, fileName, testID }: { eps: string | null; points: PointWithCaveats[]; fileName: string; testID?: string }) {
  const rows = points.map((point) => [
    point.name,
    point.couplings.map((c) => `${c.name} = ${c.value ?? '—'}`).join('; '),
    point.stabilityValues ? point.stabilityValues.join(', ') : '—',
    stabilityText(point),
    point.status,
  ]);
  return (
    <View style={styles.wrap} testID={testID}>
      {eps ? <Text style={styles.caption}>Values at ε = {eps}.</Text> : null}
      {points.map((point, index) => (
        <View key={point.name} style={styles.point}>
          <Text style={styles.name}>{point.name}{point.stable ? ' · IR-stable' : ''}</Text>
          <Notices notices={point.caveats ?? []} testID={testID ? `${testID}-caveats-${index}` : undefined} />
          {point.couplings.map((c) => <CopyableFormula key={c.name} tex={`${c.name}_* = ${seriesTex(0, c.series)}`} />)}
          {point.stabilitySeries.map((series, index) => <CopyableFormula key={index} tex={`\\lambda_{${index + 1}} = ${seriesTex(0, series)}`} />)}
          {point.notes.map((note, index) => <Text key={index} style={styles.caption}>{note}</Text>)}
        </View>
      ))}
      <CoefficientTable header={['fixed point', 'couplings', 'stability eigenvalues', 'stability', 'status']} rows={rows} fileName={fileName} testID={testID ? `${testID}-table` : undefined} />
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.md },
  point: { gap: spacing.xs, borderLeftWidth: 2, borderLeftColor: colors.rule, paddingLeft: spacing.md },
  name: { fontFamily: fonts.semibold, fontSize: 14, color: colors.ink },
  caption: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
});
