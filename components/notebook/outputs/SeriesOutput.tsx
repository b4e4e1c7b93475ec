import { View } from 'react-native';
import { spacing } from '../../../constants/theme';
import { CopyableFormula } from '../CopyableFormula';
import type { SeriesShape } from '../resultShapes';
import { coefficientLines, coefficientText, seriesTex, seriesText } from '../texFormat';
import { CoefficientTable } from './CoefficientTable';

function prefactorTex(prefactor: SeriesShape['prefactor']): string {
  if (!prefactor) return '';
  const pi = prefactor.piExponent.trim() === '0' ? '' : `\\pi^{${prefactor.piExponent}}`;
  const two = prefactor.twoExponent && prefactor.twoExponent.trim() !== '0' ? `2^{${prefactor.twoExponent}}` : '';
  return pi || two ? `${two}${pi}\\,` : '';
}

/** A Laurent series in ε: the typeset sum (breaking across lines where it is long), and its coefficients. */
export function SeriesOutput({ series, name, fileName, testID }: { series: SeriesShape; name: string; fileName: string; testID?: string }) {
  const prefix = prefactorTex(series.prefactor);
  const tex = (significant: number) => {
    const body = seriesTex(series.lowest, series.coeffs, true, significant);
    return `${name} = ${prefix ? `${prefix}\\Big[${body}\\Big]` : body}`;
  };
  return (
    <View style={{ gap: spacing.md }} testID={testID}>
      <CopyableFormula tex={tex} text={seriesText(series.lowest, series.coeffs)} values={coefficientLines(series.coeffs)} testID={testID ? `${testID}-formula` : undefined} />
      <CoefficientTable
        header={['power of ε', 'coefficient']}
        rows={series.coeffs.map((coefficient, k) => [`ε^${series.lowest + k}`, coefficientText(coefficient)])}
        fileName={fileName}
        testID={testID ? `${testID}-table` : undefined}
      />
    </View>
  );
}
