import { scaleLinear } from 'd3-scale';
import { line } from 'd3-shape';
import { colors } from '../../../constants/theme';
import { axesSvg, axisFrame, escapeXml, type AxisFrame, type PlotMargin } from '../plotAxes';
import type { ScanShape } from '../resultShapes';
import { nameOfQuantity } from '../texFormat';

export const seriesColors = ['#C9822B', '#26324A', '#2F7A4F', '#B23A3A', '#6B4FA0', '#2C7DA0'];
const SCAN_MARGIN: PlotMargin = { top: 16, right: 16, bottom: 40, left: 64 };

export interface PlotLine {
  key: string;
  name: string;
  color: string;
  path: string;
}

/** A scan's axes (from plotAxes, as every plot's), its lines and marks, and the scale for reading values back. */
export interface PlotGeometry extends AxisFrame {
  lines: PlotLine[];
  markers: { label: string; x: number }[];
  xOf: (value: number) => number;
  invertX: (pixel: number) => number;
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
  // No y title: the lines are several quantities, named by the legend.
  return { ...axisFrame(x, y, width, height, SCAN_MARGIN, { x: scan.variable, y: '' }), lines, markers, xOf: x, invertX: (pixel) => x.invert(pixel) };
}

/** The scan point nearest to an abscissa. */
export function nearestPoint(scan: ScanShape, xValue: number) {
  return scan.points.reduce((best, point) => (Math.abs(point.x - xValue) < Math.abs(best.x - xValue) ? point : best), scan.points[0]);
}

/** A standalone SVG file of the plot. */
export function plotSvg(geometry: PlotGeometry): string {
  const g = geometry;
  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${g.width}" height="${g.height}" viewBox="0 0 ${g.width} ${g.height}" font-family="Inter, sans-serif" font-size="11">`);
  parts.push(`<rect width="100%" height="100%" fill="#FFFFFF"/>`);
  parts.push(...axesSvg(g));
  for (const marker of g.markers) {
    parts.push(`<line x1="${marker.x}" x2="${marker.x}" y1="${g.plotTop}" y2="${g.plotBottom}" stroke="${colors.amberDeep}" stroke-dasharray="4 3"/>`);
    parts.push(`<text x="${marker.x + 4}" y="${g.plotTop + 12}" fill="${colors.amberDeep}">${escapeXml(marker.label)}</text>`);
  }
  g.lines.forEach((plotLine, index) => {
    parts.push(`<path d="${plotLine.path}" fill="none" stroke="${plotLine.color}" stroke-width="2"/>`);
    parts.push(`<rect x="${g.plotRight - 90}" y="${g.plotTop + 4 + index * 16}" width="12" height="3" fill="${plotLine.color}"/>`);
    parts.push(`<text x="${g.plotRight - 72}" y="${g.plotTop + 9 + index * 16}" fill="${colors.ink}">${escapeXml(plotLine.name)}</text>`);
  });
  parts.push('</svg>');
  return parts.join('\n');
}
