import { scaleLinear } from 'd3-scale';
import { line } from 'd3-shape';
import { colors } from '../../../constants/theme';
import { axesSvg, axisFrame, escapeXml, px, tickLabel, type AxisFrame, type PlotMargin } from '../plotAxes';
import { legendBelow, legendSvg, svgLabel, type LegendEntry } from '../plotSvg';
import type { ScanShape } from '../resultShapes';
import { nameOfQuantity } from '../texFormat';

export const seriesColors = ['#C9822B', '#26324A', '#2F7A4F', '#B23A3A', '#6B4FA0', '#2C7DA0'];
/** The top margin holds the mark labels (s = d/2, s*) and the fixed-point changes, so neither sits on a curve. */
const SCAN_MARGIN: PlotMargin = { top: 34, right: 16, bottom: 40, left: 64 };
/** Baselines of the two label rows in the top margin. */
const MARK_ROW = 14;
const CHANGE_ROW = 28;

export interface PlotLine {
  key: string;
  name: string;
  color: string;
  path: string;
}

/** A stretch of the scan (in s) along which the same fixed point was followed. */
export interface FollowedRun {
  name: string;
  from: number;
  to: number;
}

/** Where the followed fixed point changes: halfway between the last s of one and the first s of the next. */
export interface FixedPointChange {
  x: number;
  label: string;
}

/** A scan's axes (from plotAxes, as every plot's), its lines and marks, and the scale for reading values back. */
export interface PlotGeometry extends AxisFrame {
  lines: PlotLine[];
  markers: { label: string; x: number }[];
  followed: FollowedRun[];
  changes: FixedPointChange[];
  /** Baselines of the label rows above the plot area (labels never sit inside it). */
  markRow: number;
  changeRow: number;
  xOf: (value: number) => number;
  invertX: (pixel: number) => number;
}

/** The fixed point followed along the scan, in runs of equal name (each point's `fixedPoint`). */
export function followedRuns(scan: ScanShape): FollowedRun[] {
  const named = scan.points
    .map((point) => ({ s: point.x, name: point.fixedPoint }))
    .filter((point): point is { s: number; name: string } => point.name !== null)
    .sort((a, b) => a.s - b.s);
  const runs: FollowedRun[] = [];
  for (const point of named) {
    const last = runs[runs.length - 1];
    if (last && last.name === point.name) last.to = point.s;
    else runs.push({ name: point.name, from: point.s, to: point.s });
  }
  return runs;
}

/** "Follows the Wilson–Fisher fixed point", or each fixed point with its stretch of s when it changes. */
export function followedCaption(runs: FollowedRun[], variable = 's'): string {
  if (runs.length === 0) return '';
  if (runs.length === 1) return `Follows the ${runs[0].name} fixed point`;
  return `Follows ${runs.map((run) => `${run.name} (${variable} ${tickLabel(run.from)}${run.to !== run.from ? `–${tickLabel(run.to)}` : ''})`).join(', then ')}`;
}

/** Scales, ticks and line paths of a scan, shared by the on-screen plot and the SVG export. */
export function plotGeometry(scan: ScanShape, width: number, height: number): PlotGeometry {
  const xs = scan.points.map((point) => point.x);
  const ys = scan.points.flatMap((point) => scan.quantities.map((key) => point.values[key]).filter((v): v is number => v !== undefined));
  const x = scaleLinear().domain([Math.min(...xs), Math.max(...xs)]).range([SCAN_MARGIN.left, width - SCAN_MARGIN.right]);
  const yExtent = ys.length ? [Math.min(...ys), Math.max(...ys)] : [0, 1];
  if (yExtent[0] === yExtent[1]) yExtent[1] = yExtent[0] + 1;
  const y = scaleLinear().domain(yExtent).nice().range([height - SCAN_MARGIN.bottom, SCAN_MARGIN.top]);
  const lines = scan.quantities.map((key, index) => {
    const points = scan.points.filter((point) => point.values[key] !== undefined);
    const path = line<(typeof points)[number]>()
      .x((point) => x(point.x))
      .y((point) => y(point.values[key]))(points);
    return { key, name: nameOfQuantity(key), color: seriesColors[index % seriesColors.length], path: path ?? '' };
  });
  const [xMin, xMax] = x.domain();
  const markers: { label: string; x: number }[] = [];
  if (scan.meanField !== null && scan.meanField >= xMin && scan.meanField <= xMax) markers.push({ label: 's = d/2', x: x(scan.meanField) });
  if (scan.sStar !== null && scan.sStar >= xMin && scan.sStar <= xMax) markers.push({ label: 's*', x: x(scan.sStar) });
  const followed = followedRuns(scan);
  const changes = followed.slice(1).map((run, i) => ({ x: px(x((followed[i].to + run.from) / 2)), label: `→ ${run.name}` }));
  // No y title: the lines are several quantities, named by the legend.
  return {
    ...axisFrame(x, y, width, height, SCAN_MARGIN, { x: scan.variable, y: '' }),
    lines,
    markers,
    followed,
    changes,
    markRow: MARK_ROW,
    changeRow: CHANGE_ROW,
    xOf: x,
    invertX: (pixel) => x.invert(pixel),
  };
}

/** The scan point nearest to an abscissa. */
export function nearestPoint(scan: ScanShape, xValue: number) {
  return scan.points.reduce((best, point) => (Math.abs(point.x - xValue) < Math.abs(best.x - xValue) ? point : best), scan.points[0]);
}

/** A label drawn above the plot area at x, kept inside the picture on the right. */
export const labelX = (x: number, width: number, label: string) => Math.min(x + 4, width - 4 - label.length * 6.5);

/** The scan's legend entries: one per line, solid, in its colour. */
export const scanLegend = (g: PlotGeometry): LegendEntry[] => g.lines.map((plotLine) => ({ label: plotLine.name, style: { color: plotLine.color } }));

/** A standalone SVG file of the plot; the caption and legend sit below the axes, outside the plot area. */
export function plotSvg(geometry: PlotGeometry): string {
  const g = geometry;
  const caption = followedCaption(g.followed);
  const legend = legendBelow(scanLegend(g), g, caption ? 1 : 0);
  const height = g.height + legend.height;
  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${g.width}" height="${height}" viewBox="0 0 ${g.width} ${height}" font-family="Inter, sans-serif" font-size="11">`);
  parts.push(`<rect width="100%" height="100%" fill="#FFFFFF"/>`);
  parts.push(...axesSvg(g));
  for (const marker of g.markers) {
    parts.push(`<line x1="${px(marker.x)}" x2="${px(marker.x)}" y1="${g.plotTop}" y2="${g.plotBottom}" stroke="${colors.amberDeep}" stroke-dasharray="4 3"/>`);
    parts.push(`<text x="${px(labelX(marker.x, g.width, marker.label))}" y="${g.markRow}" fill="${colors.amberDeep}">${escapeXml(marker.label)}</text>`);
  }
  for (const change of g.changes) {
    parts.push(`<line x1="${change.x}" x2="${change.x}" y1="${g.plotTop}" y2="${g.plotBottom}" stroke="${colors.inkSoft}" stroke-dasharray="1 3"/>`);
    parts.push(`<text x="${px(labelX(change.x, g.width, change.label))}" y="${g.changeRow}" fill="${colors.inkSoft}">${svgLabel(change.label)}</text>`);
  }
  for (const plotLine of g.lines) parts.push(`<path d="${plotLine.path}" fill="none" stroke="${plotLine.color}" stroke-width="2"/>`);
  if (caption) parts.push(`<text x="${g.plotLeft}" y="${g.height + 14}" fill="${colors.inkSoft}">${svgLabel(caption)}</text>`);
  parts.push(...legendSvg(legend.slots));
  parts.push('</svg>');
  return parts.join('\n');
}
