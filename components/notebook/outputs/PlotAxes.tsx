import { G, Line, Text as SvgText } from 'react-native-svg';
import { colors } from '../../../constants/theme';
import { tickLabel, type AxisFrame } from '../plotAxes';

/** A frame's grid, ticks, axes and titles on screen, the same as axesSvg writes to a saved file. */
export function PlotAxes({ geometry: g }: { geometry: AxisFrame }) {
  const middle = (g.plotTop + g.plotBottom) / 2;
  return (
    <G>
      {g.yTicks.map((tick) => (
        <G key={`y${tick.value}`}>
          <Line x1={g.plotLeft} x2={g.plotRight} y1={tick.at} y2={tick.at} stroke={colors.rule} />
          <SvgText x={g.plotLeft - 6} y={tick.at + 4} fontSize={11} textAnchor="end" fill={colors.inkSoft}>{tickLabel(tick.value)}</SvgText>
        </G>
      ))}
      {g.xTicks.map((tick) => (
        <G key={`x${tick.value}`}>
          <Line x1={tick.at} x2={tick.at} y1={g.plotBottom} y2={g.plotBottom + 5} stroke={colors.inkSoft} />
          <SvgText x={tick.at} y={g.plotBottom + 18} fontSize={11} textAnchor="middle" fill={colors.inkSoft}>{tickLabel(tick.value)}</SvgText>
        </G>
      ))}
      <Line x1={g.plotLeft} x2={g.plotRight} y1={g.plotBottom} y2={g.plotBottom} stroke={colors.inkSoft} />
      <Line x1={g.plotLeft} x2={g.plotLeft} y1={g.plotTop} y2={g.plotBottom} stroke={colors.inkSoft} />
      {g.xTitle ? <SvgText x={(g.plotLeft + g.plotRight) / 2} y={g.height - 6} fontSize={13} textAnchor="middle" fill={colors.ink}>{g.xTitle}</SvgText> : null}
      {g.yTitle ? <SvgText x={14} y={middle} fontSize={13} textAnchor="middle" fill={colors.ink} rotation={-90} origin={`14, ${middle}`}>{g.yTitle}</SvgText> : null}
    </G>
  );
}
