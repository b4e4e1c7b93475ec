import { polynomialValue } from '../linalg';
import { type Real, type RealInput, EngineError, GUARD_DIGITS, realContext } from '../precision';
import { type PadeApproximant, padeApproximant, polesInInterval } from './pade';

/**
 * Padé–Borel resummation of a series f(ε) = Σ a_k ε^k:
 *   B(t) = Σ a_k t^k / k!  (the Borel transform),  B_[L/M] its Padé approximant,
 *   f_PB(ε) = ∫₀^∞ e^{−t} B_[L/M](εt) dt.
 * The integral exists when B_[L/M](εt) has no pole for t ≥ 0; a real pole on the positive t axis makes
 * the approximant flagged (no value: the Laplace integral is not defined there, only a principal value
 * or a contour choice would give a number). Denominator 1 (the series is a polynomial through its order)
 * integrates exactly: Σ p_k k! ε^k.
 *
 * Quadrature: the double-exponential transformation for ∫₀^∞ e^{−t} g(t) dt, t = exp(τ − e^{−τ})
 * (Ooura & Mori, J. Comput. Appl. Math. 112 (1999) 229), trapezoidal in τ with step h halved from 1/2
 * until two successive sums agree to the working digits; the error estimate is the last difference
 * |I_h − I_{h/2}| (an overestimate: the error falls roughly as the square at each halving) plus the
 * truncation of the τ range, both at digits + 12 guard digits.
 */
export const BOREL_METHOD = 'Padé–Borel: B(t) = Σ a_k t^k/k!, Padé [L/M] of B, Laplace integral ∫₀^∞ e^{−t} B(εt) dt by double-exponential quadrature (t = exp(τ − e^{−τ}), Ooura–Mori 1999) with the step halved until two levels agree to the working digits; error = difference of the last two levels';

export interface BorelValue {
  L: number;
  M: number;
  /** Null when flagged. */
  value: Real | null;
  /** Estimated absolute error of `value` (null when flagged); 0 for an exact polynomial integral. */
  error: Real | null;
  flagged: boolean;
  /** Real poles of B_[L/M](εt) on the positive t axis. */
  poles: Real[];
  /** Why there is no value, or why the value has fewer digits than asked; null otherwise. */
  reason: string | null;
  /** The quadrature reached the working digits (always true for an exact integral). */
  converged: boolean;
}

const shortNumber = (x: Real) => new (realContext(6))(x).toSignificantDigits(6).toString();

/** DE nodes per working precision and level: level 0 holds every node at h = 1/2, level ℓ > 0 only the new (odd) nodes at h = 2^{−ℓ−1}. */
const nodeCache = new Map<string, { t: Real[]; w: Real[] }>();

function nodesAt(work: number, level: number): { t: Real[]; w: Real[] } {
  const key = `${work}|${level}`;
  const hit = nodeCache.get(key);
  if (hit) return hit;
  const R = realContext(work);
  const h = new R(2).pow(-(level + 1));
  const ln10 = Math.LN10;
  // τ range: below τ_lo the weight h·t(1+e^{−τ})e^{−t} ≈ h e^{−τ} exp(−e^{−τ}) is below 10^{−work}; above τ_hi, t e^{−t} is
  const tauLo = -Math.log(work * ln10 + 4 * Math.log(work * ln10) + 20);
  const tMax = work * ln10 + 3 * Math.log(work * ln10) + 30;
  const tauHi = Math.log(tMax) + 0.1;
  const steps = 2 ** (level + 1);
  const kLo = Math.floor(tauLo * steps);
  const kHi = Math.ceil(tauHi * steps);
  const t: Real[] = [];
  const w: Real[] = [];
  for (let k = kLo; k <= kHi; k++) {
    if (level > 0 && k % 2 === 0) continue;
    const tau = new R(k).times(h);
    const e = tau.neg().exp();
    const x = tau.minus(e).exp();
    t.push(x);
    w.push(h.times(x).times(e.plus(1)).times(x.neg().exp()));
  }
  const nodes = { t, w };
  if (nodeCache.size > 64) nodeCache.delete(nodeCache.keys().next().value as string);
  nodeCache.set(key, nodes);
  return nodes;
}

const MAX_LEVEL = 9;

/** ∫₀^∞ e^{−t} g(t) dt by DE quadrature at `work` digits, halving the step until two levels agree to `digits`. */
export function laplaceIntegral(g: (t: Real) => Real, digits: number, work = digits + GUARD_DIGITS): { value: Real; error: Real; converged: boolean } {
  const R = realContext(work);
  const sumAt = (level: number) => {
    const { t, w } = nodesAt(work, level);
    let s = new R(0);
    for (let i = 0; i < t.length; i++) s = s.plus(w[i].times(g(t[i])));
    return s;
  };
  let total = sumAt(0); // Σ over all nodes at h = 1/2, times h
  let previous = total;
  const tolerance = (v: Real) => new R(10).pow(-(digits + 2)).times(v.abs().gt(1) ? v.abs() : new R(1));
  for (let level = 1; level <= MAX_LEVEL; level++) {
    // I_{h/2} = I_h / 2 + (h/2) Σ_new g
    total = previous.div(2).plus(sumAt(level));
    const difference = total.minus(previous).abs();
    if (difference.lte(tolerance(total)) && level >= 2) return { value: total, error: difference, converged: true };
    previous = total;
    if (level === MAX_LEVEL) return { value: total, error: difference, converged: false };
  }
  return { value: total, error: new R(Infinity), converged: false };
}

/** Σ_{k ≤ n} a_k t^k / k! coefficients. */
export function borelTransform(coefficients: RealInput[], work: number): Real[] {
  const R = realContext(work);
  let factorial = new R(1);
  return coefficients.map((a, k) => {
    if (k > 1) factorial = factorial.times(k);
    return new R(a as never).div(factorial);
  });
}

/** A bound on the moduli of the zeros of Q (Cauchy): 1 + max |q_i / q_top|. */
function rootBound(q: Real[], R: typeof import('decimal.js').default): Real {
  let top = q.length - 1;
  while (top > 0 && q[top].isZero()) top--;
  let largest = new R(0);
  for (let i = 0; i < top; i++) {
    const r = new R(q[i]).div(q[top]).abs();
    if (r.gt(largest)) largest = r;
  }
  return largest.plus(1);
}

/** The Padé–Borel value of the series from its [L/M] Borel–Padé approximant at ε, or flagged. */
export function padeBorel(coefficients: RealInput[], L: number, M: number, eps: RealInput, digits: number): BorelValue {
  const work = digits + GUARD_DIGITS;
  const R = realContext(work);
  const e = new R(eps as never);
  const base = { L, M };
  let approximant: PadeApproximant;
  try {
    approximant = padeApproximant(borelTransform(coefficients.slice(0, L + M + 1), work), L, M, digits);
  } catch (error) {
    if (!(error instanceof EngineError) || error.code !== 'singular') throw error;
    return { ...base, value: null, error: null, flagged: true, poles: [], reason: 'degenerate Borel–Padé approximant (its linear system is singular)', converged: false };
  }
  const p = approximant.numerator.map((c) => new R(c));
  const q = approximant.denominator.map((c) => new R(c));
  const out = realContext(digits);
  if (q.slice(1).every((c) => c.isZero())) {
    // B is a polynomial: ∫ e^{−t} (εt)^k dt = k! ε^k, exact
    let sum = new R(0);
    let factorial = new R(1);
    for (let k = 0; k < p.length; k++) {
      if (k > 1) factorial = factorial.times(k);
      sum = sum.plus(p[k].times(factorial).times(e.pow(k)));
    }
    return { ...base, value: new out(sum).toSignificantDigits(digits), error: new R(0), flagged: false, poles: [], reason: null, converged: true };
  }
  if (e.isZero()) return { ...base, value: new out(p[0]).toSignificantDigits(digits), error: new R(0), flagged: false, poles: [], reason: null, converged: true };
  // poles of B(εt) at t > 0: zeros x of Q with x/ε > 0
  const bound = rootBound(q, R);
  const [from, to] = e.isPositive() ? [new R(0), bound] : [bound.neg(), new R(0)];
  const zeros = polesInInterval(approximant, from, to, digits).filter((x) => !x.isZero());
  if (zeros.length > 0) {
    const poles = zeros.map((x) => new out(new R(x).div(e)).toSignificantDigits(digits));
    return { ...base, value: null, error: null, flagged: true, poles, reason: `the Borel–Padé approximant has ${poles.length > 1 ? 'poles' : 'a pole'} on the positive t axis (t = ${poles.map(shortNumber).join(', ')}): the Laplace integral does not exist`, converged: false };
  }
  const g = (t: Real) => {
    const x = e.times(t);
    return polynomialValue(p, x).div(polynomialValue(q, x));
  };
  const integral = laplaceIntegral(g, digits, work);
  const value = new out(integral.value).toSignificantDigits(digits);
  if (integral.converged) return { ...base, value, error: new R(integral.error), flagged: false, poles: [], reason: null, converged: true };
  // fewer digits than asked: round to those the error estimate supports
  const good = integral.error.isZero() ? digits : Math.max(1, Math.min(digits, Math.floor(integral.value.abs().div(integral.error).log(10).toNumber())));
  return { ...base, value: new out(integral.value).toSignificantDigits(good), error: new R(integral.error), flagged: false, poles: [], reason: `the quadrature reached only about ${good} digits (error ≈ ${shortNumber(integral.error)}; a pole of the approximant lies close to the positive t axis)`, converged: false };
}

/** Every Borel–Padé [L/M] with M ≥ 1 and L + M = the order of the series (the highest one it determines), by decreasing L. */
export function padeBorelTable(coefficients: RealInput[], order: number, eps: RealInput, digits: number): BorelValue[] {
  const top = Math.min(order, coefficients.length - 1);
  if (top < 1) return [];
  const table: BorelValue[] = [];
  for (let L = top - 1; L >= 0; L--) table.push(padeBorel(coefficients, L, top - L, eps, digits));
  return table;
}
