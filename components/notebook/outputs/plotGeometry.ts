import { scaleLinear } from 'd3-scale';
import { line } from 'd3-shape';
import type { ScanShape } from '../resultShapes';
import { nameOfQuantity } from '../texFormat';

export const seriesColors = ['#C9822B', '#26324A', '#2F7A4F', '#B23A3A', '#6B4FA0', '#2C7DA0'];
export const PLOT_MARGIN = { top: 16, right: 16, bottom: 40, left: 64 };

export interface PlotLine {
  key: string;
  name: string;
  color: string;
  path: string;
}

export interface PlotGeometry {
  width: number;
  height: number;
  xTicks: { value: number; x: number }[];
  yTicks: { value: number; y: number }[];
  lines: PlotLine[];
  markers: { label: string; x: number }[];
  xOf: (value: number) => number;
  yOf: (value: number) => number;
  invertX: (pixel: number) => number;
  plotLeft: number;
  plotRight: number;
  plotTop: number;
  plotBottom: number;
}

/** Scales, ticks and line paths of a scan, shared by the on-screen plot and the SVG export. */
export function plotGeometry(scan: ScanShape, width: number, height: number): PlotGeometry {
  const xs = scan.points.map((point) => point.x);
  const ys = scan.points.flatMap((point) => scan.quantities.map((key) => point.values[key]).filter((v): v is number => v !== undefined));
  const x = scaleLinear().domain([Math.min(...xs), Math.max(...xs)]).range([PLOT_MARGIN.left, width - PLOT_MARGIN.right]);
  const yExtent = ys.length ? [Math.min(...ys), Math.max(...ys)] : [0, 1];
  if (yExtent[0] === yExtent[1]) yExtent[1] = yExtent[0] + 1;
  const y = scaleLinear().domain(yExtent).nice().range([height - PLOT_MARGIN.bottom, PLOT_MARGIN.top]);
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
  return {
    width,
    height,
    xTicks: x.ticks(Math.max(2, Math.floor(width / 90))).map((value) => ({ value, x: x(value) })),
    yTicks: y.ticks(Math.max(2, Math.floor(height / 50))).map((value) => ({ value, y: y(value) })),
    lines,
    markers,
    xOf: x,
    yOf: y,
    invertX: (pixel) => x.invert(pixel),
    plotLeft: PLOT_MARGIN.left,
    plotRight: width - PLOT_MARGIN.right,
    plotTop: PLOT_MARGIN.top,
    plotBottom: height - PLOT_MARGIN.bottom,
  };
}

/** The scan point nearest to an abscissa. */
export function nearestPoint(scan: ScanShape, xValue: number) {
  return scan.points.reduce((best, point) => (Math.abs(point.x - xValue) < Math.abs(best.x - xValue) ? point : best), scan.points[0]);
}

export const tickText = (value: number) => String(Number(value.toPrecision(6)));

const escapeXml = (text: string) => text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

/** A standalone SVG file of the plot. */
export function plotSvg(scan: ScanShape, geometry: PlotGeometry): string {
  const g = geometry;
  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${g.width}" height="${g.height}" viewBox="0 0 ${g.width} ${g.height}" font-family="Inter, sans-serif" font-size="11">`);
  parts.push(`<rect width="100%" height="100%" fill="#FFFFFF"/>`);
  for (const tick of g.yTicks) {
    parts.push(`<line x1="${g.plotLeft}" x2="${g.plotRight}" y1="${tick.y}" y2="${tick.y}" stroke="#E2DED3"/>`);
    parts.push(`<text x="${g.plotLeft - 6}" y="${tick.y + 4}" text-anchor="end" fill="#4A5266">${tickText(tick.value)}</text>`);
  }
  for (const tick of g.xTicks) {
    parts.push(`<line x1="${tick.x}" x2="${tick.x}" y1="${g.plotBottom}" y2="${g.plotBottom + 5}" stroke="#4A5266"/>`);
    parts.push(`<text x="${tick.x}" y="${g.plotBottom + 18}" text-anchor="middle" fill="#4A5266">${tickText(tick.value)}</text>`);
  }
  parts.push(`<line x1="${g.plotLeft}" x2="${g.plotRight}" y1="${g.plotBottom}" y2="${g.plotBottom}" stroke="#4A5266"/>`);
  parts.push(`<line x1="${g.plotLeft}" x2="${g.plotLeft}" y1="${g.plotTop}" y2="${g.plotBottom}" stroke="#4A5266"/>`);
  parts.push(`<text x="${(g.plotLeft + g.plotRight) / 2}" y="${g.height - 6}" text-anchor="middle" fill="#1C2230">${escapeXml(scan.variable)}</text>`);
  for (const marker of g.markers) {
    parts.push(`<line x1="${marker.x}" x2="${marker.x}" y1="${g.plotTop}" y2="${g.plotBottom}" stroke="#9E6217" stroke-dasharray="4 3"/>`);
    parts.push(`<text x="${marker.x + 4}" y="${g.plotTop + 12}" fill="#9E6217">${escapeXml(marker.label)}</text>`);
  }
  g.lines.forEach((plotLine, index) => {
    parts.push(`<path d="${plotLine.path}" fill="none" stroke="${plotLine.color}" stroke-width="2"/>`);
    parts.push(`<rect x="${g.plotRight - 90}" y="${g.plotTop + 4 + index * 16}" width="12" height="3" fill="${plotLine.color}"/>`);
    parts.push(`<text x="${g.plotRight - 72}" y="${g.plotTop + 9 + index * 16}" fill="#1C2230">${escapeXml(plotLine.name)}</text>`);
  });
  parts.push('</svg>');
  return parts.join('\n');
}
