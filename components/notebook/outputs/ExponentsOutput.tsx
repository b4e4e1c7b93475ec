import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { CopyableFormula } from '../CopyableFormula';
import { isObject, type ExponentsShape } from '../resultShapes';
import { coefficientText, nameOfQuantity, seriesTex, texOfQuantity } from '../texFormat';
import { CoefficientTable } from './CoefficientTable';
import { StructuredResult } from './StructuredResult';

/** Critical exponents: each ε-series typeset, then one table of coefficients and values at the physical ε. */
export function ExponentsOutput({ result, fileName, testID }: { result: ExponentsShape; fileName: string; testID?: string }) {
  const seriesKeys = Object.keys(result.series);
  const order = Math.max(0, ...seriesKeys.map((key) => result.series[key].length));
  const keys = [...seriesKeys, ...Object.keys(result.values).filter((key) => !seriesKeys.includes(key))];
  const { pade, relations, fixedPoint, meanField, ...extra } = result.extra;
  const padeValues = isObject(pade) ? pade : null;
  const header = ['quantity', ...Array.from({ length: order }, (_, k) => `ε^${k}`), result.eps ? `value at ε = ${result.eps}` : 'value', ...(padeValues ? ['Padé'] : [])];
  const rows = keys.map((key) => [
    nameOfQuantity(key),
    ...Array.from({ length: order }, (_, k) => (result.series[key]?.[k] !== undefined ? coefficientText(result.series[key][k]) : '')),
    result.values[key] ?? '',
    ...(padeValues ? [typeof padeValues[key] === 'string' ? (padeValues[key] as string) : '—'] : []),
  ]);
  const hasExtra = Object.keys(extra).length > 0;
  return (
    <View style={styles.wrap} testID={testID}>
      <Text style={styles.caption}>
        {[typeof fixedPoint === 'string' ? `At the ${fixedPoint} fixed point.` : null, meanField === true ? 'Mean-field: the Gaussian fixed point is stable and these values are exact.' : null, result.eps && result.eps !== 'eps' ? `Series in ε at fixed s; values at ε = ${result.eps}.` : 'Series in ε at fixed s.'].filter(Boolean).join(' ')}
      </Text>
      {seriesKeys.map((key) => (
        <CopyableFormula key={key} tex={`${texOfQuantity(key)} = ${seriesTex(0, result.series[key])}`} testID={`exponent-${key}`} />
      ))}
      <CoefficientTable header={header} rows={rows} fileName={fileName} testID={testID ? `${testID}-table` : undefined} />
      {isObject(relations) ? (
        <View style={styles.relations}>
          <Text style={styles.heading}>Relations used</Text>
          {Object.entries(relations).map(([key, text]) => <Text key={key} style={styles.caption}>{String(text)}</Text>)}
        </View>
      ) : null}
      {hasExtra ? <StructuredResult value={extra} fileName={fileName} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.md },
  caption: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  relations: { gap: 2 },
  heading: { fontFamily: fonts.semibold, fontSize: 13, color: colors.inkSoft },
});
