import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { usePresentationMode } from '../../ui/presentationMode';
import { ChipButton } from '../ChipButton';
import { isObject, PADE_PREFIX, type ScanPoint, type ScanShape } from '../resultShapes';
import { nameOfQuantity } from '../texFormat';
import { CoefficientTable } from './CoefficientTable';
import { Notices, noticesOf, stringRecord } from './ExponentsOutput';
import { ScanPlot } from './ScanPlot';

/** What the scan result says beyond its numbers: the mark notes and, per abscissa, the kinds of notice that apply there. */
export interface ScanDetails {
  meanFieldEndNote: string | null;
  sStarSource: string | null;
  pointNotices: Map<number, string[]>;
  /** Per abscissa: quantity → why its Padé value is missing (a pole between 0 and ε, a degenerate approximant). */
  padeDefects: Map<number, Record<string, string>>;
}

export function scanDetailsOf(result: unknown): ScanDetails {
  const marks = isObject(result) && isObject(result.marks) ? result.marks : {};
  const pointNotices = new Map<number, string[]>();
  const padeDefects = new Map<number, Record<string, string>>();
  for (const point of isObject(result) && Array.isArray(result.points) ? result.points : []) {
    if (!isObject(point) || typeof point.s !== 'string') continue;
    if (Array.isArray(point.notices)) pointNotices.set(Number(point.s), point.notices.map(String));
    if (isObject(point.padeDefects)) padeDefects.set(Number(point.s), stringRecord(point.padeDefects));
  }
  return {
    meanFieldEndNote: typeof marks.meanFieldEndNote === 'string' ? marks.meanFieldEndNote : null,
    sStarSource: typeof marks.sStarSource === 'string' ? marks.sStarSource : null,
    pointNotices,
    padeDefects,
  };
}

/** A point's value of a quantity; a Padé value the pole check refused says why instead of giving a number. */
function cellOf(point: ScanPoint, key: string, details: ScanDetails): string {
  if (point.values[key] !== undefined) return String(point.values[key]);
  const defect = key.startsWith(PADE_PREFIX) ? details.padeDefects.get(point.x)?.[key.slice(PADE_PREFIX.length)] : undefined;
  return defect ? `defective: ${defect}` : '';
}

/** A scan: its notices first, then the plot, the numbers behind it on request. `result` is the job's raw result (notices, mark notes). */
export function ScanOutput({ scan, result, fileName, testID }: { scan: ScanShape; result?: unknown; fileName: string; testID?: string }) {
  const [showTable, setShowTable] = useState(false);
  const presenting = usePresentationMode();
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
      {presenting ? null : <ChipButton label={showTable ? 'Hide points' : `Show ${scan.points.length} points`} onPress={() => setShowTable(!showTable)} testID={testID ? `${testID}-points` : undefined} />}
      {showTable && !presenting ? (
        <CoefficientTable
          header={[scan.variable, ...scan.quantities.map(nameOfQuantity), ...(withNotices ? ['notices'] : [])]}
          rows={scan.points.map((point) => [
            String(point.x),
            ...scan.quantities.map((key) => cellOf(point, key, details)),
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
