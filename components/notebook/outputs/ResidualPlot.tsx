import { StyleSheet, Text, View } from 'react-native';
import Svg, { Circle, G, Line, Path, Rect } from 'react-native-svg';
import { colors, comparisonPlot, fonts } from '../../../constants/theme';
import type { ResidualGeometry } from '../plotSvg';
import { svgTestID } from './ComparisonPlot';
import { PlotAxes } from './PlotAxes';

/** A small plot of series − data (in units of the error when the data has errors) per variant, with the zero line. */
export function ResidualPlot({ geometry: g }: { geometry: ResidualGeometry }) {
  return (
    <View>
      <Text style={styles.caption}>{g.measure === 'pull' ? 'Residuals in units of the data’s error, r / σ (r = series − data)' : 'Residuals r = series − data'}</Text>
      <Svg width={g.width} height={g.height} {...svgTestID('comparison-residual-plot')} fontFamily={fonts.regular}>
        <Rect x={0} y={0} width={g.width} height={g.height} fill={colors.surface} />
        <PlotAxes geometry={g} />
        <Line x1={g.plotLeft} x2={g.plotRight} y1={g.zeroY} y2={g.zeroY} stroke={comparisonPlot.zero} strokeWidth={1.5} {...svgTestID('comparison-residual-zero')} />
        {g.series.map((series) => (
          <G key={series.key} {...svgTestID(`comparison-residual-${series.key}`)}>
            <Path d={series.segments.join(' ')} fill="none" stroke={series.style.color} strokeWidth={1.5} strokeDasharray={series.style.dash} />
            {series.dots.map((dot, i) => (
              <Circle key={i} cx={dot.cx} cy={dot.cy} r={2.5} fill={series.style.color} />
            ))}
          </G>
        ))}
      </Svg>
    </View>
  );
}

const styles = StyleSheet.create({
  caption: { fontFamily: fonts.medium, fontSize: 13, color: colors.inkSoft, marginBottom: 4 },
});
