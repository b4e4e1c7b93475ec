import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { ChipButton } from '../ChipButton';
import type { ScanShape } from '../resultShapes';
import { nameOfQuantity } from '../texFormat';
import { CoefficientTable } from './CoefficientTable';
import { ScanPlot } from './ScanPlot';

/** A scan: the plot first, the numbers behind it on request. */
export function ScanOutput({ scan, fileName, testID }: { scan: ScanShape; fileName: string; testID?: string }) {
  const [showTable, setShowTable] = useState(false);
  const marks = [scan.meanField !== null ? `s = d/2 = ${scan.meanField}` : null, scan.sStar !== null ? `s* = ${scan.sStar}` : null].filter(Boolean);
  return (
    <View style={styles.wrap} testID={testID}>
      {marks.length ? <Text style={styles.caption}>{marks.join(' · ')}</Text> : null}
      <ScanPlot scan={scan} fileName={fileName} testID={testID ? `${testID}-plot` : undefined} />
      <ChipButton label={showTable ? 'Hide points' : `Show ${scan.points.length} points`} onPress={() => setShowTable(!showTable)} testID={testID ? `${testID}-points` : undefined} />
      {showTable ? (
        <CoefficientTable
          header={[scan.variable, ...scan.quantities.map(nameOfQuantity)]}
          rows={scan.points.map((point) => [String(point.x), ...scan.quantities.map((key) => (point.values[key] !== undefined ? String(point.values[key]) : ''))])}
          fileName={fileName}
          testID={testID ? `${testID}-table` : undefined}
        />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.sm },
  caption: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
});
