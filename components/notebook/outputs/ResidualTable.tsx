import { useState } from 'react';
import { ScrollView, StyleSheet, Text, View, type LayoutChangeEvent } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import type { CompareResult } from '../../../shared/jobs/contract';
import { usePresentationMode } from '../../ui/presentationMode';
import { ChipButton } from '../ChipButton';
import { monoFont } from '../monoFont';
import { shortDecimal } from '../texFormat';

type ComparedPoint = CompareResult['points'][number];

/** Rows shown before "show all": enough to read, few enough for a phone to draw at once. */
export const FIRST_ROWS = 50;

/** A value for a table cell: shortened for reading (the CSV keeps every digit), a dash when missing. */
export const shown = (value: string | null | undefined, significant = 7) => (value === null || value === undefined ? '—' : shortDecimal(value, significant));

/** The data value with its error: "y ± e", or "y +up −down" for asymmetric errors. */
export function dataWithError(point: Pick<ComparedPoint, 'y' | 'errLow' | 'errHigh'>): string {
  const low = point.errLow;
  const high = point.errHigh ?? point.errLow;
  if (low === undefined || high === undefined) return point.y;
  return low === high ? `${point.y} ± ${low}` : `${point.y} +${high} −${low}`;
}

/** A variant's value at a point: the defect ("pole at ε = …") in words when there is one, never a number. */
export function seriesText(point: Pick<ComparedPoint, 'series' | 'defects'>, key: string): string {
  return point.defects?.[key] ?? shown(point.series[key]);
}

/** χ² with the points it sums over, χ² per such point, RMS and the largest residual for each variant, one card each (they wrap on a phone). */
export function ComparisonSummary({ result }: { result: CompareResult }) {
  const labels = new Map(result.variants.map((variant) => [variant.key, variant.label]));
  return (
    <View style={styles.cards} testID="comparison-summary">
      {result.summary.map((row) => (
        <View key={row.key} style={styles.card} testID={`comparison-summary-${row.key}`}>
          <Text style={styles.cardTitle}>{labels.get(row.key) ?? row.key}</Text>
          <Fact name="χ²" value={row.chi2 === null ? 'no errors given' : shown(row.chi2, 6)} />
          <Fact name="χ²/point" value={shown(row.chi2PerPoint, 6)} />
          <Fact name="RMS residual" value={shown(row.rms, 6)} />
          <Fact name="max |r|" value={shown(row.maxAbs, 6)} />
          <Fact name="points" value={String(row.points)} />
          {row.chi2 === null ? null : <Fact name="points in χ²" value={String(row.chi2Points)} />}
        </View>
      ))}
    </View>
  );
}

function Fact({ name, value }: { name: string; value: string }) {
  return (
    <View style={styles.fact}>
      <Text style={styles.factName}>{name}</Text>
      <Text style={styles.factValue} selectable>{value}</Text>
    </View>
  );
}

interface Column {
  title: string;
  width: number;
  cell: (point: ComparedPoint) => string;
  /** A defect written in words, styled apart from numbers. */
  isDefect?: (point: ComparedPoint) => boolean;
}

function columnsOf(result: CompareResult): Column[] {
  const withPulls = result.points.some((point) => point.pull !== undefined);
  const columns: Column[] = [{ title: 'data', width: 150, cell: dataWithError }];
  for (const variant of result.variants) {
    const key = variant.key;
    const defect = (point: ComparedPoint) => point.defects?.[key] !== undefined;
    columns.push({ title: variant.label, width: 150, cell: (point) => seriesText(point, key), isDefect: defect });
    columns.push({ title: 'residual', width: 104, cell: (point) => (defect(point) ? '—' : shown(point.residual[key], 5)) });
    if (withPulls) columns.push({ title: 'pull', width: 72, cell: (point) => (defect(point) ? '—' : shown(point.pull?.[key], 3)) });
  }
  return columns;
}

/**
 * Each data point with the series at its x, the residual and the pull per variant. x stays in place while
 * the other columns scroll sideways (a cue says so when they do not fit).
 */
export function ResidualTable({ result }: { result: CompareResult }) {
  const [showAll, setShowAll] = useState(false);
  const [viewWidth, setViewWidth] = useState(0);
  const presenting = usePresentationMode();
  const columns = columnsOf(result);
  const rows = showAll ? result.points : result.points.slice(0, FIRST_ROWS);
  const contentWidth = columns.reduce((sum, column) => sum + column.width, 0);
  const overflowing = viewWidth === 0 || contentWidth > viewWidth;
  const xName = result.xAxis === 'Delta_phi' ? 'Δφ' : 's';
  return (
    <View style={styles.wrap} testID="comparison-residuals">
      {overflowing ? <Text style={styles.cue} testID="comparison-residuals-cue">Scroll the table sideways for every variant →</Text> : null}
      <View style={styles.table}>
        <View style={styles.sticky}>
          <Text style={[styles.cell, styles.header, { width: X_WIDTH }]}>{xName}</Text>
          {rows.map((point, i) => (
            <Text key={i} style={[styles.cell, styles.number, { width: X_WIDTH }]} numberOfLines={1} selectable>{point.x}</Text>
          ))}
        </View>
        <ScrollView horizontal onLayout={(event: LayoutChangeEvent) => setViewWidth(event.nativeEvent.layout.width)} style={styles.scroller} testID="comparison-residuals-hscroll">
          <View>
            <View style={styles.row}>
              {columns.map((column, i) => (
                <Text key={i} style={[styles.cell, styles.header, { width: column.width }]} numberOfLines={1}>{column.title}</Text>
              ))}
            </View>
            {rows.map((point, rowIndex) => (
              <View key={rowIndex} style={styles.row} testID={`comparison-residuals-row-${rowIndex}`}>
                {columns.map((column, i) => (
                  <Text key={i} style={[styles.cell, column.isDefect?.(point) ? styles.defect : styles.number, { width: column.width }]} numberOfLines={1} selectable>
                    {column.cell(point)}
                  </Text>
                ))}
              </View>
            ))}
          </View>
        </ScrollView>
      </View>
      {result.points.length > FIRST_ROWS && !presenting ? (
        <ChipButton
          label={showAll ? `Show the first ${FIRST_ROWS} rows` : `Show all ${result.points.length.toLocaleString('en')} rows`}
          onPress={() => setShowAll(!showAll)}
          testID="comparison-residuals-all"
        />
      ) : null}
    </View>
  );
}

const X_WIDTH = 84;
const ROW_HEIGHT = 30;

const styles = StyleSheet.create({
  wrap: { gap: spacing.xs, alignItems: 'flex-start', alignSelf: 'stretch' },
  cards: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm },
  card: { flexGrow: 1, flexBasis: 160, maxWidth: '100%', padding: spacing.sm, borderRadius: 6, borderWidth: 1, borderColor: colors.rule, backgroundColor: colors.paper, gap: 2 },
  cardTitle: { fontFamily: fonts.semibold, fontSize: 13, color: colors.ink, marginBottom: 2 },
  fact: { flexDirection: 'row', justifyContent: 'space-between', gap: spacing.sm },
  factName: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkSoft },
  factValue: { fontFamily: monoFont, fontSize: 13, color: colors.ink },
  cue: { fontFamily: fonts.medium, fontSize: 12, color: colors.amberDeep },
  table: { flexDirection: 'row', alignSelf: 'stretch', borderWidth: 1, borderColor: colors.rule, borderRadius: 6, overflow: 'hidden' },
  sticky: { borderRightWidth: 1, borderRightColor: colors.rule, backgroundColor: colors.paper },
  scroller: { flex: 1 },
  row: { flexDirection: 'row' },
  cell: { height: ROW_HEIGHT, lineHeight: ROW_HEIGHT, paddingHorizontal: spacing.sm, fontSize: 12, color: colors.ink, borderTopWidth: 1, borderTopColor: colors.rule },
  header: { fontFamily: fonts.semibold, color: colors.inkSoft, backgroundColor: colors.paper, borderTopWidth: 0 },
  number: { fontFamily: monoFont },
  defect: { fontFamily: fonts.medium, fontStyle: 'italic', color: colors.danger },
});
