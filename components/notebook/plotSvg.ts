import { scaleLinear } from 'd3-scale';
import { colors, comparisonPlot } from '../../constants/theme';
import type { CompareResult, SeriesVariant } from '../../shared/jobs/contract';
import { AXIS_NAMES } from '../../shared/notebook/datasets';
import { axesSvg, axisFrame, escapeXml, px, type AxisFrame } from './plotAxes';

/**
 * Geometry of a comparison (series variants against a dataset) and its residuals, shared by the on-screen
 * plots (react-native-svg) and the standalone SVG file, so both draw exactly the same thing.
 */

export type DataShow = 'points' | 'boundary';

export interface VariantStyle {
  color: string;
  dash?: string;
}

export const COMPARISON_MARGIN = { top: 16, right: 16, bottom: 44, left: 60 };
const RESIDUAL_MARGIN = { top: 10, right: 16, bottom: 30, left: 60 };

/** A colour and a dash pattern per variant: the highest truncation solid, lower ones dotted, Padé dashed. */
export function variantStyles(variants: SeriesVariant[]): Record<string, VariantStyle> {
  const styles: Record<string, VariantStyle> = {};
  const truncated = variants.filter((variant) => variant.kind === 'truncated').sort((a, b) => b.order - a.order);
  const pade = variants.filter((variant) => variant.kind === 'pade');
  truncated.forEach((variant, i) => (styles[variant.key] = { ...comparisonPlot.truncated[i % comparisonPlot.truncated.length] }));
  pade.forEach((variant, i) => (styles[variant.key] = { ...comparisonPlot.pade[i % comparisonPlot.pade.length] }));
  return styles;
}

/** A decimal string as a finite number, else null (missing values, defects). */
export function finiteOf(value: string | null | undefined): number | null {
  if (value === null || value === undefined) return null;
  const number = Number(value);
  return Number.isFinite(number) ? number : null;
}

/** Path data of a line that breaks wherever a value is missing: one `M … L …` run per unbroken stretch. */
export function brokenLine(points: ({ x: number; y: number } | null)[]): string[] {
  const runs: string[] = [];
  let current: string[] = [];
  const close = () => {
    if (current.length === 1) current.push(current[0].replace('M', 'L'));
    if (current.length) runs.push(current.join(' '));
    current = [];
  };
  for (const point of points) {
    if (!point) close();
    else current.push(`${current.length ? 'L' : 'M'}${px(point.x)},${px(point.y)}`);
  }
  close();
  return runs;
}

export interface CurveGeometry {
  key: string;
  label: string;
  style: VariantStyle;
  segments: string[];
}

export interface DataPointGeometry {
  cx: number;
  cy: number;
  /** Error bar ends (pixels), when the point has errors. */
  barTop?: number;
  barBottom?: number;
}

export interface MarkGeometry {
  key: 'meanfield' | 'sstar';
  label: string;
  x: number;
}

export interface KinkGeometry {
  cx: number;
  cy: number;
  x0: number;
  x1: number;
}

export interface ComparisonGeometry extends AxisFrame {
  xDomain: [number, number];
  band: { x0: number; x1: number } | null;
  marks: MarkGeometry[];
  curves: CurveGeometry[];
  data: { show: 'points'; points: DataPointGeometry[] } | { show: 'boundary'; segments: string[] };
  kinks: KinkGeometry[];
}

function extent(values: number[], fallback: [number, number]): [number, number] {
  if (values.length === 0) return fallback;
  let low = Infinity;
  let high = -Infinity;
  for (const value of values) {
    if (value < low) low = value;
    if (value > high) high = value;
  }
  if (low === high) return [low - 0.5, high + 0.5];
  return [low, high];
}

const dataErrors = (point: CompareResult['points'][number]) => ({ low: finiteOf(point.errLow) ?? 0, high: finiteOf(point.errHigh) ?? finiteOf(point.errLow) ?? 0 });

/**
 * The y-range: the data with its errors and the truncated series always; Padé values only near that range,
 * so a value close to a pole (outside (0, ε), hence not a defect) cannot flatten everything else.
 */
function comparisonYDomain(result: CompareResult): [number, number] {
  const kinds = new Map(result.variants.map((variant) => [variant.key, variant.kind]));
  const core: number[] = [];
  for (const point of result.points) {
    const y = finiteOf(point.y);
    if (y === null) continue;
    const { low, high } = dataErrors(point);
    core.push(y - low, y + high);
  }
  const pade: number[] = [];
  for (const row of result.curve) {
    for (const [key, value] of Object.entries(row.values)) {
      const number = finiteOf(value);
      if (number === null) continue;
      (kinds.get(key) === 'pade' ? pade : core).push(number);
    }
  }
  for (const kink of result.kinks ?? []) {
    const y = finiteOf(kink.y);
    if (y !== null) core.push(y);
  }
  const [low, high] = extent(core, [0, 1]);
  const reach = Math.max(high - low, Math.abs(high) * 0.1, 1e-9);
  return extent([...core, ...pade.filter((value) => value >= low - reach && value <= high + reach)], [0, 1]);
}

function comparisonXDomain(result: CompareResult): [number, number] {
  const xs: number[] = [];
  for (const row of result.curve) {
    const x = finiteOf(row.x);
    if (x !== null) xs.push(x);
  }
  for (const point of result.points) {
    const x = finiteOf(point.x);
    if (x !== null) xs.push(x);
  }
  return extent(xs, [0, 1]);
}

export const axisName = (kind: string) => (AXIS_NAMES as Record<string, string>)[kind] ?? kind;

/** Scales, curves, data, marks and kinks of a comparison at a size. */
export function comparisonGeometry(result: CompareResult, show: DataShow, width: number, height: number): ComparisonGeometry {
  const xDomain = comparisonXDomain(result);
  const x = scaleLinear().domain(xDomain).range([COMPARISON_MARGIN.left, width - COMPARISON_MARGIN.right]);
  const y = scaleLinear().domain(comparisonYDomain(result)).nice().range([height - COMPARISON_MARGIN.bottom, COMPARISON_MARGIN.top]);
  const [yLow, yHigh] = y.domain();
  const inside = (value: number | null, low: number, high: number) => value !== null && value >= low && value <= high;
  const styles = variantStyles(result.variants);

  const curves = result.variants.map((variant) => {
    const points = result.curve.map((row) => {
      const xValue = finiteOf(row.x);
      const yValue = row.defects?.[variant.key] ? null : finiteOf(row.values[variant.key]);
      return xValue !== null && inside(yValue, yLow, yHigh) ? { x: x(xValue), y: y(yValue as number) } : null;
    });
    return { key: variant.key, label: variant.label, style: styles[variant.key], segments: brokenLine(points) };
  });

  const dataPoints = result.points.flatMap((point) => {
    const xValue = finiteOf(point.x);
    const yValue = finiteOf(point.y);
    return xValue === null || yValue === null ? [] : [{ xValue, yValue, point }];
  });
  const data: ComparisonGeometry['data'] =
    show === 'boundary'
      ? { show, segments: brokenLine([...dataPoints].sort((a, b) => a.xValue - b.xValue).map(({ xValue, yValue }) => ({ x: x(xValue), y: y(yValue) }))) }
      : {
          show,
          points: dataPoints.map(({ xValue, yValue, point }) => {
            const hasErrors = point.errLow !== undefined || point.errHigh !== undefined;
            const { low, high } = dataErrors(point);
            return { cx: px(x(xValue)), cy: px(y(yValue)), ...(hasErrors ? { barTop: px(y(yValue + high)), barBottom: px(y(yValue - low)) } : {}) };
          }),
        };

  const marks: MarkGeometry[] = [];
  const meanField = finiteOf(result.marks.meanFieldEnd.x);
  if (inside(meanField, xDomain[0], xDomain[1])) marks.push({ key: 'meanfield', label: 's = d/2', x: px(x(meanField as number)) });
  const sStar = finiteOf(result.marks.sStar?.x);
  if (inside(sStar, xDomain[0], xDomain[1])) marks.push({ key: 'sstar', label: 's*', x: px(x(sStar as number)) });

  const [rangeFrom, rangeTo] = result.marks.dataRange.map(finiteOf);
  const band = rangeFrom !== null && rangeTo !== null ? { x0: px(x(Math.min(rangeFrom, rangeTo))), x1: px(x(Math.max(rangeFrom, rangeTo))) } : null;

  const clampX = (pixel: number) => Math.min(Math.max(pixel, COMPARISON_MARGIN.left), width - COMPARISON_MARGIN.right);
  const kinks = (result.kinks ?? []).flatMap((kink) => {
    const kx = finiteOf(kink.x);
    const ky = finiteOf(kink.y);
    if (kx === null || ky === null) return [];
    const spread = Math.abs(finiteOf(kink.uncertainty) ?? 0);
    return [{ cx: px(x(kx)), cy: px(y(ky)), x0: px(clampX(Math.min(x(kx - spread), x(kx + spread)))), x1: px(clampX(Math.max(x(kx - spread), x(kx + spread)))) }];
  });

  return {
    ...axisFrame(x, y, width, height, COMPARISON_MARGIN, { x: axisName(result.xAxis), y: axisName(result.quantity) }),
    xDomain,
    band,
    marks,
    curves,
    data,
    kinks,
  };
}

export interface ResidualGeometry extends AxisFrame {
  /** Pulls (residual over the error) when the data has errors, else plain residuals. */
  measure: 'pull' | 'residual';
  zeroY: number;
  series: { key: string; style: VariantStyle; segments: string[]; dots: { cx: number; cy: number }[] }[];
}

/** Residuals (or pulls) per variant against the data's x; dots only while they stay few enough to read. */
export function residualGeometry(result: CompareResult, xDomain: [number, number], width: number, height: number, maxDots = 200): ResidualGeometry {
  const measure = result.points.some((point) => point.pull && Object.values(point.pull).some((value) => value !== null)) ? 'pull' : 'residual';
  const valueOf = (point: CompareResult['points'][number], key: string) => finiteOf(measure === 'pull' ? point.pull?.[key] : point.residual[key]);
  const all = result.points.flatMap((point) => result.variants.map((variant) => valueOf(point, variant.key)).filter((value): value is number => value !== null));
  const reach = Math.max(...all.map(Math.abs), 0) || 1;
  const x = scaleLinear().domain(xDomain).range([RESIDUAL_MARGIN.left, width - RESIDUAL_MARGIN.right]);
  const y = scaleLinear().domain([-reach, reach]).nice().range([height - RESIDUAL_MARGIN.bottom, RESIDUAL_MARGIN.top]);
  const styles = variantStyles(result.variants);
  const ordered = [...result.points].sort((a, b) => Number(a.x) - Number(b.x));
  const series = result.variants.map((variant) => {
    const placed = ordered.map((point) => {
      const value = valueOf(point, variant.key);
      const xValue = finiteOf(point.x);
      return value === null || xValue === null ? null : { x: x(xValue), y: y(value) };
    });
    const dots = ordered.length <= maxDots ? placed.flatMap((point) => (point ? [{ cx: px(point.x), cy: px(point.y) }] : [])) : [];
    return { key: variant.key, style: styles[variant.key], segments: brokenLine(placed), dots };
  });
  return {
    ...axisFrame(x, y, width, height, RESIDUAL_MARGIN, { x: axisName(result.xAxis), y: measure === 'pull' ? 'r / σ' : 'r' }),
    measure,
    zeroY: px(y(0)),
    series,
  };
}

const dashAttribute = (dash?: string) => (dash ? ` stroke-dasharray="${dash}"` : '');

export interface LegendEntry {
  label: string;
  style: VariantStyle;
  dots?: boolean;
}

export interface LegendSlot extends LegendEntry {
  /** Start of the sample line and baseline of the label. */
  x: number;
  y: number;
}

const LEGEND_ROW = 18;
const LEGEND_SAMPLE = 24;
/** A generous width per character of an 11 px label, so entries never run into each other. */
const LEGEND_CHAR = 6.5;

/**
 * Legend entries in rows below the picture (under the x-axis title), wrapped to its width: outside the plot
 * area, so no entry can cover a curve. `skipRows` leaves room for a caption line first.
 */
export function legendBelow(entries: LegendEntry[], frame: { width: number; height: number; plotLeft: number }, skipRows = 0): { slots: LegendSlot[]; height: number } {
  const slots: LegendSlot[] = [];
  const right = frame.width - 8;
  let row = skipRows;
  let x = frame.plotLeft;
  for (const entry of entries) {
    const span = LEGEND_SAMPLE + 6 + entry.label.length * LEGEND_CHAR;
    if (x > frame.plotLeft && x + span > right) {
      row += 1;
      x = frame.plotLeft;
    }
    slots.push({ ...entry, x, y: frame.height + 14 + row * LEGEND_ROW });
    x += span + 16;
  }
  const rows = slots.length ? row + 1 : skipRows;
  return { slots, height: rows ? rows * LEGEND_ROW + 8 : 0 };
}

/** Lowercase Greek in the math face, so ν in a saved file never reads as v (a viewer without it falls back to a serif italic). */
export function svgLabel(text: string): string {
  return escapeXml(text).replace(/[\u03B1-\u03C9\u03D1\u03D5\u03D6\u03F5]+/g, (greek) => `<tspan font-family="KaTeX_Math, 'Latin Modern Math', 'STIX Two Math', 'Cambria Math', serif" font-style="italic">${greek}</tspan>`);
}

export function legendSvg(slots: LegendSlot[]): string[] {
  return slots.flatMap((slot) => [
    slot.dots
      ? `<circle cx="${px(slot.x + LEGEND_SAMPLE / 2)}" cy="${slot.y - 4}" r="3" fill="${slot.style.color}"/>`
      : `<line x1="${px(slot.x)}" x2="${px(slot.x + LEGEND_SAMPLE)}" y1="${slot.y - 4}" y2="${slot.y - 4}" stroke="${slot.style.color}" stroke-width="2"${dashAttribute(slot.style.dash)}/>`,
    `<text x="${px(slot.x + LEGEND_SAMPLE + 6)}" y="${slot.y}" fill="${colors.ink}">${svgLabel(slot.label)}</text>`,
  ]);
}

/** The comparison's legend entries: each variant, the data, and the kinks when there are any. */
export function comparisonLegend(g: ComparisonGeometry, dataLabel: string): LegendEntry[] {
  return [
    ...g.curves.map((curve) => ({ label: curve.label, style: curve.style })),
    { label: dataLabel, style: { color: comparisonPlot.data }, dots: g.data.show === 'points' },
    ...(g.kinks.length ? [{ label: 'kink ± uncertainty', style: { color: comparisonPlot.kink } }] : []),
  ];
}

/** A standalone SVG file of the overlay plot, its legend below the axes (outside the plot area). */
export function comparisonSvg(g: ComparisonGeometry, dataLabel: string): string {
  const legend = legendBelow(comparisonLegend(g, dataLabel), g);
  const height = g.height + legend.height;
  const parts: string[] = [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<svg xmlns="http://www.w3.org/2000/svg" width="${g.width}" height="${height}" viewBox="0 0 ${g.width} ${height}" font-family="Inter, Helvetica, Arial, sans-serif" font-size="11">`,
    `<rect width="100%" height="100%" fill="#FFFFFF"/>`,
  ];
  if (g.band) parts.push(`<rect x="${g.band.x0}" y="${g.plotTop}" width="${Math.max(1, px(g.band.x1 - g.band.x0))}" height="${g.plotBottom - g.plotTop}" fill="${comparisonPlot.dataBand}"/>`);
  parts.push(...axesSvg(g));
  for (const mark of g.marks) {
    parts.push(`<line x1="${mark.x}" x2="${mark.x}" y1="${g.plotTop}" y2="${g.plotBottom}" stroke="${comparisonPlot.mark}" stroke-dasharray="4 3"/>`);
    parts.push(`<text x="${mark.x + 4}" y="${g.plotTop + 12}" fill="${comparisonPlot.mark}">${escapeXml(mark.label)}</text>`);
  }
  if (g.data.show === 'boundary') {
    parts.push(`<path d="${g.data.segments.join(' ')}" fill="none" stroke="${comparisonPlot.data}" stroke-width="3" stroke-opacity="0.85"/>`);
  } else {
    for (const point of g.data.points) {
      if (point.barTop !== undefined && point.barBottom !== undefined) {
        parts.push(`<line x1="${point.cx}" x2="${point.cx}" y1="${point.barTop}" y2="${point.barBottom}" stroke="${comparisonPlot.data}"/>`);
      }
      parts.push(`<circle cx="${point.cx}" cy="${point.cy}" r="3" fill="${comparisonPlot.data}"/>`);
    }
  }
  for (const curve of g.curves) {
    parts.push(`<path d="${curve.segments.join(' ')}" fill="none" stroke="${curve.style.color}" stroke-width="2" stroke-linecap="round"${dashAttribute(curve.style.dash)}/>`);
  }
  for (const kink of g.kinks) {
    parts.push(`<line x1="${kink.x0}" x2="${kink.x1}" y1="${kink.cy}" y2="${kink.cy}" stroke="${comparisonPlot.kink}" stroke-width="2"/>`);
    parts.push(`<path d="M${kink.cx},${kink.cy - 6} L${kink.cx + 6},${kink.cy} L${kink.cx},${kink.cy + 6} L${kink.cx - 6},${kink.cy} Z" fill="${comparisonPlot.kink}"/>`);
  }
  parts.push(...legendSvg(legend.slots));
  parts.push('</svg>');
  return parts.join('\n') + '\n';
}
