import type { scaleLinear } from 'd3-scale';
import { colors } from '../../constants/theme';

/**
 * The one source of axis geometry for every plot of results (scans, comparisons, residuals): where the
 * plot area sits, the ticks and their labels, and the axes as SVG text for the saved files. The on-screen
 * plots draw the same frame with outputs/PlotAxes.tsx.
 */

export interface Tick {
  value: number;
  /** Pixel position along its axis. */
  at: number;
}

export interface PlotMargin {
  top: number;
  right: number;
  bottom: number;
  left: number;
}

export interface AxisFrame {
  width: number;
  height: number;
  plotLeft: number;
  plotRight: number;
  plotTop: number;
  plotBottom: number;
  xTicks: Tick[];
  yTicks: Tick[];
  /** Axis titles; an empty title is not drawn (a legend names the lines instead). */
  xTitle: string;
  yTitle: string;
}

type Scale = ReturnType<typeof scaleLinear<number, number>>;

/** Pixels to two decimals: shorter SVG, no visible difference. */
export const px = (value: number) => Math.round(value * 100) / 100;

/** Plot area and ticks for scales whose ranges already leave `margin` around the plot area. */
export function axisFrame(x: Scale, y: Scale, width: number, height: number, margin: PlotMargin, titles: { x: string; y: string }): AxisFrame {
  return {
    width,
    height,
    plotLeft: margin.left,
    plotRight: width - margin.right,
    plotTop: margin.top,
    plotBottom: height - margin.bottom,
    xTicks: x.ticks(Math.max(2, Math.floor((width - margin.left - margin.right) / 80))).map((value) => ({ value, at: x(value) })),
    yTicks: y.ticks(Math.max(2, Math.floor((height - margin.top - margin.bottom) / 45))).map((value) => ({ value, at: y(value) })),
    xTitle: titles.x,
    yTitle: titles.y,
  };
}

/** A tick value with at most six significant digits and no float noise (0.30000000000000004 → 0.3). */
export const tickLabel = (value: number) => String(Number(value.toPrecision(6)));

export const escapeXml = (text: string) => text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** Grid lines, ticks, axis lines and titles of a frame as SVG elements. */
export function axesSvg(g: AxisFrame): string[] {
  const parts: string[] = [];
  for (const tick of g.yTicks) {
    parts.push(`<line x1="${g.plotLeft}" x2="${g.plotRight}" y1="${px(tick.at)}" y2="${px(tick.at)}" stroke="${colors.rule}"/>`);
    parts.push(`<text x="${g.plotLeft - 6}" y="${px(tick.at) + 4}" text-anchor="end" fill="${colors.inkSoft}">${tickLabel(tick.value)}</text>`);
  }
  for (const tick of g.xTicks) {
    parts.push(`<line x1="${px(tick.at)}" x2="${px(tick.at)}" y1="${g.plotBottom}" y2="${g.plotBottom + 5}" stroke="${colors.inkSoft}"/>`);
    parts.push(`<text x="${px(tick.at)}" y="${g.plotBottom + 18}" text-anchor="middle" fill="${colors.inkSoft}">${tickLabel(tick.value)}</text>`);
  }
  parts.push(`<line x1="${g.plotLeft}" x2="${g.plotRight}" y1="${g.plotBottom}" y2="${g.plotBottom}" stroke="${colors.inkSoft}"/>`);
  parts.push(`<line x1="${g.plotLeft}" x2="${g.plotLeft}" y1="${g.plotTop}" y2="${g.plotBottom}" stroke="${colors.inkSoft}"/>`);
  if (g.xTitle) parts.push(`<text x="${(g.plotLeft + g.plotRight) / 2}" y="${g.height - 6}" text-anchor="middle" font-size="13" fill="${colors.ink}">${escapeXml(g.xTitle)}</text>`);
  const middle = (g.plotTop + g.plotBottom) / 2;
  if (g.yTitle) parts.push(`<text x="14" y="${middle}" text-anchor="middle" font-size="13" fill="${colors.ink}" transform="rotate(-90 14 ${middle})">${escapeXml(g.yTitle)}</text>`);
  return parts;
}
