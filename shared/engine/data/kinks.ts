import { JOB_LIMITS } from '../../jobs/contract/limits';
import { fail } from '../precision';
import { mulberry32 } from './random';
import { evaluateSpline, fitSpline, gcvSpline, intervalOf, prepareSpline, type SplineFit } from './spline';

/**
 * Kink locator for a boundary curve (x increasing, y = boundary). Double precision throughout.
 *
 * 1. Fit: x and y rescaled to [0, 1]; cubic smoothing spline with λ by generalised cross-validation
 *    (spline.ts).
 * 2. Candidates: interior local maxima of |F''| of the fit in the rescaled frame, on a uniform grid of
 *    4 points per data point (2 000 to 20 000).
 * 3. A candidate is a kink when it stands out from the noise. Every test below is made in the rescaled
 *    frame, so the decision does not depend on the units (or offsets) of x and y: |f''| in any units is
 *    a constant times |F''|, whereas κ in data units is not (its (1 + f'²)^{3/2} turns the extrema of a
 *    sine into sharp κ peaks once x is measured in smaller units).
 *    - |F''| at the peak / median |F''| over the grid ≥ minStrength (the median is floored at 10⁻⁴ of
 *      the largest value);
 *    - local prominence (peak over the higher of the lowest values on either side, within
 *      3.5 smoother bandwidths) ≥ minProminence;
 *    - not within 2 data spacings or 6 bandwidths of an end, where the natural end condition f'' = 0
 *      makes |f''| overshoot by itself;
 *    - its turning (the slope change across it beyond the neighbouring background) is at least
 *      minTurningSignificance standard deviations of the turning that noise alone makes — noise of
 *      the data's level (a robust difference estimate) passed through the same smoother; stretches
 *      holding a taller candidate or an accepted kink are not background;
 *    - tallest first, and not on the rings (side lobes) of a taller kink;
 *    - a |F''| peak above minStrength · median reappears within the match window in at least
 *      minReappearance of the bootstrap resamples (pairs drawn with replacement; repeats are weights;
 *      same λ), and the resamples and the full data agree on where it is (see agrees).
 * 4. Position: the maximum of |f''| next to the peak (see peakOfSecond). Uncertainty =
 *    sqrt(sd_bootstrap² + sd_noise² + (h/2)² + bias²): the spread over the resamples, the spread when
 *    fresh noise is added to the fit, half the local data spacing h, and the smoothing bias estimated
 *    as the shift of the position when the smoother is applied to the fitted curve itself.
 * 5. Strength, reported and used to order the kinks: the curvature κ = |y''| / (1 + y'²)^{3/2} in the
 *    data's own units, its largest value within the match window over the median κ of the grid (the
 *    median floored as above, so strengths stop at 10⁴ on straight stretches). It describes the kink
 *    as plotted in those units and so changes with them; whether there is a kink does not.
 */

export interface KinkFound { x: number; y: number; uncertainty: number; strength: number }
export interface KinkSearch { kinks: KinkFound[]; lambda: number; effectiveDof: number; gcv: number; resamples: number }

export const KINK_THRESHOLDS = {
  minStrength: 4,
  minProminence: 2,
  minReappearance: 0.7,
  /** The turning at the peak beyond the smooth background, in standard deviations of what noise makes. */
  minTurningSignificance: 4.5,
  edgeSpacings: 2,
  /** The match window: this many local data spacings, or the peak's half width if wider. */
  windowSpacings: 4,
  defaultResamples: JOB_LIMITS.defaultResamples,
  defaultSeed: 1,
} as const;

/** The median κ is at least this fraction of the largest κ (strengths are capped at its inverse). */
const MEDIAN_FLOOR = 1e-4;
/** At most this many kinks are reported (the tallest in |F''|). */
export const MAX_KINKS = 20;
const NOISE_PROBES = 60;
const SIDE_LOBE_SPACINGS = 8;
const SIDE_LOBE_WIDTHS = 6;
const SIDE_LOBE_BANDWIDTHS = 6;
const EDGE_BANDWIDTHS = 6;
/** How far to look for the minima that flank a peak: the kernel's f'' response crosses zero at 3.3 bandwidths. */
const PROMINENCE_SPACINGS = 4;
const PROMINENCE_BANDWIDTHS = 3.5;
/** Noise level assumed at least this (y rescaled to [0, 1]): exact data still carry rounding. */
const NOISE_FLOOR = 1e-9;
const MIN_GRID = 2000;
const MAX_GRID = 20000;
const GRID_PER_POINT = 4;

interface Scaling { x0: number; xs: number; y0: number; ys: number }

interface Peak {
  index: number;
  x: number;
  /** |F''| at the peak (the unit-free frame). */
  height: number;
  /** The height over the higher of the two flanking minima, at grid index `col`. */
  prominence: number;
  col: number;
  halfWidth: number;
}

export function locateKinks(x: number[], y: number[], options: { resamples?: number; seed?: number; weights?: number[] } = {}): KinkSearch {
  const n = x.length;
  if (n < 3 || y.length !== n) fail('invalid', 'the kink locator needs at least 3 points with one y per x');
  for (let i = 0; i < n; i++) if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) fail('invalid', `point ${i + 1} is not a pair of finite numbers`);
  for (let i = 1; i < n; i++) if (!(x[i] > x[i - 1])) fail('invalid', `x must increase strictly (points ${i} and ${i + 1})`);
  const resamples = options.resamples ?? KINK_THRESHOLDS.defaultResamples;
  const seed = options.seed ?? KINK_THRESHOLDS.defaultSeed;
  const weights = options.weights ?? x.map(() => 1);
  const meanWeight = weights.reduce((sum, w) => sum + w, 0) / n;
  const scaling = scalingOf(x, y);
  if (!Number.isFinite(scaling.xs) || !Number.isFinite(scaling.ys)) fail('invalid', 'the values span a range wider than a double holds (about 1.8e308)');
  const u = x.map((v) => (v - scaling.x0) / scaling.xs);
  const v = y.map((value) => (value - scaling.y0) / scaling.ys);
  const fit = gcvSpline(prepareSpline(u, v, weights));
  const grid = uniformGrid(n);
  const bend = bendOnGrid(fit, grid, secondMagnitude);
  const medianBend = flooredMedian(bend);
  const noise = noiseProbes(u, v, weights, fit.lambda, seed);
  const reachOf = (t: number) => Math.max(PROMINENCE_SPACINGS * localSpacing(u, t), PROMINENCE_BANDWIDTHS * bandwidth(u, fit.lambda, meanWeight, t));
  const peaks = localMaxima(bend, grid, 1, grid.length - 2, reachOf).filter((peak) => !nearEnd(peak.x, u, fit.lambda, meanWeight));
  const standing = peaks.filter((peak) => peak.height / medianBend >= KINK_THRESHOLDS.minStrength && peak.prominence >= KINK_THRESHOLDS.minProminence);
  // The bootstrap refits every resample once but looks for each candidate in it: the tallest MAX_KINKS
  // are followed, so a zigzag boundary cannot multiply the work beyond what the job's cost estimate allows.
  const candidates = acceptTurning(
    standing,
    (peak, taken) => turningSignificance(peak.x, reachOf(peak.x), fit, noise, taken, tallerThan(peak, standing)),
    u, fit.lambda, meanWeight, reachOf,
  )
    .sort((a, b) => b.height - a.height)
    .slice(0, MAX_KINKS);
  const windows = candidates.map((peak) => matchWindow(peak, u));
  const floor = KINK_THRESHOLDS.minStrength * medianBend;
  const positions = bootstrapPositions(u, v, weights, fit.lambda, grid, candidates, windows, floor, resamples, seed);
  const kappa = bendOnGrid(fit, grid, curvatureIn(scaling));
  const medianKappa = flooredMedian(kappa);
  const smoothedAgain = fitSpline(prepareSpline(u, fit.values, weights), fit.lambda, false);
  const kinks: KinkFound[] = [];
  candidates.forEach((peak, k) => {
    const found = positions[k];
    if (found.length < KINK_THRESHOLDS.minReappearance * resamples) return;
    const spread = standardDeviation(found);
    const wobble = standardDeviation(noisePositions(fit, noise, peak, windows[k], grid));
    const position = peakOfSecond(fit, peak.x, windows[k]);
    if (!agrees(found, peak.x, position, spread, localSpacing(u, position))) return;
    const spacing = localSpacing(u, position);
    const bias = peakOfSecond(smoothedAgain, peak.x, windows[k]) - position;
    const uncertainty = Math.sqrt(spread ** 2 + wobble ** 2 + (spacing / 2) ** 2 + bias ** 2);
    kinks.push({
      x: scaling.x0 + scaling.xs * position,
      y: scaling.y0 + scaling.ys * evaluateSpline(fit, position)[0],
      uncertainty: scaling.xs * uncertainty,
      strength: maxWithin(kappa, grid, position, windows[k]) / medianKappa,
    });
  });
  kinks.sort((a, b) => b.strength - a.strength);
  return { kinks, lambda: fit.lambda, effectiveDof: fit.trace, gcv: fit.gcv, resamples };
}

/**
 * Does the curve turn at the peak more than noise could make it? The turning C = f'(t + r) − f'(t − r)
 * across the peak, minus the turning over the neighbouring stretches of the same width (the smooth
 * background; one side only near an end):  T = C − (L + R) / 2. A kink puts its whole slope jump
 * into T, a smooth curve almost nothing (the average of both sides cancels a background whose f''
 * changes linearly). The answer is |T| in standard deviations of T over the noise probes. A side that
 * holds an accepted kink (`taken`) or a taller candidate (`taller`) is not background: a kink next door
 * would lend its turning to a noise peak. A peak whose own stretch holds an accepted kink is a ring of
 * that kink (0). It uses slopes only: f'' is far noisier than f' when GCV picks a small λ.
 */
function turningSignificance(
  t: number, reach: number, fit: SplineFit, probes: SplineFit[], taken: Array<[number, number]>, taller: Array<[number, number]>,
): number {
  const first = fit.x[0];
  const last = fit.x[fit.x.length - 1];
  const r = Math.min(reach, t - first, last - t);
  const outside = (stretches: Array<[number, number]>, from: number, to: number) => stretches.every(([lo, hi]) => hi < from || lo > to);
  const clear = (from: number, to: number) => outside(taken, from, to) && outside(taller, from, to);
  if (!outside(taken, t - r, t + r)) return 0;
  const hasLeft = t - 3 * r >= first && clear(t - 3 * r, t - r);
  const hasRight = t + 3 * r <= last && clear(t + r, t + 3 * r);
  const turning = (spline: Pick<SplineFit, 'x' | 'values' | 'second'>) => {
    const slope = (at: number) => evaluateSpline(spline, at)[1];
    const across = slope(t + r) - slope(t - r);
    const left = hasLeft ? slope(t - r) - slope(t - 3 * r) : NaN;
    const right = hasRight ? slope(t + 3 * r) - slope(t + r) : NaN;
    const background = hasLeft && hasRight ? (left + right) / 2 : hasLeft ? left : hasRight ? right : 0;
    return across - background;
  };
  const wobble = standardDeviation(probes.map(turning));
  return Math.abs(turning(fit)) / Math.max(wobble, Number.MIN_VALUE);
}

/** The stretches around candidates taller than `peak`: not background for it. */
function tallerThan(peak: Peak, candidates: Peak[]): Array<[number, number]> {
  return candidates.filter((other) => other.height > peak.height).map((other) => [other.x - other.halfWidth, other.x + other.halfWidth]);
}

/**
 * Robust noise level of the data: the median absolute pseudo-residual of Gasser, Sroka &
 * Jennen-Steinmetz (1986) — each y against the line through its two neighbours — scaled by 1.4826
 * (normal consistency). Independent of λ, so it holds when GCV picks a near-interpolating fit, and the
 * median ignores the few pseudo-residuals a kink makes.
 */
export function noiseLevel(u: number[], v: number[], weights: number[]): number {
  const scaled: number[] = [];
  for (let i = 1; i < u.length - 1; i++) {
    const a = (u[i + 1] - u[i]) / (u[i + 1] - u[i - 1]);
    const b = 1 - a;
    const pseudo = a * v[i - 1] + b * v[i + 1] - v[i];
    const variance = a * a / weights[i - 1] + b * b / weights[i + 1] + 1 / weights[i];
    scaled.push(Math.abs(pseudo) / Math.sqrt(variance));
  }
  return Math.max(1.4826 * medianOf(Float64Array.from(scaled)), NOISE_FLOOR);
}

/** The smoother (same λ) applied to pure noise of the data's level: how much the fit wobbles by chance. */
function noiseProbes(u: number[], v: number[], weights: number[], lambda: number, seed: number): SplineFit[] {
  const level = noiseLevel(u, v, weights);
  const random = mulberry32(seed ^ 0x5eed);
  const probes: SplineFit[] = [];
  for (let p = 0; p < NOISE_PROBES; p++) {
    const noise = weights.map((w) => (level * gaussian(random)) / Math.sqrt(w));
    probes.push(fitSpline(prepareSpline(u, noise, weights), lambda, false));
  }
  return probes;
}

/**
 * Where the peak moves when fresh noise of the data's level is added to the fit (the smoother is
 * linear, so fit + smoothed noise is the fit of data + noise). The pairs bootstrap keeps the data's own
 * noise in every resample, so it alone understates how far noise can move a peak.
 */
function noisePositions(fit: SplineFit, probes: SplineFit[], peak: Peak, window: number, grid: Float64Array): number[] {
  const step = grid[1] - grid[0];
  const from = Math.max(1, Math.floor((peak.x - window) / step) - 1);
  const to = Math.min(grid.length - 2, Math.ceil((peak.x + window) / step) + 1);
  const positions: number[] = [];
  for (const probe of probes) {
    const perturbed = {
      x: fit.x,
      values: fit.values.map((value, i) => value + probe.values[i]),
      second: fit.second.map((value, i) => value + probe.second[i]),
    };
    const bend = bendOnGrid(perturbed, grid, secondMagnitude, from - 1, to + 1);
    const match = strongestPeakWithin(localMaxima(bend, grid, from, to), peak.x, window);
    if (match) positions.push(peakOfSecond(perturbed, peak.x, window));
  }
  return positions;
}

function gaussian(random: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
}

/**
 * The kink's position: the maximum of |f''| within the window around a κ peak, refined by a parabola
 * through the three knots around it (f'' is linear between knots, so its extremes sit at knots).
 * For a kink the smoothed |f''| is the smoother's kernel centred on the kink, whereas κ multiplies it by
 * (1 + f'²)^{-3/2}, which changes across the kink and drags the κ maximum toward the flatter side.
 */
function peakOfSecond(fit: Pick<SplineFit, 'x' | 'second'>, center: number, window: number): number {
  const knots = fit.x;
  const magnitude = (i: number) => Math.abs(fit.second[i]);
  let best = -1;
  for (let i = Math.max(intervalOf(knots, center - window), 1); i < knots.length - 1 && knots[i] <= center + window; i++) {
    if (knots[i] >= center - window && (best < 0 || magnitude(i) > magnitude(best))) best = i;
  }
  if (best < 0) return center;
  const [x0, x1, x2] = [knots[best - 1], knots[best], knots[best + 1]];
  const [f0, f1, f2] = [magnitude(best - 1), magnitude(best), magnitude(best + 1)];
  const d01 = (f1 - f0) / (x1 - x0);
  const d12 = (f2 - f1) / (x2 - x1);
  const bend = (d12 - d01) / (x2 - x0);
  if (!(bend < 0)) return x1;
  const vertex = (x0 + x1) / 2 - d01 / (2 * bend);
  return Math.min(x2, Math.max(x0, vertex));
}

/**
 * Tallest first: a peak is a kink when its turning stands out from the noise, judged against the
 * kinks accepted before it (their stretches are excluded from its background). Height decides the
 * order, not significance: the smoother rings around a sharp peak (its kernel's first side lobe,
 * ~6 % of the peak, lies about 4.4 bandwidths out; near-interpolating fits ring at every knot), and a
 * ring can turn as significantly as the kink itself. Peaks within reach of an accepted kink's rings are
 * skipped.
 */
function acceptTurning(
  peaks: Peak[], significanceOf: (peak: Peak, taken: Array<[number, number]>) => number,
  knots: number[], lambda: number, meanWeight: number, reachOf: (t: number) => number,
): Peak[] {
  const accepted: Peak[] = [];
  const taken: Array<[number, number]> = [];
  const ringReach = (kink: Peak) =>
    Math.max(SIDE_LOBE_SPACINGS * localSpacing(knots, kink.x), SIDE_LOBE_WIDTHS * kink.halfWidth, SIDE_LOBE_BANDWIDTHS * bandwidth(knots, lambda, meanWeight, kink.x));
  for (const peak of [...peaks].sort((a, b) => b.height - a.height)) {
    if (accepted.some((kink) => Math.abs(kink.x - peak.x) <= ringReach(kink))) continue;
    if (significanceOf(peak, taken) < KINK_THRESHOLDS.minTurningSignificance) continue;
    accepted.push(peak);
    taken.push([peak.x - reachOf(peak.x), peak.x + reachOf(peak.x)]);
  }
  return accepted;
}

function scalingOf(x: number[], y: number[]): Scaling {
  const x0 = x[0];
  const xs = x[x.length - 1] - x[0];
  let y0 = Infinity;
  let y1 = -Infinity;
  for (const value of y) {
    y0 = Math.min(y0, value);
    y1 = Math.max(y1, value);
  }
  return { x0, xs, y0, ys: y1 > y0 ? y1 - y0 : 1 };
}

function uniformGrid(n: number): Float64Array {
  const size = Math.min(MAX_GRID, Math.max(MIN_GRID, GRID_PER_POINT * n));
  return Float64Array.from({ length: size + 1 }, (_, i) => i / size);
}

type Bend = (slope: number, second: number) => number;

/** |F''| in the rescaled frame: proportional to |f''| in any units, so its ratios do not depend on them. */
const secondMagnitude: Bend = (_slope, second) => Math.abs(second);

/**
 * κ in the original units up to a constant factor (only ratios of κ are used). With the aspect
 * m = y-scale / x-scale, f' = m F' and f'' = (y-scale / x-scale²) F'', so
 *   κ ∝ |F''| / (1 + m² F'²)^{3/2}          for m ≤ 1,
 *   κ ∝ |F''| / (m⁻² + F'²)^{3/2}           for m > 1 (the same up to m³, without overflow).
 */
function curvatureIn(scaling: Scaling): Bend {
  const aspect = scaling.ys / scaling.xs;
  if (aspect > 1) {
    const inverseSquare = 1 / (aspect * aspect);
    return (slope, second) => Math.abs(second) / (inverseSquare + slope * slope) ** 1.5;
  }
  const squared = aspect * aspect;
  return (slope, second) => Math.abs(second) / (1 + squared * slope * slope) ** 1.5;
}

function bendOnGrid(fit: Pick<SplineFit, 'x' | 'values' | 'second'>, grid: Float64Array, measure: Bend, from = 0, to = grid.length - 1): Float64Array {
  const values = new Float64Array(grid.length);
  let interval = intervalOf(fit.x, grid[from]);
  const last = fit.x.length - 2;
  for (let j = from; j <= to; j++) {
    const t = grid[j];
    while (interval < last && t > fit.x[interval + 1]) interval++;
    const [, slope, second] = evaluateSpline(fit, t, interval);
    values[j] = measure(slope, second);
  }
  return values;
}

/** The median, floored at MEDIAN_FLOOR of the largest value, so that straight stretches (≈ 0) do not make every ripple "infinitely strong". */
function flooredMedian(values: Float64Array): number {
  return Math.max(medianOf(values), MEDIAN_FLOOR * maxOf(values), Number.MIN_VALUE);
}

function maxWithin(values: Float64Array, grid: Float64Array, center: number, window: number): number {
  let max = 0;
  for (let j = 0; j < grid.length; j++) if (Math.abs(grid[j] - center) <= window) max = Math.max(max, values[j]);
  return max;
}

/**
 * A kink is where the largest |f''| around it is: the knot maximum (`position`) lies within a data
 * spacing of the grid peak, and the resamples put it there too (their median within two of its
 * standard errors: spread and half the spacing). A ripple on a rising |f''| has its window's maximum
 * at the window's edge instead, and a noise peak that borrowed height from a neighbour moves about.
 */
function agrees(found: number[], peakAt: number, position: number, spread: number, spacing: number): boolean {
  if (Math.abs(position - peakAt) > spacing) return false;
  if (found.length === 0) return true;
  const middle = medianOf(Float64Array.from(found));
  return Math.abs(middle - position) <= 2 * Math.hypot(spread, spacing / 2);
}

function maxOf(values: Float64Array): number {
  let max = 0;
  for (const value of values) max = Math.max(max, value);
  return max;
}

function medianOf(values: Float64Array): number {
  const sorted = Float64Array.from(values).sort();
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** Interior local maxima of κ, each with its position refined by a parabola through three grid values. */
function localMaxima(kappa: Float64Array, grid: Float64Array, from = 1, to = kappa.length - 2, reachOf?: (t: number) => number): Peak[] {
  const peaks: Peak[] = [];
  for (let j = Math.max(from, 1); j <= Math.min(to, kappa.length - 2); j++) {
    if (!(kappa[j] > kappa[j - 1] && kappa[j] >= kappa[j + 1])) continue;
    const step = grid[j + 1] - grid[j];
    const curvature = kappa[j - 1] - 2 * kappa[j] + kappa[j + 1];
    const offset = curvature < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (kappa[j - 1] - kappa[j + 1])) / curvature)) : 0;
    const shape = reachOf ? shapeOf(kappa, grid, j, Math.ceil(reachOf(grid[j]) / step)) : { prominence: NaN, col: j, halfWidth: 0 };
    peaks.push({ index: j, x: grid[j] + offset * step, height: kappa[j], ...shape });
  }
  return peaks;
}

/**
 * Local prominence: on each side, the lowest κ within `reach` grid steps before κ rises above the
 * peak again; the higher of the two is the key col. A noise dimple on top of a large peak thus leaves
 * the large peak prominent, while a ripple on a sloping κ is not. Also the half width at half height.
 */
function shapeOf(kappa: Float64Array, grid: Float64Array, j: number, reach: number): { prominence: number; col: number; halfWidth: number } {
  const top = kappa[j];
  const lowest = (direction: -1 | 1) => {
    let low = j;
    for (let i = j + direction; i >= 0 && i < kappa.length && kappa[i] <= top && Math.abs(i - j) <= reach; i += direction) {
      if (kappa[i] < kappa[low]) low = i;
    }
    return low;
  };
  const [left, right] = [lowest(-1), lowest(1)];
  const col = kappa[left] >= kappa[right] ? left : right;
  const half = top / 2;
  let halfLeft = j;
  while (halfLeft > 0 && kappa[halfLeft - 1] > half && kappa[halfLeft - 1] <= top) halfLeft--;
  let halfRight = j;
  while (halfRight < kappa.length - 1 && kappa[halfRight + 1] > half && kappa[halfRight + 1] <= top) halfRight++;
  return { prominence: top / Math.max(kappa[col], Number.MIN_VALUE), col, halfWidth: (grid[halfRight] - grid[halfLeft]) / 2 };
}

/** Data spacing around t: the mean of the two knot intervals next to the nearest knot. */
function localSpacing(knots: number[], t: number): number {
  const n = knots.length;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (knots[mid] <= t) lo = mid;
    else hi = mid;
  }
  const nearest = t - knots[lo] <= knots[hi] - t ? lo : hi;
  const left = Math.max(nearest - 1, 0);
  const right = Math.min(nearest + 1, n - 1);
  return (knots[right] - knots[left]) / (right - left);
}

/**
 * Half-width scale of the smoother near t: the equivalent kernel of a smoothing spline has bandwidth
 * (λ / (n · density · weight))^{1/4} (Silverman 1984); with the local spacing h, n · density = 1/h.
 */
function bandwidth(knots: number[], lambda: number, meanWeight: number, t: number): number {
  return ((lambda * localSpacing(knots, t)) / meanWeight) ** 0.25;
}

/**
 * Near an end the natural condition f'' = 0 makes κ climb from zero over a few bandwidths: peaks there
 * are artefacts unless farther in than EDGE_SPACINGS spacings and EDGE_BANDWIDTHS bandwidths.
 */
function nearEnd(t: number, knots: number[], lambda: number, meanWeight: number): boolean {
  const n = knots.length;
  const leftEdge = Math.max(knots[KINK_THRESHOLDS.edgeSpacings] - knots[0], EDGE_BANDWIDTHS * bandwidth(knots, lambda, meanWeight, knots[0]));
  const rightEdge = Math.max(knots[n - 1] - knots[n - 1 - KINK_THRESHOLDS.edgeSpacings], EDGE_BANDWIDTHS * bandwidth(knots, lambda, meanWeight, knots[n - 1]));
  return t <= knots[0] + leftEdge || t >= knots[n - 1] - rightEdge;
}

function matchWindow(peak: Peak, knots: number[]): number {
  return Math.max(KINK_THRESHOLDS.windowSpacings * localSpacing(knots, peak.x), peak.halfWidth);
}

function strongestPeakWithin(peaks: Peak[], center: number, window: number): Peak | undefined {
  let best: Peak | undefined;
  for (const peak of peaks) {
    if (Math.abs(peak.x - center) <= window && (!best || peak.height > best.height)) best = peak;
  }
  return best;
}

/** For each candidate, the positions of its peak over the resamples in which it reappears (a local maximum of |F''| above `floor`). */
function bootstrapPositions(
  u: number[], v: number[], weights: number[], lambda: number, grid: Float64Array,
  candidates: Peak[], windows: number[], floor: number, resamples: number, seed: number,
): number[][] {
  const positions: number[][] = candidates.map(() => []);
  if (candidates.length === 0) return positions;
  const random = mulberry32(seed);
  const n = u.length;
  const counts = new Int32Array(n);
  const step = grid[1] - grid[0];
  for (let b = 0; b < resamples; b++) {
    counts.fill(0);
    for (let i = 0; i < n; i++) counts[Math.floor(random() * n)]++;
    const kept: number[] = [];
    for (let i = 0; i < n; i++) if (counts[i] > 0) kept.push(i);
    if (kept.length < 3) continue;
    const fit = fitSpline(prepareSpline(kept.map((i) => u[i]), kept.map((i) => v[i]), kept.map((i) => weights[i] * counts[i])), lambda, false);
    candidates.forEach((peak, k) => {
      const from = Math.max(1, Math.floor((peak.x - windows[k]) / step) - 1);
      const to = Math.min(grid.length - 2, Math.ceil((peak.x + windows[k]) / step) + 1);
      const bend = bendOnGrid(fit, grid, secondMagnitude, from - 1, to + 1);
      const match = strongestPeakWithin(localMaxima(bend, grid, from, to), peak.x, windows[k]);
      if (match && match.height >= floor) positions[k].push(peakOfSecond(fit, peak.x, windows[k]));
    });
  }
  return positions;
}

function standardDeviation(values: number[]): number {
  if (values.length < 2) return 0;
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  return Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1));
}
