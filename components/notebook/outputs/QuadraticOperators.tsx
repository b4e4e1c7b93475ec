import { StyleSheet, Text, View } from 'react-native';
import { z } from 'zod';
import { colors, fonts, spacing } from '../../../constants/theme';
import { QuadraticOperator } from '../../../shared/jobs/contract';
import { CopyableFormula } from '../CopyableFormula';
import { operatorTex } from '../quadraticMatrix';
import { coefficientText, decimalTex, seriesTex, seriesText, type Coefficient } from '../texFormat';

const Operators = z.array(QuadraticOperator);

/** The eigen-operators a result lists, or null when it lists none in today's shape. */
export function quadraticOperatorsOf(value: unknown): QuadraticOperator[] | null {
  const parsed = Operators.safeParse(value);
  return parsed.success && parsed.data.length ? parsed.data : null;
}

const valueTex = (value: Coefficient, significant: number) => (typeof value === 'string' ? decimalTex(value, significant) : value.latex);

/** "phi1^2 - phi2^2" → φ₁² − φ₂² in TeX. */
const operatorFormula = (operator: string) => operatorTex(operator).replace(/\s*([+-])\s*/g, ' $1 ');

/**
 * Eigen-operators of the quadratic-operator matrix at the fixed point, each typeset: its scaling dimension
 * Δ = d − s + γ as an ε-series (docs/physics.md §6), the operator, its multiplicity and the values at ε.
 */
export function QuadraticOperators({ operators, eps, testID }: { operators: QuadraticOperator[]; eps: string | null; testID?: string }) {
  return (
    <View style={styles.wrap} testID={testID}>
      <Text style={styles.heading}>Quadratic operators at the fixed point (Δ = d − s + γ)</Text>
      {operators.map((entry, index) => {
        const name = `\\text{${entry.name.replace(/[\\{}$&#^_%~]/g, '')}}`;
        const tex = (significant: number) =>
          [
            `${operatorFormula(entry.operator)}:\\quad \\Delta_{${name}} = ${seriesTex(0, entry.series.Delta, true, significant)}`,
            `\\gamma_{${name}} = ${seriesTex(0, entry.series.gamma, true, significant)}`,
            entry.values ? `\\text{at } \\varepsilon${eps ? ` = ${eps}` : ''}:\\ \\Delta = ${valueTex(entry.values.Delta, significant)},\\ \\gamma = ${valueTex(entry.values.gamma, significant)}` : '',
          ].filter(Boolean).join(',\\quad\\allowbreak ');
        const text = `Δ_${entry.name} = ${seriesText(0, entry.series.Delta)}; γ_${entry.name} = ${seriesText(0, entry.series.gamma)}${entry.values ? `; at ε: Δ = ${coefficientText(entry.values.Delta)}, γ = ${coefficientText(entry.values.gamma)}` : ''}`;
        return (
          <View key={`${entry.name}-${index}`} style={styles.operator}>
            <Text style={styles.caption}>
              {entry.name} (multiplicity {entry.multiplicity})
            </Text>
            <CopyableFormula tex={tex} text={text} testID={testID ? `${testID}-${index}` : undefined} />
          </View>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.sm },
  operator: { gap: 2, borderLeftWidth: 2, borderLeftColor: colors.rule, paddingLeft: spacing.md },
  heading: { fontFamily: fonts.semibold, fontSize: 13, color: colors.inkSoft },
  caption: { fontFamily: fonts.medium, fontSize: 13, color: colors.ink },
});
