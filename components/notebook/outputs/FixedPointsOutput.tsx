import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { CopyableFormula } from '../CopyableFormula';
import type { FixedPointShape } from '../resultShapes';
import { seriesTex } from '../texFormat';
import { CoefficientTable } from './CoefficientTable';

/** Every fixed point: couplings as ε-series, a table of values and stability. */
export function FixedPointsOutput({ eps, points, fileName, testID }: { eps: string | null; points: FixedPointShape[]; fileName: string; testID?: string }) {
  const rows = points.map((point) => [
    point.name,
    point.couplings.map((c) => `${c.name} = ${c.value ?? '—'}`).join('; '),
    point.stabilityValues ? point.stabilityValues.join(', ') : '—',
    point.stable === null ? '' : point.stable ? 'IR-stable' : 'unstable',
    point.status,
  ]);
  return (
    <View style={styles.wrap} testID={testID}>
      {eps ? <Text style={styles.caption}>Values at ε = {eps}.</Text> : null}
      {points.map((point) => (
        <View key={point.name} style={styles.point}>
          <Text style={styles.name}>{point.name}{point.stable ? ' · IR-stable' : ''}</Text>
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
