import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { ChipButton } from '../ChipButton';
import { isObject, type ScanShape } from '../resultShapes';
import { nameOfQuantity } from '../texFormat';
import { CoefficientTable } from './CoefficientTable';
import { Notices, noticesOf } from './ExponentsOutput';
import { ScanPlot } from './ScanPlot';

/** What the scan result says beyond its numbers: the mark notes and, per abscissa, the kinds of notice that apply there. */
export interface ScanDetails {
  meanFieldEndNote: string | null;
  sStarSource: string | null;
  pointNotices: Map<number, string[]>;
}

export function scanDetailsOf(result: unknown): ScanDetails {
  const marks = isObject(result) && isObject(result.marks) ? result.marks : {};
  const pointNotices = new Map<number, string[]>();
  if (isObject(result) && Array.isArray(result.points)) {
    for (const point of result.points) {
      if (isObject(point) && typeof point.s === 'string' && Array.isArray(point.notices)) pointNotices.set(Number(point.s), point.notices.map(String));
    }
  }
  return {
    meanFieldEndNote: typeof marks.meanFieldEndNote === 'string' ? marks.meanFieldEndNote : null,
    sStarSource: typeof marks.sStarSource === 'string' ? marks.sStarSource : null,
    pointNotices,
  };
}

/** A scan: its notices first, then the plot, the numbers behind it on request. `result` is the job's raw result (notices, mark notes). */
export function ScanOutput({ scan, result, fileName, testID }: { scan: ScanShape; result?: unknown; fileName: string; testID?: string }) {
  const [showTable, setShowTable] = useState(false);
  const details = scanDetailsOf(result);
  const marks = [
    scan.meanField !== null ? `s = d/2 = ${scan.meanField}${details.meanFieldEndNote ? ` (${details.meanFieldEndNote})` : ''}` : null,
    scan.sStar !== null ? `s* = ${scan.sStar}${details.sStarSource ? ` (${details.sStarSource})` : ''}` : null,
  ].filter(Boolean);
  const withNotices = details.pointNotices.size > 0;
  return (
    <View style={styles.wrap} testID={testID}>
      <Notices notices={noticesOf(result)} testID={testID ? `${testID}-notices` : undefined} />
      {marks.length ? <Text style={styles.caption} testID={testID ? `${testID}-marks` : undefined}>{marks.join(' · ')}</Text> : null}
      <ScanPlot scan={scan} pointNotices={details.pointNotices} fileName={fileName} testID={testID ? `${testID}-plot` : undefined} />
      <ChipButton label={showTable ? 'Hide points' : `Show ${scan.points.length} points`} onPress={() => setShowTable(!showTable)} testID={testID ? `${testID}-points` : undefined} />
      {showTable ? (
        <CoefficientTable
          header={[scan.variable, ...scan.quantities.map(nameOfQuantity), ...(withNotices ? ['notices'] : [])]}
          rows={scan.points.map((point) => [
            String(point.x),
            ...scan.quantities.map((key) => (point.values[key] !== undefined ? String(point.values[key]) : '')),
            ...(withNotices ? [(details.pointNotices.get(point.x) ?? []).join(', ')] : []),
          ])}
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
