import { StyleSheet, Text, View } from 'react-native';
import Svg, { Circle, G, Line, Path, Rect, Text as SvgText } from 'react-native-svg';
import { colors, comparisonPlot, fonts, spacing } from '../../../constants/theme';
import { comparisonLegend, type ComparisonGeometry, type VariantStyle } from '../plotSvg';
import { PlotAxes } from './PlotAxes';

/**
 * A testID on an SVG element: react-native-svg hands `testID` to native views, but on the web it renders plain
 * DOM elements, where only a `data-testid` attribute can be found.
 */
export const svgTestID = (id: string): object => ({ testID: id, 'data-testid': id });

/** Series variants as lines (broken where a value is missing), the data as points with error bars or a boundary, marks and kinks; the legend below the plot, never over it. */
export function ComparisonPlot({ geometry: g, dataLabel }: { geometry: ComparisonGeometry; dataLabel: string }) {
  return (
    <View style={styles.wrap}>
      <Svg width={g.width} height={g.height} {...svgTestID('comparison-plot')} accessibilityLabel={`${g.yTitle} against ${g.xTitle}: series and data`} fontFamily={fonts.regular}>
        <Rect x={0} y={0} width={g.width} height={g.height} fill={colors.surface} />
        {g.band ? (
          <Rect x={g.band.x0} y={g.plotTop} width={Math.max(1, g.band.x1 - g.band.x0)} height={g.plotBottom - g.plotTop} fill={comparisonPlot.dataBand} {...svgTestID('comparison-data-range')} />
        ) : null}
        <PlotAxes geometry={g} />
        {g.marks.map((mark) => (
          <G key={mark.key} {...svgTestID(`comparison-mark-${mark.key}`)}>
            <Line x1={mark.x} x2={mark.x} y1={g.plotTop} y2={g.plotBottom} stroke={comparisonPlot.mark} strokeDasharray="4 3" />
            <SvgText x={mark.x + 4} y={g.plotTop + 12} fontSize={11} fill={comparisonPlot.mark}>{mark.label}</SvgText>
          </G>
        ))}
        {g.data.show === 'boundary' ? (
          <Path d={g.data.segments.join(' ')} fill="none" stroke={comparisonPlot.data} strokeWidth={3} strokeOpacity={0.85} {...svgTestID('comparison-boundary')} />
        ) : (
          <G {...svgTestID('comparison-data-points')}>
            {g.data.points.map((point, i) => (
              <G key={i}>
                {point.barTop !== undefined && point.barBottom !== undefined ? <Line x1={point.cx} x2={point.cx} y1={point.barTop} y2={point.barBottom} stroke={comparisonPlot.data} /> : null}
                <Circle cx={point.cx} cy={point.cy} r={3} fill={comparisonPlot.data} />
              </G>
            ))}
          </G>
        )}
        {g.curves.map((curve) => (
          <Path key={curve.key} d={curve.segments.join(' ')} fill="none" stroke={curve.style.color} strokeWidth={2} strokeLinecap="round" strokeDasharray={curve.style.dash} {...svgTestID(`comparison-curve-${curve.key}`)} />
        ))}
        {g.kinks.map((kink, i) => (
          <G key={i} {...svgTestID(`comparison-kink-${i}`)}>
            <Line x1={kink.x0} x2={kink.x1} y1={kink.cy} y2={kink.cy} stroke={comparisonPlot.kink} strokeWidth={2} />
            <Path d={`M${kink.cx},${kink.cy - 6} L${kink.cx + 6},${kink.cy} L${kink.cx},${kink.cy + 6} L${kink.cx - 6},${kink.cy} Z`} fill={comparisonPlot.kink} />
          </G>
        ))}
      </Svg>
      <View style={styles.legend} testID="comparison-legend">
        {comparisonLegend(g, dataLabel).map((entry) => (
          <LegendEntry key={entry.label} label={entry.label} style={entry.style} dots={entry.dots} />
        ))}
      </View>
    </View>
  );
}

export function LegendEntry({ label, style, dots = false }: { label: string; style: VariantStyle; dots?: boolean }) {
  return (
    <View style={styles.legendItem}>
      <Svg width={28} height={10}>
        {dots ? <Circle cx={14} cy={5} r={3} fill={style.color} /> : <Line x1={1} x2={27} y1={5} y2={5} stroke={style.color} strokeWidth={2} strokeDasharray={style.dash} />}
      </Svg>
      <Text style={styles.legendText}>{label}</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.sm },
  legend: { flexDirection: 'row', flexWrap: 'wrap', columnGap: spacing.md, rowGap: spacing.xs },
  legendItem: { flexDirection: 'row', alignItems: 'center', gap: spacing.xs, maxWidth: '100%' },
  legendText: { fontFamily: fonts.medium, fontSize: 13, color: colors.ink, flexShrink: 1 },
});
