import { useState } from 'react';
import { StyleSheet, Text, View, type GestureResponderEvent, type LayoutChangeEvent } from 'react-native';
import Svg, { G, Line, Path, Rect, Text as SvgText } from 'react-native-svg';
import { colors, fonts, spacing } from '../../../constants/theme';
import { usePresentationMode } from '../../ui/presentationMode';
import { ChipButton } from '../ChipButton';
import type { ScanPoint, ScanShape } from '../resultShapes';
import { saveTextFile } from '../saveFile';
import { nameOfQuantity } from '../texFormat';
import { monoFont } from '../monoFont';
import { tickLabel } from '../plotAxes';
import { followedCaption, followedRuns, labelX, nearestPoint, plotGeometry, plotSvg } from './plotGeometry';
import { PlotAxes } from './PlotAxes';

const PLOT_HEIGHT = 280;

/**
 * Exponents against s: the fixed point followed named above the plot (and each change marked in it), axes,
 * ticks, the legend below the plot (never over a curve), s = d/2 and s* marked, a read-out where you tap or point
 * (with the kinds of notice that apply at that point, from `pointNotices` keyed by s).
 */
export function ScanPlot({ scan, pointNotices, fileName, testID }: { scan: ScanShape; pointNotices?: Map<number, string[]>; fileName: string; testID?: string }) {
  const [width, setWidth] = useState(0);
  const [picked, setPicked] = useState<ScanPoint | null>(null);
  const presenting = usePresentationMode();
  const onLayout = (event: LayoutChangeEvent) => setWidth(Math.round(event.nativeEvent.layout.width));
  const geometry = width > 0 ? plotGeometry(scan, width, PLOT_HEIGHT) : null;
  const caption = followedCaption(followedRuns(scan), scan.variable);
  const pick = (event: GestureResponderEvent) => {
    if (geometry) setPicked(nearestPoint(scan, geometry.invertX(event.nativeEvent.locationX)));
  };
  return (
    <View style={styles.wrap} testID={testID}>
      {caption ? <Text style={styles.caption} testID={testID ? `${testID}-followed` : undefined}>{caption}</Text> : null}
      <View
        style={styles.canvas}
        onLayout={onLayout}
        onStartShouldSetResponder={() => true}
        onResponderGrant={pick}
        onResponderMove={pick}
        {...hoverProps(pick)}
        testID={testID ? `${testID}-canvas` : undefined}
      >
        {geometry ? (
          <Svg width={geometry.width} height={geometry.height} pointerEvents="none" fontFamily={fonts.regular}>
            <Rect x={0} y={0} width={geometry.width} height={geometry.height} fill={colors.surface} />
            <PlotAxes geometry={geometry} />
            {geometry.markers.map((marker) => (
              <G key={marker.label}>
                <Line x1={marker.x} x2={marker.x} y1={geometry.plotTop} y2={geometry.plotBottom} stroke={colors.amberDeep} strokeDasharray="4 3" />
                <SvgText x={labelX(marker.x, geometry.width, marker.label)} y={geometry.markRow} fontSize={11} fill={colors.amberDeep}>{marker.label}</SvgText>
              </G>
            ))}
            {geometry.changes.map((change) => (
              <G key={`change-${change.x}`} testID={testID ? `${testID}-change` : undefined}>
                <Line x1={change.x} x2={change.x} y1={geometry.plotTop} y2={geometry.plotBottom} stroke={colors.inkSoft} strokeDasharray="1 3" />
                <SvgText x={labelX(change.x, geometry.width, change.label)} y={geometry.changeRow} fontSize={11} fill={colors.inkSoft}>{change.label}</SvgText>
              </G>
            ))}
            {geometry.lines.map((plotLine) => (
              <Path key={plotLine.key} d={plotLine.path} fill="none" stroke={plotLine.color} strokeWidth={2} />
            ))}
            {picked ? <Line x1={geometry.xOf(picked.x)} x2={geometry.xOf(picked.x)} y1={geometry.plotTop} y2={geometry.plotBottom} stroke={colors.ink} strokeWidth={1} /> : null}
          </Svg>
        ) : null}
      </View>
      <View style={styles.legend} testID={testID ? `${testID}-legend` : undefined}>
        {(geometry?.lines ?? []).map((plotLine) => (
          <View key={plotLine.key} style={styles.legendItem}>
            <View style={[styles.swatch, { backgroundColor: plotLine.color }]} />
            <Text style={styles.legendText}>{plotLine.name}</Text>
          </View>
        ))}
      </View>
      <Text style={styles.readout} testID={testID ? `${testID}-readout` : undefined}>
        {picked
          ? `${scan.variable} = ${tickLabel(picked.x)}: ${scan.quantities.map((key) => `${nameOfQuantity(key)} = ${picked.values[key] !== undefined ? tickLabel(picked.values[key]) : '—'}`).join(', ')}${picked.flagged ? ' (outside d/2 < s < s*)' : ''}${noticeText(pointNotices?.get(picked.x))}`
          : 'Tap or point at the plot to read values.'}
      </Text>
      {geometry && !presenting ? <ChipButton label="Save SVG" onPress={() => void saveTextFile(`${fileName}.svg`, plotSvg(geometry), 'image/svg+xml')} testID={testID ? `${testID}-svg` : undefined} /> : null}
    </View>
  );
}

const noticeText = (kinds: string[] | undefined) => (kinds && kinds.length ? ` — see notices: ${kinds.join(', ')}` : '');

/** Pointer hover where there is a pointer (web); RN's types do not list these props on View. */
function hoverProps(pick: (event: GestureResponderEvent) => void): object {
  return {
    onPointerMove: (event: { nativeEvent: { offsetX?: number; locationX?: number } }) =>
      pick({ nativeEvent: { locationX: event.nativeEvent.offsetX ?? event.nativeEvent.locationX ?? 0 } } as GestureResponderEvent),
  };
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.sm, alignItems: 'flex-start' },
  canvas: { width: '100%', height: PLOT_HEIGHT, borderWidth: 1, borderColor: colors.rule, borderRadius: 6, overflow: 'hidden' },
  caption: { fontFamily: fonts.medium, fontSize: 13, color: colors.inkSoft },
  legend: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.md },
  legendItem: { flexDirection: 'row', alignItems: 'center', gap: spacing.xs },
  swatch: { width: 14, height: 3, borderRadius: 2 },
  legendText: { fontFamily: fonts.medium, fontSize: 13, color: colors.ink },
  readout: { fontFamily: monoFont, fontSize: 12, color: colors.inkSoft },
});
