import { type DerivedFlow } from '../engine/diagrams/renormalization';
import { locateKinks } from '../engine/data/kinks';
import { exponentSeriesPartial, powerCoefficients, type Quantity } from '../engine/exponents/exponents';
import { type Crossover, crossoverFor } from '../engine/exponents/shortRange';
import { findFixedPoints } from '../engine/fixedpoints/fixedPoints';
import { checkPropagatorPower } from '../engine/flows/flow';
import { omittedFixedPoints } from '../engine/flows/family';
import { type ModelSpec } from '../engine/models/model';
import { EngineError, fail } from '../engine/precision/errors';
import { type Real, GUARD_DIGITS, rationalToReal, realContext, toExactRational } from '../engine/precision/real';
import { type ComparisonAxis, type VariantSpec, type VariantValue, axisFromS, deltaPhiFromS, fitSummary, pullOf, sFromAxis, seriesVariants, variantValues } from '../engine/scans/compare';
import { scanFlow } from '../engine/scans/flowScan';
import { type ScanPoint, meanFieldEnd, printedValues, scanSeries } from '../engine/scans/scan';
import { type LaurentSeries } from '../engine/series/laurent';
import { type Expression } from '../engine/symbolic/expression';
import { type Q, q, qAdd, qCompare, qMul, qSub } from '../engine/symbolic/rational';
import { DATASET_LIMITS } from '../notebook/datasets';
import { type CompareJob, type CompareResult } from './contract';
import { decimal } from './kinksJob';
import { type JobHooks, checkDimension, chooseFixedPoint, decimalText, deriveFor, exactPositive, formatCoefficient, modelFrom, refuseThirdAtThreeLoops } from './flowJobs';

/**
 * The "compare" job: the series of one quantity at every order (truncations and Padé approximants)
 * on the scan's grid of s and at every data point, residuals and pulls against the data, a χ²-like
 * summary per variant and, for a boundary curve, its kinks with the series' distance from each.
 */

type Regime = ScanPoint['regime'];
type PointRegime = Regime | 'outside';

/** The series at one s: a value or a defect for every variant. */
interface SeriesAt {
  s: Q;
  eps: Q;
  regime: PointRegime;
  values: Record<string, VariantValue>;
  note?: string;
  fixedPoint?: string | null;
  /** Why no variant has a value here (set with empty `values`). */
  defect?: string;
}

interface DataPoint {
  x: string;
  /** y and the errors as given, and as numbers. */
  text: { y: string; errLow?: string; errHigh?: string };
  y: Real;
  s: Q;
  errLow?: Real;
  errHigh?: Real;
}

const BACKGROUND_PROGRESS = 0.05;

export function runCompareJob(job: CompareJob, hooks: JobHooks = {}): CompareResult {
  const model = modelFrom(job.model);
  if ('member' in model) fail('not-representable', 'a comparison needs a numeric N (give "N" as a number, e.g. "N":3); the flow is derived once symbolically in s');
  const d = toExactRational(job.d);
  checkDimension(d);
  const curveS = curveGrid(job);
  const data = dataPoints(job, d);
  const axis: ComparisonAxis = job.data.xAxis;
  const crossover = crossoverFor(job.model, d, job.shortRange?.Delta_sigma);
  const shortRangeS = crossover?.sStar ?? null;
  const variants = seriesVariants(job.loops);
  const notes: string[] = crossover?.builtIn ? [`s* = ${decimalText(crossover.sStar, job.digits)} = d − 2Δσ with Δσ ${crossover.source.replace(/^built in: /, 'built in (')})`] : [];
  hooks.onProgress?.(0.01);
  const found = job.data.boundary ? kinksOf(data, notes) : [];
  // the series are evaluated at the kink position as reported, so distance and position agree
  const kinkS = found.map((k) => sFromAxis(axis, d, toExactRational(k.text.x)));

  const evaluate = seriesEvaluator({ job, model, d, shortRangeS, crossover, variants, hooks });
  const insideData = data.filter((p) => insideWindow(p.s));
  const insideKinks = kinkS.filter(insideWindow);
  const evaluated = evaluate([...curveS, ...insideData.map((p) => p.s), ...insideKinks]);
  const curveAt = evaluated.slice(0, curveS.length);
  const dataAt = new Map(insideData.map((p, i) => [p, evaluated[curveS.length + i]]));
  const kinkAt = evaluated.slice(curveS.length + insideData.length);

  const digits = job.digits;
  const text = (r: Real | null | undefined) => (r === null || r === undefined ? null : (formatCoefficient(r, digits) as string));
  const exact = (x: Q) => decimalText(x, digits);
  const region = { axis, shortRangeS };
  const pointResults = data.map((p) => pointResult(p, onAxis(dataAt.get(p) ?? outside(p.s, d, region), region), variants, digits));
  const withErrors = data.some((p) => p.errLow !== undefined);
  const fitted = (r: PointResult, values: Record<string, Real | null>, key: string) => (r.inFit ? values[key] : null);
  const result: CompareResult = {
    quantity: job.quantity,
    xAxis: axis,
    d: job.d,
    fixedPoint: job.fixedPoint ?? usedFixedPoint(evaluated),
    variants: variants.map(({ key, label, kind, order }) => ({ key, label, kind, order })),
    marks: {
      meanFieldEnd: { s: exact(meanFieldEnd(d)), x: exact(axisFromS(axis, d, meanFieldEnd(d))) },
      ...(shortRangeS ? { sStar: { s: exact(shortRangeS), x: exact(axisFromS(axis, d, shortRangeS)) } } : {}),
      dataRange: dataRange(data),
    },
    curve: curveAt.map((at) => ({
      s: exact(at.s),
      x: exact(axisFromS(axis, d, at.s)),
      eps: exact(at.eps),
      regime: at.regime as Regime,
      values: Object.fromEntries(variants.map((v) => [v.key, text(at.values[v.key].value)])),
      ...defectsOf(at, variants),
    })),
    points: pointResults.map(({ json }) => json),
    summary: variants.map((v) => {
      const residuals = pointResults.map((r) => fitted(r, r.residual, v.key));
      const summary = fitSummary(residuals, withErrors ? pointResults.map((r) => fitted(r, r.pull, v.key)) : null, digits);
      return { key: v.key, points: summary.points, chi2Points: summary.chi2Points, chi2: text(summary.chi2), chi2PerPoint: text(summary.chi2PerPoint), rms: text(summary.rms), maxAbs: text(summary.maxAbs) };
    }),
    ...(job.data.boundary ? { kinks: found.map((k, i) => kinkResult(k, kinkS[i], onAxis(kinkAt[insideKinks.indexOf(kinkS[i])] ?? outside(kinkS[i], d, region), region), variants, digits)) } : {}),
    notes: [...notes, ...comparisonNotes({ job, d, axis, data, evaluated, curveAt, dataAt, shortRangeS, variants, pointResults })],
  };
  hooks.onProgress?.(1);
  return result;
}

// ---- input --------------------------------------------------------------------------------------

function curveGrid(job: CompareJob): Q[] {
  const from = exactPositive(job.s.from, 's.from');
  const to = exactPositive(job.s.to, 's.to');
  checkPropagatorPower(from);
  checkPropagatorPower(to);
  return Array.from({ length: job.s.points }, (_, i) => qAdd(from, qMul(qSub(to, from), q(i, job.s.points - 1))));
}

/** Data text read exactly; every column as long as x; errors non-negative (one error column alone is symmetric). */
function dataPoints(job: CompareJob, d: Q): DataPoint[] {
  const { x, y, yErrLow, yErrHigh } = job.data;
  const columns: [string, string[] | undefined][] = [['y', y], ['yErrLow', yErrLow], ['yErrHigh', yErrHigh]];
  for (const [name, column] of columns) {
    if (column && column.length !== x.length) fail('invalid', `data.${name} has ${column.length} values for ${x.length} values of x`);
  }
  const work = job.digits + GUARD_DIGITS;
  const low = yErrLow ?? yErrHigh;
  const high = yErrHigh ?? yErrLow;
  return x.map((text, i) => {
    const point: DataPoint = { x: text, text: { y: y[i] }, y: realOf(y[i], work), s: sFromAxis(job.data.xAxis, d, toExactRational(text)) };
    if (low && high) {
      point.text = { y: y[i], errLow: low[i], errHigh: high[i] };
      point.errLow = realOf(low[i], work);
      point.errHigh = realOf(high[i], work);
      if (point.errLow.isNegative() || point.errHigh.isNegative()) fail('invalid', `data point ${i + 1} (x = ${text}) has a negative error; give errors as distances from y`);
    }
    return point;
  });
}

function realOf(text: string, digits: number): Real {
  return rationalToReal(toExactRational(text), digits);
}

/** The long-range model is defined for 0 < s ≤ 2 (s = 2 is the short-range theory). */
function insideWindow(s: Q): boolean {
  return qCompare(s, q(0)) > 0 && qCompare(s, q(2)) <= 0;
}

function dataRange(data: DataPoint[]): [string, string] {
  const exact = data.map((p) => ({ text: p.x, value: toExactRational(p.x) }));
  const min = exact.reduce((a, b) => (qCompare(b.value, a.value) < 0 ? b : a));
  const max = exact.reduce((a, b) => (qCompare(b.value, a.value) > 0 ? b : a));
  return [min.text, max.text];
}

// ---- kinks --------------------------------------------------------------------------------------

interface FoundKink {
  y: number;
  /** The figures as reported: as many digits as resolve the uncertainty (x) and the data's spread (y), as the kinks job writes them. */
  text: { x: string; y: string; uncertainty: string; strength: string };
}

/** The kink locator on the data as given (inverse-variance weights when every point has a non-zero error). */
function kinksOf(data: DataPoint[], notes: string[]): FoundKink[] {
  if (data.length < DATASET_LIMITS.minKinkPoints) {
    notes.push(`The kink locator needs at least ${DATASET_LIMITS.minKinkPoints} points (this boundary has ${data.length}): no kinks were looked for.`);
    return [];
  }
  const order = data.map((_, i) => i).sort((a, b) => Number(data[a].x) - Number(data[b].x) || a - b);
  const repeated = repeatedX(data, order);
  if (repeated) {
    notes.push(`No kinks: ${repeated}`);
    return [];
  }
  const sigma = data.map((p) => (p.errLow && p.errHigh ? Number(p.errLow.plus(p.errHigh).div(2)) : 0));
  const weights = sigma.every((s) => s > 0) ? sigma.map((s) => 1 / (s * s)) : undefined;
  const ys = order.map((i) => data[i].y.toNumber());
  try {
    const located = locateKinks(order.map((i) => Number(data[i].x)), ys, { weights: weights && order.map((i) => weights[i]) });
    if (located.kinks.length === 0) notes.push('No kink stands out from the noise: the boundary is smooth within its resampling uncertainty.');
    const yResolution = (Math.max(...ys) - Math.min(...ys)) * 1e-6;
    return located.kinks.map((k) => {
      if (!Number.isFinite(k.x)) fail('domain', 'the kink locator gave a non-finite position');
      return { y: k.y, text: { x: decimal(k.x, k.uncertainty / 10), y: decimal(k.y, yResolution), uncertainty: decimal(k.uncertainty), strength: decimal(k.strength) } };
    });
  } catch (error) {
    if (!(error instanceof EngineError)) throw error;
    notes.push(`No kinks: ${error.message}`);
    return [];
  }
}

/** Two points with the same x, named by their rows as given (1-based), or null. `order` sorts the points by x, ties in input order. */
function repeatedX(data: DataPoint[], order: number[]): string | null {
  for (let k = 1; k < order.length; k++) {
    const [first, second] = [order[k - 1], order[k]];
    if (Number(data[first].x) === Number(data[second].x)) return `points ${first + 1} and ${second + 1} have the same x (${data[first].x}); a curve needs one y per x`;
  }
  return null;
}

/** A kink as reported, its s, and series − kink y at that s for every variant (from the locator's y, not the rounded figure). */
function kinkResult(kink: FoundKink, s: Q, at: SeriesAt, variants: VariantSpec[], digits: number): NonNullable<CompareResult['kinks']>[number] {
  const y = realOf(String(kink.y), digits + GUARD_DIGITS);
  const text = (r: Real | null) => (r === null ? null : (formatCoefficient(r, digits) as string));
  return {
    ...kink.text,
    s: decimalText(s, digits),
    distance: Object.fromEntries(variants.map((v) => [v.key, text(difference(at.values[v.key]?.value, y, digits))])),
  };
}

// ---- series ---------------------------------------------------------------------------------------

interface EvaluatorContext {
  job: CompareJob;
  model: ModelSpec;
  d: Q;
  shortRangeS: Q | null;
  crossover: Crossover | null;
  variants: VariantSpec[];
  hooks: JobHooks;
}

/** Derives the flow once (symbolic in s) and returns a function giving every variant at many s, as runScan does. */
function seriesEvaluator(context: EvaluatorContext): (sValues: Q[]) => SeriesAt[] {
  const { job, model, d, shortRangeS, crossover, hooks } = context;
  const quantity = job.quantity as Quantity;
  const any = deriveFor(model, null, job.loops, job.digits);
  const flow = any.flow as DerivedFlow<Expression>;
  hooks.onProgress?.(BACKGROUND_PROGRESS);
  const onProgress = hooks.onProgress ? (f: number) => hooks.onProgress!(BACKGROUND_PROGRESS + (1 - 2 * BACKGROUND_PROGRESS) * f) : undefined;
  const grid = { d, shortRangeS, crossover, quantities: [quantity], digits: job.digits, onProgress, keepCoefficients: true };
  const toVariants = (p: ScanPoint & { fixedPoint?: string | null; note?: string }): SeriesAt => atPoint(p, context);
  if (model.couplings.length > 1) {
    return (sValues) => {
      refuseThirdAtThreeLoops(sValues, job.loops);
      return scanFlow({ ...grid, model, flow, sValues, choose: (candidates) => chooseFixedPoint(candidates, job.fixedPoint, false, omittedFixedPoints(flow)) }).map(toVariants);
    };
  }
  const point = chooseFixedPoint(findFixedPoints(model, flow, { eps: null }), job.fixedPoint, true, omittedFixedPoints(flow));
  const { series, unavailable } = exponentSeriesPartial(flow, point);
  if (unavailable[quantity]) fail('not-representable', unavailable[quantity] as string);
  const compiled = (k: Quantity) => ({ coefficients: powerCoefficients(series[k] as LaurentSeries<Expression>) });
  const primaries = { nuInv: series.nuInv ? compiled('nuInv') : null, omega: compiled('omega'), eta: compiled('eta') };
  return (sValues) => {
    refuseThirdAtThreeLoops(sValues, job.loops);
    return scanSeries({ ...grid, sValues, series: [compiled(quantity)], primaries, withPade: false }).map((p) => ({ ...toVariants(p), fixedPoint: point.name }));
  };
}

/**
 * The variants at one scan point: mean-field and exact long-range values for all; in the short-range
 * region the exact short-range value where one is known, else none; elsewhere truncations and Padé
 * from the coefficients.
 */
function atPoint(p: ScanPoint & { fixedPoint?: string | null; note?: string }, context: EvaluatorContext): SeriesAt {
  const { job, variants, shortRangeS } = context;
  const regime = regimeAt(p);
  const base = { s: p.s, eps: p.eps, regime, ...(p.note ? { note: p.note } : {}), ...(p.fixedPoint !== undefined ? { fixedPoint: p.fixedPoint } : {}) };
  const all = (value: VariantValue) => Object.fromEntries(variants.map((v) => [v.key, value]));
  if (p.regime === 'mean-field') return { ...base, values: all({ value: p.values[0] }) };
  if (regime === 'short-range') return { ...base, values: all(shortRangeValue(job.quantity, p.s, shortRangeS, job.digits + GUARD_DIGITS)) };
  const exactValue = exactLongRange(job.quantity, p.s, job.digits + GUARD_DIGITS);
  if (exactValue) return { ...base, values: all({ value: exactValue }) };
  const coefficients = p.coefficients?.[0];
  if (!coefficients || coefficients.length === 0) return { ...base, values: all({ value: null, defect: p.note ?? 'no series at this s' }) };
  // values stay at working precision: residuals and pulls are rounded once, when written
  const work = job.digits + GUARD_DIGITS;
  const eps = rationalToReal(p.eps, work);
  const primaries = p.primaryCoefficients;
  // a truncation is the printed value from 1/ν, ω and η truncated at that order (as scans and exponents print it)
  const truncatedAt = primaries ? (order: number) => printedValues([job.quantity as Quantity], primaries, context.d, p.s, eps, work, order)[0] : undefined;
  return { ...base, values: variantValues(variants, coefficients, eps, work, truncatedAt) };
}

/** s = 2 is the short-range theory whether or not s* is known; the scan grid marks it short-range only from s* on. */
function regimeAt(p: ScanPoint): PointRegime {
  return p.regime === 'long-range' && qCompare(p.s, q(2)) >= 0 ? 'short-range' : p.regime;
}

/** Where the short-range region starts: s* when known and below 2, else s = 2. */
function shortRangeStart(shortRangeS: Q | null): Q {
  return shortRangeS && qCompare(shortRangeS, q(2)) < 0 ? shortRangeS : q(2);
}

/** Human text of the region: "s ≥ s* = 1.9637" or "s = 2". */
function shortRangeRegion(shortRangeS: Q | null, digits: number): string {
  const start = shortRangeStart(shortRangeS);
  return qCompare(start, q(2)) < 0 ? `s ≥ s* = ${decimalText(start, digits)}` : 's = 2';
}

/**
 * In the short-range region η = 2 − s* = 2Δσ − d + 2 (the short-range theory's own η) for every variant
 * when s* is known; any other quantity has no long-range value there.
 */
function shortRangeValue(quantity: string, s: Q, shortRangeS: Q | null, digits: number): VariantValue {
  if (quantity === 'eta' && shortRangeS && qCompare(s, shortRangeS) >= 0) return { value: rationalToReal(qSub(q(2), shortRangeS), digits) };
  const region = shortRangeS && qCompare(shortRangeS, q(2)) < 0 ? 's ≥ s*' : 's = 2';
  return { value: null, defect: `short-range region (${region}): the long-range series does not apply` };
}

/** η = 2 − s + 2γ_φ with γ_φ = 0 to all orders in the long-range region (no field renormalization): every variant is 2 − s. */
function exactLongRange(quantity: string, s: Q, digits: number): Real | null {
  if (quantity !== 'eta' || qCompare(s, q(2)) >= 0) return null;
  return rationalToReal(qSub(q(2), s), digits);
}

interface Region {
  axis: ComparisonAxis;
  shortRangeS: Q | null;
}

/** Why a Δφ point has no long-range place: Δφ = (d − s)/2 fails in the short-range region. */
function deltaPhiDefect(shortRangeS: Q | null): string {
  const bound = shortRangeS && qCompare(shortRangeS, q(2)) < 0 ? 's < s*' : 's < 2';
  return `Δφ = (d − s)/2 holds only for ${bound}; at the short-range point Δφ = (d − 2 + η)/2`;
}

/** A position with no series: outside 0 < s ≤ 2, or (for Δφ data) at s ≥ 2, where Δφ does not give s. */
function outside(s: Q, d: Q, region: Region): SeriesAt {
  const defect = region.axis === 'Delta_phi' && qCompare(s, q(2)) >= 0 ? deltaPhiDefect(region.shortRangeS) : 'outside 0 < s ≤ 2, where the model is not defined';
  return { s, eps: qSub(qMul(q(2), s), d), regime: 'outside', values: {}, defect };
}

/** For Δφ data the short-range region has no long-range place either: no value there, whatever the quantity. */
function onAxis(at: SeriesAt, region: Region): SeriesAt {
  if (region.axis !== 'Delta_phi' || at.regime !== 'short-range') return at;
  return { ...at, values: {}, defect: deltaPhiDefect(region.shortRangeS) };
}

function usedFixedPoint(points: SeriesAt[]): string | null {
  return points.find((p) => p.fixedPoint && p.regime === 'long-range')?.fixedPoint ?? points.find((p) => p.fixedPoint)?.fixedPoint ?? null;
}

function defectsOf(at: SeriesAt, variants: VariantSpec[]): { defects?: Record<string, string> } {
  const defectOf = (key: string) => (at.values[key] ? at.values[key].defect : at.defect);
  const defects = Object.fromEntries(variants.flatMap((v) => (defectOf(v.key) ? [[v.key, defectOf(v.key) as string]] : [])));
  return Object.keys(defects).length ? { defects } : {};
}

// ---- points ---------------------------------------------------------------------------------------

function difference(value: Real | null | undefined, y: Real, digits: number): Real | null {
  if (value === null || value === undefined) return null;
  const R = realContext(digits + GUARD_DIGITS);
  return new R(value).minus(y);
}

interface PointResult {
  point: DataPoint;
  json: CompareResult['points'][number];
  residual: Record<string, Real | null>;
  pull: Record<string, Real | null>;
  /** Counted in χ², RMS and max |r|: everywhere but the short-range region. */
  inFit: boolean;
}

function pointResult(p: DataPoint, at: SeriesAt, variants: VariantSpec[], digits: number): PointResult {
  const text = (r: Real | null) => (r === null ? null : (formatCoefficient(r, digits) as string));
  const value = (key: string) => at.values[key]?.value ?? null;
  const residual = Object.fromEntries(variants.map((v) => [v.key, difference(value(v.key), p.y, digits)]));
  const hasErrors = p.errLow !== undefined && p.errHigh !== undefined;
  const pull = Object.fromEntries(variants.map((v) => [v.key, hasErrors && residual[v.key] ? pullOf(residual[v.key] as Real, p.errLow as Real, p.errHigh as Real) : null]));
  const json: CompareResult['points'][number] = {
    x: p.x,
    s: decimalText(p.s, digits),
    y: p.text.y,
    ...(hasErrors ? { errLow: p.text.errLow as string, errHigh: p.text.errHigh as string } : {}),
    regime: at.regime,
    series: Object.fromEntries(variants.map((v) => [v.key, text(value(v.key))])),
    residual: Object.fromEntries(variants.map((v) => [v.key, text(residual[v.key])])),
    ...(hasErrors ? { pull: Object.fromEntries(variants.map((v) => [v.key, text(pull[v.key])])) } : {}),
    ...defectsOf(at, variants),
  };
  return { point: p, json, residual, pull, inFit: at.regime !== 'short-range' };
}

// ---- notes ----------------------------------------------------------------------------------------

interface NotesContext {
  job: CompareJob;
  d: Q;
  axis: ComparisonAxis;
  data: DataPoint[];
  evaluated: SeriesAt[];
  curveAt: SeriesAt[];
  dataAt: Map<DataPoint, SeriesAt>;
  shortRangeS: Q | null;
  variants: VariantSpec[];
  pointResults: PointResult[];
}

const listed = (items: string[]) => (items.length > 5 ? `${items.slice(0, 5).join(', ')} and ${items.length - 5} more` : items.join(', '));

function comparisonNotes(c: NotesContext): string[] {
  return [...placementNotes(c), ...shortRangeNotes(c), ...seriesNotes(c), ...chi2Notes(c)];
}

/** Where the data sit: Δφ converted to s, points outside the model, mean-field points. */
function placementNotes(c: NotesContext): string[] {
  const notes: string[] = [];
  const digits = c.job.digits;
  const start = shortRangeStart(c.shortRangeS);
  const bound = qCompare(start, q(2)) < 0 ? `s < s* = ${decimalText(start, digits)}` : 's < 2';
  if (c.axis === 'Delta_phi') notes.push(`The data's x is Δφ: each point is placed at s = d − 2Δφ (Δφ = (d − s)/2 holds only in the long-range region ${bound}, where the field is not renormalized).`);
  const outsidePoints = c.pointResults.filter((r) => r.json.regime === 'outside' && !(c.axis === 'Delta_phi' && qCompare(r.point.s, q(2)) >= 0)).map((r) => r.point.x);
  if (outsidePoints.length) notes.push(`${outsidePoints.length} data point(s) lie outside 0 < s ≤ 2, where the model is not defined (x = ${listed(outsidePoints)}): no series there.`);
  const meanField = c.pointResults.filter((r) => r.json.regime === 'mean-field').map((r) => r.point.x);
  if (meanField.length) notes.push(`${meanField.length} data point(s) have s ≤ d/2 = ${decimalText(meanFieldEnd(c.d), digits)} (x = ${listed(meanField)}): the series are compared with the exact mean-field value there.`);
  return notes;
}

/** Data and curve points in the short-range region: no long-range comparison there, and none in χ². */
function shortRangeNotes(c: NotesContext): string[] {
  const notes: string[] = [];
  const digits = c.job.digits;
  const start = shortRangeStart(c.shortRangeS);
  const region = shortRangeRegion(c.shortRangeS, digits);
  const exactEta = (values: Record<string, VariantValue>) => Object.values(values).some((v) => v.value !== null);
  const etaShortRange = c.shortRangeS ? `the short-range value η = 2Δσ − d + 2 = ${decimalText(qSub(q(2), c.shortRangeS), digits)}` : '';
  if (c.axis === 'Delta_phi') {
    const beyond = c.pointResults.filter((r) => qCompare(r.point.s, start) >= 0 && r.json.regime !== 'mean-field').map((r) => r.point.x);
    if (beyond.length) notes.push(`${beyond.length} data point(s) have Δφ ≤ ${decimalText(deltaPhiFromS(c.d, start), digits)} (x = ${listed(beyond)}), which would place them at s ≥ ${decimalText(start, digits)}: Δφ = (d − s)/2 holds only below that, and at the short-range point Δφ = (d − 2 + η)/2. No series there; they are left out of χ².`);
  } else {
    const shortRange = c.pointResults.filter((r) => r.json.regime === 'short-range');
    if (shortRange.length) {
      const eta = shortRange.some((r) => exactEta(c.dataAt.get(r.point)?.values ?? {})) ? ` Every variant shows ${etaShortRange} there.` : '';
      notes.push(`${shortRange.length} data point(s) lie in the short-range region ${region} (x = ${listed(shortRange.map((r) => r.point.x))}): the long-range series does not apply there, and they are left out of χ².${eta}`);
    }
  }
  const curve = c.curveAt.filter((at) => at.regime === 'short-range');
  if (curve.length) {
    const shown = curve.some((at) => exactEta(at.values)) ? `the curve shows ${etaShortRange} instead` : 'the curve stops there';
    notes.push(`${curve.length} curve point(s) lie in the short-range region ${region}, where the long-range series does not apply: ${shown}.`);
  }
  return notes;
}

/** Exact long-range η, Padé defects and fixed-point failures. */
function seriesNotes(c: NotesContext): string[] {
  const notes: string[] = [];
  const start = shortRangeStart(c.shortRangeS);
  if (c.job.quantity === 'eta' && c.evaluated.some((at) => at.regime === 'long-range')) {
    const upper = qCompare(start, q(2)) < 0 ? 's*' : '2';
    notes.push(`η = 2 − s exactly for d/2 < s < ${upper} (γ_φ vanishes in the long-range region: no field renormalization): every variant takes this value there.`);
  }
  const longRange = (at: SeriesAt) => at.regime === 'long-range';
  for (const v of c.variants.filter((v) => v.kind === 'pade')) {
    const curve = c.curveAt.filter((at) => longRange(at) && at.values[v.key]?.defect).length;
    const points = [...c.dataAt.values()].filter((at) => longRange(at) && at.values[v.key]?.defect).length;
    if (curve + points) notes.push(`${v.label} is left out at ${curve} curve point(s) and ${points} data point(s) (a pole in (0, ε] or a degenerate approximant; see defects).`);
  }
  const failures = [...new Set(c.evaluated.filter((at) => at.fixedPoint === null && at.note).map((at) => at.note as string))];
  for (const message of failures) notes.push(`No fixed point at some s: ${message}`);
  return notes;
}

/** Points with a value but no usable error (zero on the side of the series) count in the RMS but not in χ². */
function chi2Notes(c: NotesContext): string[] {
  const withoutError = c.pointResults.filter((r) => r.inFit && r.point.errLow !== undefined && c.variants.some((v) => r.residual[v.key] !== null && r.pull[v.key] === null));
  if (!withoutError.length) return [];
  return [`${withoutError.length} data point(s) have a zero error on the side of the series (x = ${listed(withoutError.map((r) => r.point.x))}): no pull there, so χ² leaves them out (they still count in the RMS); each variant's χ² point count says how many points its χ² sums over.`];
}
