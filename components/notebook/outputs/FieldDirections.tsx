import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts } from '../../../constants/theme';
import type { FieldAnomalousSpectrum } from '../../../shared/jobs/contract';
import { CopyableFormula } from '../CopyableFormula';
import { coefficientLines, seriesTex, seriesText } from '../texFormat';
import { CoefficientTable } from './CoefficientTable';

/** TeX of a field name: "phi1" → \phi_{1}, any other name upright. */
export function fieldTex(field: string): string {
  const indexed = /^phi(\d+)$/.exec(field);
  return indexed ? `\\phi_{${indexed[1]}}` : `\\mathrm{${field.replace(/_/g, '\\_').replace(/ /g, '\\ ')}}`;
}

/**
 * η = 2 − s + 2γ_φ per eigen-direction of the field matrix γ_φ (docs/physics.md §6; a matrix at s = 2 in
 * anisotropic models): each direction's ε-series typeset, then its values at ε and at the root of the truncated β.
 */
export function FieldDirections({ spectrum, eps, fileName, testID }: { spectrum: FieldAnomalousSpectrum; eps: string | null; fileName: string; testID?: string }) {
  const etaName = (field: string) => (spectrum.proportional ? '\\eta' : `\\eta_{${fieldTex(field)}}`);
  const withRoot = spectrum.directions.some((direction) => direction.atRoot !== null);
  const header = ['field', 'multiplicity', eps ? `γ_φ at ε = ${eps}` : 'γ_φ', eps ? `η at ε = ${eps}` : 'η', ...(withRoot ? ['η at the root of the truncated β'] : [])];
  const rows = spectrum.directions.map((direction) => [
    direction.field,
    String(direction.multiplicity),
    direction.values?.gamma ?? '—',
    direction.values?.eta ?? '—',
    ...(withRoot ? [direction.atRoot?.eta.join(', ') ?? '—'] : []),
  ]);
  return (
    <View style={styles.wrap} testID={testID}>
      <Text style={styles.heading}>{spectrum.proportional ? 'γ_φ is the same in every field direction' : 'η per field direction (γ_φ is a matrix here; its eigen-directions differ)'}</Text>
      {spectrum.directions.map((direction) => (
        <CopyableFormula key={direction.field} tex={(n) => `${etaName(direction.field)} = ${seriesTex(0, direction.series.eta, true, n)}`} text={`η ${direction.field} = ${seriesText(0, direction.series.eta)}`} values={coefficientLines(direction.series.eta)} testID={`exponent-eta-${direction.field}`} />
      ))}
      <CoefficientTable header={header} rows={rows} fileName={`${fileName}-fields`} testID={testID ? `${testID}-table` : undefined} />
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: 2 },
  heading: { fontFamily: fonts.semibold, fontSize: 13, color: colors.inkSoft },
});
