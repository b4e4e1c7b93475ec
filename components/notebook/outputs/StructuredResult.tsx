import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { ChipButton } from '../ChipButton';
import { CopyableFormula } from '../CopyableFormula';
import { monoFont } from '../monoFont';
import { asPolynomial, asSeries, isObject } from '../resultShapes';
import { coefficientLines, isSymbolic, polynomialTex, polynomialText, seriesTex, seriesText } from '../texFormat';
import { JsonBlock } from './JsonBlock';

const MAX_DEPTH = 5;
const COLLAPSED_BY_DEFAULT = /trail|diagram|derivation|steps/i;
const TEX_KEY = /^(latex|tex|integral|reduced)$|Latex$|Tex$/;

/** Words for the keys an engine result uses: "betaFunctions" → "beta functions", "fixed_points" → "fixed points". */
export function keyWords(key: string): string {
  return key.replace(/([a-z])([A-Z])/g, '$1 $2').replace(/_/g, ' ').toLowerCase();
}

/**
 * A result whose exact shape the screen does not know in advance (flows, fixed points, extras):
 * formulas are typeset, series summed, numbers shown with all digits, long trails folded away.
 */
export function StructuredResult({ value, fileName, depth = 0 }: { value: unknown; fileName: string; depth?: number }) {
  if (depth > MAX_DEPTH) return <JsonBlock value={value} />;
  if (isSymbolic(value)) return <CopyableFormula tex={value.latex} />;
  const series = asSeries(value);
  if (series) return <CopyableFormula tex={(n) => seriesTex(series.lowest, series.coeffs, true, n)} text={seriesText(series.lowest, series.coeffs)} values={coefficientLines(series.coeffs)} />;
  const polynomial = asPolynomial(value);
  if (polynomial && polynomial.length) return <CopyableFormula tex={(n) => polynomialTex(polynomial, n)} text={polynomialText(polynomial)} />;
  if (typeof value === 'string') return <Text selectable style={styles.number}>{value}</Text>;
  if (typeof value === 'number' || typeof value === 'boolean' || value === null) return <Text style={styles.number}>{value === true ? 'yes' : value === false ? 'no' : String(value)}</Text>;
  if (Array.isArray(value)) {
    if (value.length === 0) return <Text style={styles.muted}>none</Text>;
    if (value.every((item) => typeof item === 'string')) return <Text selectable style={styles.number}>{value.join(',  ')}</Text>;
    return (
      <View style={styles.list}>
        {value.map((item, index) => (
          <View key={index} style={styles.item}>
            <StructuredResult value={item} fileName={fileName} depth={depth + 1} />
          </View>
        ))}
      </View>
    );
  }
  if (isObject(value)) {
    return (
      <View style={styles.fields}>
        {Object.entries(value).map(([key, entry]) => (
          <Field key={key} name={key} value={entry} fileName={fileName} depth={depth} />
        ))}
      </View>
    );
  }
  return <JsonBlock value={value} />;
}

function Field({ name, value, fileName, depth }: { name: string; value: unknown; fileName: string; depth: number }) {
  const foldable = COLLAPSED_BY_DEFAULT.test(name) && (Array.isArray(value) || isObject(value));
  const [open, setOpen] = useState(!foldable);
  if (TEX_KEY.test(name) && typeof value === 'string') return <CopyableFormula tex={value} />;
  const count = Array.isArray(value) ? ` (${value.length})` : '';
  return (
    <View style={styles.field}>
      <View style={styles.fieldHead}>
        <Text style={styles.key}>{keyWords(name)}{count}</Text>
        {foldable ? <ChipButton label={open ? 'Fold' : 'Unfold'} onPress={() => setOpen(!open)} testID={`fold-${name}`} /> : null}
      </View>
      {open ? <StructuredResult value={value} fileName={fileName} depth={depth + 1} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  fields: { gap: spacing.sm },
  field: { gap: spacing.xs },
  fieldHead: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm },
  key: { fontFamily: fonts.semibold, fontSize: 13, color: colors.inkSoft },
  number: { fontFamily: monoFont, fontSize: 13, color: colors.ink },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  list: { gap: spacing.sm },
  item: { borderLeftWidth: 2, borderLeftColor: colors.rule, paddingLeft: spacing.md },
});
