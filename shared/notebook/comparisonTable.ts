import type { CompareResult } from '../jobs/contract';
import { toCsv, isPlainNumber } from './csv';
import { AXIS_NAMES, AXIS_TEX } from './datasets';

/**
 * A comparison's table of points — x, the data with its errors, the series of each variant and the
 * residuals — as a LaTeX tabular ("Copy as TeX table") and as CSV (download). The TeX needs no
 * package beyond plain LaTeX; every number is checked to be a number before it is written.
 */

export interface ComparisonTableOptions {
  /** Variant keys to show, in this order (default: every variant of the result). */
  variants?: string[];
  /** Significant digits of the series and residuals (default 6); the data are written as given. */
  digits?: number;
  /** Residual columns (default true). */
  residuals?: boolean;
}

type Variant = CompareResult['variants'][number];

function chosenVariants(result: CompareResult, keys?: string[]): Variant[] {
  if (!keys) return result.variants;
  return keys.flatMap((key) => result.variants.filter((v) => v.key === key));
}

/** A variant's name in TeX: the order of the truncation, or the Padé degrees. */
export function variantTex(variant: Pick<Variant, 'key' | 'kind' | 'order'>): string {
  const pade = /^pade_(\d+)_(\d+)$/.exec(variant.key);
  if (pade) return `Pad\\'e $[${pade[1]}/${pade[2]}]$`;
  return variant.order === 1 ? '$O(\\varepsilon)$' : `$O(\\varepsilon^{${variant.order}})$`;
}

/** A decimal as TeX math text, rounded to `digits` significant digits when given; anything that is not a number becomes --. */
export function numberTex(text: string | null | undefined, digits?: number): string {
  if (text === null || text === undefined || !isPlainNumber(text)) return '--';
  const shown = digits === undefined ? text : String(Number(Number(text).toPrecision(digits)));
  const [mantissa, exponent] = shown.toLowerCase().split('e');
  return exponent === undefined ? mantissa : `${mantissa}\\times 10^{${Number(exponent)}}`;
}

function dataTex(point: CompareResult['points'][number]): string {
  const y = numberTex(point.y);
  if (point.errLow === undefined || point.errHigh === undefined) return `$${y}$`;
  if (point.errLow === point.errHigh) return `$${y} \\pm ${numberTex(point.errLow)}$`;
  return `$${y}^{+${numberTex(point.errHigh)}}_{-${numberTex(point.errLow)}}$`;
}

const mathCell = (text: string) => (text === '--' ? '--' : `$${text}$`);

export function comparisonTexTable(result: CompareResult, options: ComparisonTableOptions = {}): string {
  const variants = chosenVariants(result, options.variants);
  const digits = options.digits ?? 6;
  const residuals = options.residuals ?? true;
  const header = [
    `$${AXIS_TEX[result.xAxis]}$`,
    `$${AXIS_TEX[result.quantity]}$ (data)`,
    ...variants.map(variantTex),
    ...(residuals ? variants.map((v) => `$\\delta$ ${variantTex(v)}`) : []),
  ];
  const rows = result.points.map((point) => [
    mathCell(numberTex(point.x)),
    dataTex(point),
    ...variants.map((v) => mathCell(numberTex(point.series[v.key], digits))),
    ...(residuals ? variants.map((v) => mathCell(numberTex(point.residual[v.key], digits))) : []),
  ]);
  return [
    `% ${result.quantity} against ${result.xAxis} at d = ${numberTex(result.d)}; delta = series - data`,
    `\\begin{tabular}{${'r'.repeat(header.length)}}`,
    '\\hline',
    `${header.join(' & ')} \\\\`,
    '\\hline',
    ...rows.map((row) => `${row.join(' & ')} \\\\`),
    '\\hline',
    '\\end{tabular}',
  ].join('\n');
}

/**
 * Per variant: the points with a residual, the points χ² sums over (those with a usable error), χ²,
 * χ² per such point, the RMS residual and the largest residual, as a tabular.
 */
export function comparisonSummaryTex(result: CompareResult, options: Pick<ComparisonTableOptions, 'digits'> = {}): string {
  const digits = options.digits ?? 4;
  const rows = result.summary.map((row) => {
    const variant = result.variants.find((v) => v.key === row.key);
    const counts = [row.points, row.chi2Points].map((n) => numberTex(String(n)));
    return [variant ? variantTex(variant) : '--', ...counts, ...[row.chi2, row.chi2PerPoint, row.rms, row.maxAbs].map((v) => mathCell(numberTex(v, digits)))];
  });
  return [
    '\\begin{tabular}{lrrrrrr}',
    '\\hline',
    'series & points & points in $\\chi^2$ & $\\chi^2$ & $\\chi^2$/point & RMS residual & max $|\\delta|$ \\\\',
    '\\hline',
    ...rows.map((row) => `${row.join(' & ')} \\\\`),
    '\\hline',
    '\\end{tabular}',
  ].join('\n');
}

/** The same table as CSV: x, s, the data and its errors, then series, residual and pull of every variant, at full precision. */
export function comparisonCsv(result: CompareResult): string {
  const x = AXIS_NAMES[result.xAxis];
  const y = AXIS_NAMES[result.quantity];
  const withErrors = result.points.some((p) => p.errLow !== undefined);
  const header = [
    x,
    ...(result.xAxis === 's' ? [] : ['s']),
    `${y} (data)`,
    ...(withErrors ? ['error below', 'error above'] : []),
    ...result.variants.map((v) => v.label),
    ...result.variants.map((v) => `residual ${v.label}`),
    ...(withErrors ? result.variants.map((v) => `pull ${v.label}`) : []),
    'regime',
  ];
  const value = (v: string | null | undefined) => v ?? '';
  const rows = result.points.map((p) => [
    p.x,
    ...(result.xAxis === 's' ? [] : [p.s]),
    p.y,
    ...(withErrors ? [value(p.errLow), value(p.errHigh)] : []),
    ...result.variants.map((v) => value(p.series[v.key])),
    ...result.variants.map((v) => value(p.residual[v.key])),
    ...(withErrors ? result.variants.map((v) => value(p.pull?.[v.key])) : []),
    p.regime,
  ]);
  return toCsv(header, rows);
}
