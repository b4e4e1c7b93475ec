import { fail } from '../precision';

/**
 * Cubic smoothing spline in the Reinsch form (Green & Silverman, "Nonparametric Regression and
 * Generalized Linear Models", ch. 2): the natural cubic spline f minimising
 *
 *     Σ w_i (y_i − f(x_i))² + λ ∫ f''(x)² dx .
 *
 * With knot spacings h_i, the banded matrices Q (n × (n−2)) and R ((n−2) × (n−2), tridiagonal), the
 * second derivatives γ at the interior knots solve the pentadiagonal system
 *     (R + λ Qᵀ W⁻¹ Q) γ = Qᵀ y,
 * and the fitted values are g = y − λ W⁻¹ Q γ. Everything is O(n): an LDLᵀ factorisation of the band,
 * and the trace of the smoother matrix A(λ) from the band of the inverse (Hutchinson & de Hoog 1985),
 * since I − A = λ W⁻¹ Q B⁻¹ Qᵀ needs only the entries of B⁻¹ within two of the diagonal.
 *
 * Double precision on purpose: data carry a handful of digits, and the engine's arbitrary precision
 * is for the series. No npm package fits a weighted smoothing spline with GCV reliably, hence this code.
 */

export interface SplineFit {
  /** Knots: the distinct, increasing x. */
  x: Float64Array;
  /** Fitted values f(x_i). */
  values: Float64Array;
  /** f''(x_i); zero at both ends (natural spline). */
  second: Float64Array;
  lambda: number;
  /** tr A(λ): the effective degrees of freedom (2 for a straight line, n for interpolation). */
  trace: number;
  /** Σ w_i (y_i − f(x_i))². */
  rss: number;
}

interface Band {
  /** Diagonal, first and second super-diagonals of a symmetric pentadiagonal matrix. */
  d0: Float64Array;
  d1: Float64Array;
  d2: Float64Array;
}

/** Column k of Q has entries (u_k, v_k, s_k) in rows k, k+1, k+2. */
interface QColumns {
  u: Float64Array;
  v: Float64Array;
  s: Float64Array;
}

export interface SplineSetup {
  x: Float64Array;
  y: Float64Array;
  inverseWeights: Float64Array;
  q: QColumns;
  /** R's diagonal and super-diagonal. */
  r0: Float64Array;
  r1: Float64Array;
  qty: Float64Array;
  /** Qᵀ W⁻¹ Q as a band. */
  qwq: Band;
}

/** Precomputes what does not depend on λ. x strictly increasing, weights positive, n ≥ 3. */
export function prepareSpline(x: ArrayLike<number>, y: ArrayLike<number>, weights?: ArrayLike<number>): SplineSetup {
  const n = x.length;
  if (n < 3 || y.length !== n) fail('invalid', 'a smoothing spline needs at least 3 points with one y per x');
  if (weights && weights.length !== n) fail('invalid', 'one weight per point is needed');
  const xs = Float64Array.from(x);
  const ys = Float64Array.from(y);
  const inverseWeights = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const w = weights ? weights[i] : 1;
    if (!(w > 0) || !Number.isFinite(w)) fail('invalid', `weight ${i + 1} must be positive`);
    inverseWeights[i] = 1 / w;
  }
  const h = new Float64Array(n - 1);
  for (let i = 0; i < n - 1; i++) {
    h[i] = xs[i + 1] - xs[i];
    if (!(h[i] > 0)) fail('invalid', `x must increase strictly (points ${i + 1} and ${i + 2})`);
  }
  const m = n - 2;
  const q: QColumns = { u: new Float64Array(m), v: new Float64Array(m), s: new Float64Array(m) };
  const r0 = new Float64Array(m);
  const r1 = new Float64Array(m);
  const qty = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    q.u[k] = 1 / h[k];
    q.s[k] = 1 / h[k + 1];
    q.v[k] = -q.u[k] - q.s[k];
    r0[k] = (h[k] + h[k + 1]) / 3;
    r1[k] = k + 1 < m ? h[k + 1] / 6 : 0;
    qty[k] = q.u[k] * ys[k] + q.v[k] * ys[k + 1] + q.s[k] * ys[k + 2];
  }
  const qwq: Band = { d0: new Float64Array(m), d1: new Float64Array(m), d2: new Float64Array(m) };
  const iw = inverseWeights;
  for (let k = 0; k < m; k++) {
    qwq.d0[k] = q.u[k] ** 2 * iw[k] + q.v[k] ** 2 * iw[k + 1] + q.s[k] ** 2 * iw[k + 2];
    if (k + 1 < m) qwq.d1[k] = q.v[k] * q.u[k + 1] * iw[k + 1] + q.s[k] * q.v[k + 1] * iw[k + 2];
    if (k + 2 < m) qwq.d2[k] = q.s[k] * q.u[k + 2] * iw[k + 2];
  }
  return { x: xs, y: ys, inverseWeights, q, r0, r1, qty, qwq };
}

/** LDLᵀ of a symmetric positive-definite pentadiagonal band: L's sub-diagonals a, c and the pivots d. */
function factorBand(band: Band): { d: Float64Array; a: Float64Array; c: Float64Array } {
  const m = band.d0.length;
  const d = new Float64Array(m);
  const a = new Float64Array(m);
  const c = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let di = band.d0[i];
    if (i >= 1) di -= a[i - 1] * a[i - 1] * d[i - 1];
    if (i >= 2) di -= c[i - 2] * c[i - 2] * d[i - 2];
    if (!(di > 0)) fail('singular', 'the smoothing spline system is not positive definite');
    d[i] = di;
    let offDiagonal = band.d1[i];
    if (i >= 1) offDiagonal -= a[i - 1] * c[i - 1] * d[i - 1];
    a[i] = offDiagonal / di;
    c[i] = band.d2[i] / di;
  }
  return { d, a, c };
}

function solveFactored(f: { d: Float64Array; a: Float64Array; c: Float64Array }, rhs: Float64Array): Float64Array {
  const m = rhs.length;
  const z = Float64Array.from(rhs);
  for (let i = 0; i < m; i++) {
    if (i >= 1) z[i] -= f.a[i - 1] * z[i - 1];
    if (i >= 2) z[i] -= f.c[i - 2] * z[i - 2];
  }
  for (let i = 0; i < m; i++) z[i] /= f.d[i];
  for (let i = m - 1; i >= 0; i--) {
    if (i + 1 < m) z[i] -= f.a[i] * z[i + 1];
    if (i + 2 < m) z[i] -= f.c[i] * z[i + 2];
  }
  return z;
}

/**
 * The band of B⁻¹ (|i − j| ≤ 2) from B = L D Lᵀ, bottom-up (Hutchinson & de Hoog 1985):
 *   Σ_{i,i+2} = −a_i Σ_{i+1,i+2} − c_i Σ_{i+2,i+2}
 *   Σ_{i,i+1} = −a_i Σ_{i+1,i+1} − c_i Σ_{i+1,i+2}
 *   Σ_{i,i}   = 1/d_i − a_i Σ_{i,i+1} − c_i Σ_{i,i+2}
 */
function inverseBand(f: { d: Float64Array; a: Float64Array; c: Float64Array }): Band {
  const m = f.d.length;
  const s0 = new Float64Array(m);
  const s1 = new Float64Array(m);
  const s2 = new Float64Array(m);
  for (let i = m - 1; i >= 0; i--) {
    const a = i + 1 < m ? f.a[i] : 0;
    const c = i + 2 < m ? f.c[i] : 0;
    const next0 = i + 1 < m ? s0[i + 1] : 0;
    const next1 = i + 1 < m ? s1[i + 1] : 0;
    const next00 = i + 2 < m ? s0[i + 2] : 0;
    s2[i] = i + 2 < m ? -a * next1 - c * next00 : 0;
    s1[i] = i + 1 < m ? -a * next0 - c * next1 : 0;
    s0[i] = 1 / f.d[i] - a * s1[i] - c * s2[i];
  }
  return { d0: s0, d1: s1, d2: s2 };
}

/** The fit at a given λ, with tr A(λ) and the residual sum of squares. */
export function fitSpline(setup: SplineSetup, lambda: number, withTrace = true): SplineFit {
  const { x, y, inverseWeights: iw, q, qwq } = setup;
  const n = x.length;
  const m = n - 2;
  const band: Band = { d0: new Float64Array(m), d1: new Float64Array(m), d2: new Float64Array(m) };
  for (let k = 0; k < m; k++) {
    band.d0[k] = setup.r0[k] + lambda * qwq.d0[k];
    band.d1[k] = setup.r1[k] + lambda * qwq.d1[k];
    band.d2[k] = lambda * qwq.d2[k];
  }
  const factor = factorBand(band);
  const gamma = solveFactored(factor, setup.qty);
  const values = new Float64Array(n);
  let rss = 0;
  for (let i = 0; i < n; i++) {
    let qGamma = 0;
    if (i < m) qGamma += q.u[i] * gamma[i];
    if (i >= 1 && i - 1 < m) qGamma += q.v[i - 1] * gamma[i - 1];
    if (i >= 2) qGamma += q.s[i - 2] * gamma[i - 2];
    values[i] = y[i] - lambda * iw[i] * qGamma;
    rss += (y[i] - values[i]) ** 2 / iw[i];
  }
  const second = new Float64Array(n);
  second.set(gamma, 1);
  const trace = withTrace ? n - lambda * residualTrace(q, inverseBand(factor), iw) : NaN;
  return { x, values, second, lambda, trace, rss };
}

/** tr(W⁻¹ Q Σ Qᵀ) = Σ_i w_i⁻¹ Σ_{k,l} Q_ik Σ_kl Q_il; row i meets columns i−2 (s), i−1 (v), i (u). */
function residualTrace(q: QColumns, sigma: Band, iw: Float64Array): number {
  const m = sigma.d0.length;
  const n = m + 2;
  const entry = (k: number, l: number): number => {
    const lo = Math.min(k, l);
    const gap = Math.abs(k - l);
    return gap === 0 ? sigma.d0[lo] : gap === 1 ? sigma.d1[lo] : sigma.d2[lo];
  };
  let total = 0;
  const columns: number[] = [];
  const coefficients: number[] = [];
  for (let i = 0; i < n; i++) {
    columns.length = 0;
    coefficients.length = 0;
    if (i - 2 >= 0 && i - 2 < m) { columns.push(i - 2); coefficients.push(q.s[i - 2]); }
    if (i - 1 >= 0 && i - 1 < m) { columns.push(i - 1); coefficients.push(q.v[i - 1]); }
    if (i < m) { columns.push(i); coefficients.push(q.u[i]); }
    let row = 0;
    for (let p = 0; p < columns.length; p++) {
      for (let r = 0; r < columns.length; r++) row += coefficients[p] * entry(columns[p], columns[r]) * coefficients[r];
    }
    total += iw[i] * row;
  }
  return total;
}

/** GCV(λ) = n · RSS / (n − tr A)². */
export function gcvScore(fit: SplineFit): number {
  const n = fit.x.length;
  return (n * fit.rss) / (n - fit.trace) ** 2;
}

const GRID_STEPS = 48;
const GOLDEN_STEPS = 40;
/** λ relative to (x-range)³, the unit that makes the penalty scale-free. Below: interpolation; above: a line. */
const LOG_LAMBDA_RANGE = { fromSpacingCubed: -3, to: 2 };

/**
 * λ by generalised cross-validation: a log-spaced grid from well inside interpolation
 * (λ ≈ 10⁻³ h̄³) to well inside the straight-line limit, then golden-section search on log λ
 * between the neighbours of the best grid point.
 */
export function gcvSpline(setup: SplineSetup): SplineFit & { gcv: number } {
  const n = setup.x.length;
  const range = setup.x[n - 1] - setup.x[0];
  const spacing = 1 / (n - 1);
  const lo = Math.log10(spacing ** 3) + LOG_LAMBDA_RANGE.fromSpacingCubed + 3 * Math.log10(range);
  const hi = LOG_LAMBDA_RANGE.to + 3 * Math.log10(range);
  const score = (logLambda: number): number => {
    const value = gcvScore(fitSpline(setup, 10 ** logLambda));
    return Number.isFinite(value) ? value : Infinity;
  };
  const grid = Array.from({ length: GRID_STEPS + 1 }, (_, i) => lo + ((hi - lo) * i) / GRID_STEPS);
  const scores = grid.map(score);
  let best = 0;
  for (let i = 1; i < grid.length; i++) if (scores[i] < scores[best]) best = i;
  let a = grid[Math.max(best - 1, 0)];
  let b = grid[Math.min(best + 1, GRID_STEPS)];
  const ratio = (Math.sqrt(5) - 1) / 2;
  let c = b - ratio * (b - a);
  let d = a + ratio * (b - a);
  let fc = score(c);
  let fd = score(d);
  for (let step = 0; step < GOLDEN_STEPS; step++) {
    if (fc <= fd) {
      b = d; d = c; fd = fc;
      c = b - ratio * (b - a); fc = score(c);
    } else {
      a = c; c = d; fc = fd;
      d = a + ratio * (b - a); fd = score(d);
    }
  }
  const candidates: Array<[number, number]> = [[grid[best], scores[best]], [c, fc], [d, fd]];
  candidates.sort((p, r) => p[1] - r[1]);
  const fit = fitSpline(setup, 10 ** candidates[0][0]);
  return { ...fit, gcv: gcvScore(fit) };
}

/** Index i of the knot interval [x_i, x_{i+1}] holding t (clamped to the ends). */
export function intervalOf(knots: Float64Array, t: number): number {
  let lo = 0;
  let hi = knots.length - 2;
  if (t <= knots[0]) return 0;
  if (t >= knots[hi]) return hi;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (knots[mid] <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** f, f', f'' of the natural cubic spline through (x_i, values_i) with second derivatives `second`. */
export function evaluateSpline(fit: Pick<SplineFit, 'x' | 'values' | 'second'>, t: number, interval = intervalOf(fit.x, t)): [number, number, number] {
  const i = interval;
  const x0 = fit.x[i];
  const x1 = fit.x[i + 1];
  const h = x1 - x0;
  const m0 = fit.second[i];
  const m1 = fit.second[i + 1];
  const g0 = fit.values[i];
  const g1 = fit.values[i + 1];
  if (t < x0 || t > x1) {
    // Natural spline: straight beyond the end knots.
    const end = t < x0 ? 0 : 1;
    const at = end === 0 ? x0 : x1;
    const slope = (g1 - g0) / h - (h * (end === 0 ? 2 * m0 + m1 : -(m0 + 2 * m1))) / 6;
    return [(end === 0 ? g0 : g1) + slope * (t - at), slope, 0];
  }
  const left = t - x0;
  const right = x1 - t;
  const value = (m0 * right ** 3 + m1 * left ** 3) / (6 * h) + (g0 - (m0 * h * h) / 6) * (right / h) + (g1 - (m1 * h * h) / 6) * (left / h);
  const slope = (-m0 * right * right + m1 * left * left) / (2 * h) + (g1 - g0) / h - ((m1 - m0) * h) / 6;
  const curvature = (m0 * right + m1 * left) / h;
  return [value, slope, curvature];
}
