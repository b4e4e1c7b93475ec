import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { CopyableFormula } from '../CopyableFormula';
import type { FixedPointShape } from '../resultShapes';
import { coefficientLines, seriesTex, seriesText } from '../texFormat';
import { CoefficientTable } from './CoefficientTable';
import { Notices } from './ExponentsOutput';
import { QuadraticOperators, quadraticOperatorsOf } from './QuadraticOperators';

function stabilityText(point: FixedPointShape): string {
  if (point.status === 'complex') return 'complex: not physical';
  if (point.stable === null) return point.caveats.length ? 'undecided' : '';
  return point.stable ? 'IR-stable' : 'unstable';
}

const SUBSCRIPTS = '₀₁₂₃₄₅₆₇₈₉';
const subscriptDigits = (n: number) => String(n).replace(/\d/g, (digit) => SUBSCRIPTS[Number(digit)]);

/** Every fixed point: its caveats first, couplings as ε-series, a table of values and stability. */
export function FixedPointsOutput({ eps, points, fileName, testID }: { eps: string | null; points: FixedPointShape[]; fileName: string; testID?: string }) {
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
          <Notices notices={point.caveats} testID={testID ? `${testID}-caveats-${index}` : undefined} />
          {point.couplings.map((c) => (
            <CopyableFormula key={c.name} tex={(n) => `${c.name}_* = ${seriesTex(0, c.series, true, n)}`} text={`${c.name}* = ${seriesText(0, c.series)}`} values={coefficientLines(c.series)} />
          ))}
          {point.stabilitySeries.map((series, k) =>
            series ? (
              <CopyableFormula key={k} tex={(n) => `\\lambda_{${k + 1}} = ${seriesTex(0, series, true, n)}`} text={`λ${k + 1} = ${seriesText(0, series)}`} values={coefficientLines(series)} />
            ) : <Text key={k} style={styles.caption}>{`λ${subscriptDigits(k + 1)}: no ε-series (see the notes)`}</Text>,
          )}
          {point.notes.map((note, index) => <Text key={index} style={styles.caption}>{note}</Text>)}
          <PointOperators point={point} eps={eps} testID={testID ? `${testID}-operators-${index}` : undefined} />
        </View>
      ))}
      <CoefficientTable header={['fixed point', 'couplings', 'stability eigenvalues', 'stability', 'status']} rows={rows} fileName={fileName} testID={testID ? `${testID}-table` : undefined} />
    </View>
  );
}

function PointOperators({ point, eps, testID }: { point: FixedPointShape; eps: string | null; testID?: string }) {
  const operators = quadraticOperatorsOf(point.quadraticOperators);
  return operators ? <QuadraticOperators operators={operators} eps={eps} testID={testID} /> : null;
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.md },
  point: { gap: spacing.xs, borderLeftWidth: 2, borderLeftColor: colors.rule, paddingLeft: spacing.md },
  name: { fontFamily: fonts.semibold, fontSize: 14, color: colors.ink },
  caption: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkSoft },
});
