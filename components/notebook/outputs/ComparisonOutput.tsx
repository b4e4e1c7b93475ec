import { useMemo, useState } from 'react';
import { StyleSheet, Text, View, type LayoutChangeEvent } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import type { CompareResult } from '../../../shared/jobs/contract';
import { comparisonCsv, comparisonTexTable } from '../../../shared/notebook/comparisonTable';
import type { CellInput, DatasetView } from '../../../shared/notebook';
import { usePresentationMode } from '../../ui/presentationMode';
import { ChipButton } from '../ChipButton';
import { copyText } from '../clipboard';
import { axisName, comparisonGeometry, comparisonSvg, residualGeometry, type DataShow } from '../plotSvg';
import { saveTextFile } from '../saveFile';
import { ComparisonPlot } from './ComparisonPlot';
import { ResidualPlot } from './ResidualPlot';
import { ComparisonSummary, ResidualTable, shown } from './ResidualTable';

/** Size of the SVG file, whatever the screen: a figure for a talk or a paper. */
const SVG_SIZE = { width: 800, height: 480 };

interface ComparisonOutputProps {
  result: CompareResult;
  /** How the data is drawn; without it a result with kinks (a boundary) is drawn as a line. */
  show?: DataShow;
  /** The dataset's name for the legend. */
  dataName?: string;
  /** File name (without extension) for the downloads. */
  fileName: string;
  testID?: string;
}

/**
 * What a comparison cell's output needs from the notebook: how to draw the data (the cell's choice, else the
 * dataset's own shape) and the dataset's name for the legend. Spread into ResultView: `{...comparisonDisplay(cell.input, notebook.datasets)}`.
 */
export function comparisonDisplay(input: CellInput, datasets: Pick<DatasetView, 'label' | 'shape' | 'name'>[]): { show?: DataShow; dataName?: string } {
  if (input.kind !== 'comparison') return {};
  const dataset = datasets.find((candidate) => candidate.label === input.dataset);
  return { show: input.show ?? dataset?.shape, dataName: dataset?.name };
}

const plotHeight = (width: number) => Math.round(Math.min(420, Math.max(260, width * 0.62)));

/** Series against data: the overlay, residuals, χ² per variant, kinks and notes, with CSV / SVG / TeX exports. */
export function ComparisonOutput({ result, show, dataName, fileName, testID }: ComparisonOutputProps) {
  const [width, setWidth] = useState(0);
  const drawn: DataShow = show ?? (result.kinks !== undefined ? 'boundary' : 'points');
  const dataLabel = dataName ?? (drawn === 'boundary' ? 'data (boundary)' : 'data');
  const geometry = useMemo(() => (width > 0 ? comparisonGeometry(result, drawn, width, plotHeight(width)) : null), [result, drawn, width]);
  const residuals = useMemo(() => (geometry ? residualGeometry(result, geometry.xDomain, width, 150) : null), [result, geometry, width]);
  return (
    <View style={styles.wrap} testID={testID}>
      <View style={styles.head}>
        <Text style={styles.title}>
          {axisName(result.quantity)} against {axisName(result.xAxis)} at d = {result.d}
          {result.fixedPoint ? `, ${result.fixedPoint} fixed point` : ''}
        </Text>
        <ExportMenu result={result} drawn={drawn} dataLabel={dataLabel} fileName={fileName} />
      </View>
      <View style={styles.canvas} onLayout={(event: LayoutChangeEvent) => setWidth(Math.floor(event.nativeEvent.layout.width))} testID="comparison-canvas">
        {geometry ? <ComparisonPlot geometry={geometry} dataLabel={dataLabel} /> : null}
      </View>
      <Text style={styles.caption} testID="comparison-marks">{marksCaption(result)}</Text>
      {residuals ? <ResidualPlot geometry={residuals} /> : null}
      <Text style={styles.section}>Agreement per variant</Text>
      <ComparisonSummary result={result} />
      {result.kinks !== undefined ? <KinkList result={result} /> : null}
      <Text style={styles.section}>Each data point</Text>
      <ResidualTable result={result} />
      {result.notes.length ? (
        <View style={styles.notes} testID="comparison-notes">
          {result.notes.map((note, i) => (
            <Text key={i} style={styles.note}>• {note}</Text>
          ))}
        </View>
      ) : null}
    </View>
  );
}

function marksCaption(result: CompareResult): string {
  const x = axisName(result.xAxis);
  const onAxis = (mark: { s: string; x: string }) => (result.xAxis === 's' ? shown(mark.s, 6) : `${shown(mark.x, 6)} (s = ${shown(mark.s, 6)})`);
  const parts = [`s = d/2 at ${x} = ${onAxis(result.marks.meanFieldEnd)}`];
  if (result.marks.sStar) parts.push(`s* at ${x} = ${onAxis(result.marks.sStar)}`);
  parts.push(`data from ${x} = ${result.marks.dataRange[0]} to ${result.marks.dataRange[1]} (shaded)`);
  return parts.join(' · ');
}

function KinkList({ result }: { result: CompareResult }) {
  const kinks = result.kinks ?? [];
  const labels = result.variants.map((variant) => ({ key: variant.key, label: variant.label }));
  return (
    <View style={styles.kinks} testID="comparison-kinks">
      <Text style={styles.section}>Kinks in the boundary</Text>
      {kinks.length === 0 ? <Text style={styles.caption}>No kink stands out from the noise: the boundary is smooth.</Text> : null}
      {kinks.map((kink, i) => (
        <View key={i} style={styles.kink} testID={`comparison-kinks-${i}`}>
          <Text style={styles.kinkHead}>
            {axisName(result.xAxis)} = {shown(kink.x, 6)} ± {shown(kink.uncertainty, 2)}
            {result.xAxis === 's' ? '' : ` (s = ${shown(kink.s, 6)})`}, {axisName(result.quantity)} = {shown(kink.y, 6)} · strength {shown(kink.strength, 3)}
          </Text>
          <Text style={styles.caption}>
            Series − kink at this {axisName(result.xAxis)}: {labels.map(({ key, label }) => `${label} ${shown(kink.distance[key], 4)}`).join(' · ')}
          </Text>
        </View>
      ))}
    </View>
  );
}

function ExportMenu({ result, drawn, dataLabel, fileName }: { result: CompareResult; drawn: DataShow; dataLabel: string; fileName: string }) {
  const [open, setOpen] = useState(false);
  const [copied, setCopied] = useState<boolean | null>(null);
  const presenting = usePresentationMode();
  if (presenting) return null;
  const copyTex = async () => {
    setCopied(await copyText(comparisonTexTable(result)));
    setTimeout(() => setCopied(null), 1500);
  };
  const svg = () => comparisonSvg(comparisonGeometry(result, drawn, SVG_SIZE.width, SVG_SIZE.height), dataLabel);
  return (
    <View style={styles.menu}>
      <ChipButton label="Export ⋯" accessibilityLabel="Export this comparison" selected={open} onPress={() => setOpen(!open)} testID="comparison-menu" />
      {open ? (
        <View style={styles.menuItems}>
          <ChipButton label="Download CSV" onPress={() => void saveTextFile(`${fileName}.csv`, comparisonCsv(result), 'text/csv')} testID="comparison-download-csv" />
          <ChipButton label="Download SVG" onPress={() => void saveTextFile(`${fileName}.svg`, svg(), 'image/svg+xml')} testID="comparison-download-svg" />
          <ChipButton label={copied === null ? 'Copy as TeX table' : copied ? 'Copied' : 'Copy failed'} onPress={() => void copyTex()} testID="comparison-copy-tex" />
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.md },
  head: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'flex-start', justifyContent: 'space-between', gap: spacing.sm },
  title: { fontFamily: fonts.semibold, fontSize: 14, color: colors.ink, flexShrink: 1 },
  menu: { alignItems: 'flex-end', gap: spacing.sm, marginLeft: 'auto', maxWidth: '100%' },
  menuItems: { maxWidth: '100%', flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'flex-end', gap: spacing.sm, padding: spacing.sm, borderRadius: 8, backgroundColor: colors.paper, borderWidth: 1, borderColor: colors.rule },
  canvas: { width: '100%' },
  caption: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkSoft },
  section: { fontFamily: fonts.semibold, fontSize: 14, color: colors.ink },
  kinks: { gap: spacing.sm },
  kink: { gap: 2, paddingLeft: spacing.sm, borderLeftWidth: 3, borderLeftColor: colors.danger },
  kinkHead: { fontFamily: fonts.medium, fontSize: 13, color: colors.ink },
  notes: { gap: 2 },
  note: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkSoft },
});
