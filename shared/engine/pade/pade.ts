import { EngineError, fail } from '../precision/errors';
import { type Real, type RealInput, GUARD_DIGITS, realContext } from '../precision/real';

/**
 * Padé approximants [L/M] = P_L(x)/Q_M(x), Q(0) = 1, matching Σ c_k x^k through x^{L+M}.
 * Written here (small linear solve in decimal arithmetic) because no JavaScript package works at
 * arbitrary precision.
 */
export interface PadeApproximant {
  L: number;
  M: number;
  numerator: Real[]; // p_0..p_L
  denominator: Real[]; // q_0 = 1, q_1..q_M
}

export function padeApproximant(series: RealInput[], L: number, M: number, digits: number): PadeApproximant {
  if (!Number.isInteger(L) || !Number.isInteger(M) || L < 0 || M < 0) fail('invalid', 'L and M must be non-negative integers');
  if (series.length < L + M + 1) fail('invalid', `[${L}/${M}] needs ${L + M + 1} coefficients, got ${series.length}`);
  const R = realContext(digits + GUARD_DIGITS);
  const c = (k: number) => (k < 0 ? new R(0) : new R(series[k] as never));
  // c_{L+1} … c_{L+M} all zero: the polynomial c_0 … c_L itself (Q = 1) matches through x^{L+M}
  if (Array.from({ length: M }, (_, i) => c(L + 1 + i)).every((x) => x.isZero())) {
    return { L, M, numerator: Array.from({ length: L + 1 }, (_, i) => c(i)), denominator: [new R(1), ...Array.from({ length: M }, () => new R(0))] };
  }
  // Σ_{j=1}^{M} q_j c_{L+i−j} = −c_{L+i}, i = 1..M
  const matrix: Real[][] = [];
  for (let i = 1; i <= M; i++) {
    const row: Real[] = [];
    for (let j = 1; j <= M; j++) row.push(c(L + i - j));
    row.push(c(L + i).neg());
    matrix.push(row);
  }
  const q = [new R(1), ...solve(matrix, M, R)];
  const p: Real[] = [];
  for (let i = 0; i <= L; i++) {
    let s = new R(0);
    for (let j = 0; j <= Math.min(i, M); j++) s = s.plus(q[j].times(c(i - j)));
    p.push(s);
  }
  return { L, M, numerator: p, denominator: q };
}

function solve(a: Real[][], n: number, R: ReturnType<typeof realContext>): Real[] {
  const tiny = new R(10).pow(-(R.precision - 4));
  let scale = new R(0);
  for (const row of a) for (const v of row) if (v.abs().gt(scale)) scale = v.abs();
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (a[r][col].abs().gt(a[pivot][col].abs())) pivot = r;
    if (a[pivot][col].abs().lte(tiny.times(scale.isZero() ? 1 : scale))) fail('singular', 'Padé system is singular (the approximant is degenerate)');
    [a[col], a[pivot]] = [a[pivot], a[col]];
    for (let r = col + 1; r < n; r++) {
      const f = a[r][col].div(a[col][col]);
      for (let k = col; k <= n; k++) a[r][k] = a[r][k].minus(f.times(a[col][k]));
    }
  }
  const x: Real[] = new Array(n);
  for (let r = n - 1; r >= 0; r--) {
    let s = a[r][n];
    for (let k = r + 1; k < n; k++) s = s.minus(a[r][k].times(x[k]));
    x[r] = s.div(a[r][r]);
  }
  return x;
}

function polynomialAt(coeffs: Real[], x: Real): Real {
  let s = x.mul(0);
  for (let k = coeffs.length - 1; k >= 0; k--) s = s.times(x).plus(coeffs[k]);
  return s;
}

export function evaluatePade(pade: PadeApproximant, x: RealInput, digits: number): Real {
  const R = realContext(digits + GUARD_DIGITS);
  const xv = new R(x as never);
  const den = polynomialAt(pade.denominator, xv);
  if (den.isZero()) fail('pole', 'the approximant has a pole at this point');
  return new (realContext(digits))(polynomialAt(pade.numerator, xv).div(den)).toSignificantDigits(digits);
}

/** Real zeros of Q inside [from, to], including zeros where Q only touches zero (even multiplicity). */
export function polesInInterval(pade: PadeApproximant, from: RealInput, to: RealInput, digits: number): Real[] {
  if (pade.M === 0) return [];
  const R = realContext(digits + GUARD_DIGITS);
  const zeros = realZeros(pade.denominator.map((c) => new R(c)), new R(from as never), new R(to as never), digits, R);
  return zeros.map((p) => new (realContext(digits))(p).toSignificantDigits(digits));
}

/**
 * Real zeros of a polynomial on [lo, hi]. Between consecutive critical points (zeros of the
 * derivative, found the same way) the polynomial is monotone, so each piece holds at most one
 * simple zero, located by bisection; a critical point where the value vanishes to `digits` digits
 * relative to the size of the terms is a zero of even multiplicity, which no sign change reveals.
 */
function realZeros(coeffs: Real[], lo: Real, hi: Real, digits: number, R: ReturnType<typeof realContext>): Real[] {
  let degree = coeffs.length - 1;
  while (degree > 0 && coeffs[degree].isZero()) degree--;
  if (degree === 0 || lo.gt(hi)) return [];
  if (degree === 1) {
    const x = coeffs[0].neg().div(coeffs[1]);
    return x.gte(lo) && x.lte(hi) ? [x] : [];
  }
  const p = coeffs.slice(0, degree + 1);
  const derivative = p.slice(1).map((c, k) => c.times(k + 1));
  const critical = realZeros(derivative, lo, hi, digits + 4, R).filter((c) => c.gt(lo) && c.lt(hi));
  const knots = [lo, ...critical, hi];
  const found: Real[] = knots.filter((x) => touchesZero(p, x, digits, R));
  for (let i = 1; i < knots.length; i++) {
    const [a, b] = [knots[i - 1], knots[i]];
    const [pa, pb] = [polynomialAt(p, a), polynomialAt(p, b)];
    if (!pa.isZero() && !pb.isZero() && pa.isNegative() !== pb.isNegative()) found.push(bisect(p, a, b, digits + 4, R));
  }
  return distinct(found.sort((x, y) => x.comparedTo(y)), digits);
}

function touchesZero(p: Real[], x: Real, digits: number, R: ReturnType<typeof realContext>): boolean {
  const size = p.reduceRight((sum, c) => sum.times(x.abs()).plus(c.abs()), new R(0));
  return polynomialAt(p, x).abs().lte(size.times(new R(10).pow(-digits)));
}

/** Sorted zeros with the copies of one zero (found from both sides of a near-double zero) merged. */
function distinct(sorted: Real[], digits: number): Real[] {
  const tolerance = Math.ceil(digits / 2);
  return sorted.filter((x, i) => i === 0 || x.minus(sorted[i - 1]).abs().gt(x.abs().plus(1).times(`1e-${tolerance}`)));
}

function bisect(q: Real[], lo: Real, hi: Real, digits: number, R: ReturnType<typeof realContext>): Real {
  let qlo = polynomialAt(q, lo);
  const iterations = Math.ceil(digits * 3.33) + 8;
  for (let i = 0; i < iterations; i++) {
    const mid = lo.plus(hi).div(2);
    const qm = polynomialAt(q, mid);
    if (qm.isZero()) return mid;
    if (qm.isNegative() === qlo.isNegative()) {
      lo = mid;
      qlo = qm;
    } else hi = mid;
  }
  return new R(lo.plus(hi).div(2));
}

export interface PadeTableEntry {
  L: number;
  M: number;
  approximant?: PadeApproximant;
  value?: Real;
  poles: Real[];
  /** True when a pole lies inside the requested interval (the approximant is unreliable there). */
  flagged: boolean;
  error?: string;
}

/** Every [L/M] with L + M ≤ order, evaluated at `at` and checked for poles in `interval`. */
export function padeTable(series: RealInput[], order: number, digits: number, options: { at?: RealInput; interval?: [RealInput, RealInput] } = {}): PadeTableEntry[] {
  const entries: PadeTableEntry[] = [];
  for (let total = 0; total <= order; total++) {
    for (let M = 0; M <= total; M++) {
      const L = total - M;
      try {
        const approximant = padeApproximant(series, L, M, digits);
        const poles = options.interval ? polesInInterval(approximant, options.interval[0], options.interval[1], digits) : [];
        const entry: PadeTableEntry = { L, M, approximant, poles, flagged: poles.length > 0 };
        if (options.at !== undefined) {
          try {
            entry.value = evaluatePade(approximant, options.at, digits);
          } catch (e) {
            entry.error = (e as Error).message;
          }
        }
        entries.push(entry);
      } catch (e) {
        entries.push({ L, M, poles: [], flagged: true, error: (e as Error).message });
      }
    }
  }
  return entries;
}

/**
 * An approximant evaluated at the physical ε only after checking the way there: a real pole in the
 * interval between 0 and ε (a zero of Q, also one where Q only touches zero) or a change of sign of
 * Q on [0, ε] means the approximant is not continued from ε = 0 to ε, so it gets no value.
 */
export interface CheckedPade {
  L: number;
  M: number;
  /** Null when flagged. */
  value: Real | null;
  flagged: boolean;
  /** Real zeros of the denominator between 0 (excluded) and ε (included). */
  poles: Real[];
  /** Q(ε) has the opposite sign to Q(0) = 1, or vanishes. */
  signChange: boolean;
  /** Why the approximant has no value (null when it has one). */
  reason: string | null;
}

const shortNumber = (x: Real) => new (realContext(6))(x).toSignificantDigits(6).toString();

export function checkedPade(coefficients: RealInput[], L: number, M: number, eps: RealInput, digits: number): CheckedPade {
  let approximant: PadeApproximant;
  try {
    approximant = padeApproximant(coefficients.slice(0, L + M + 1), L, M, digits);
  } catch (error) {
    if (!(error instanceof EngineError) || error.code !== 'singular') throw error;
    return { L, M, value: null, flagged: true, poles: [], signChange: false, reason: 'degenerate approximant (a vanishing coefficient makes its linear system singular)' };
  }
  const R = realContext(digits + GUARD_DIGITS);
  const e = new R(eps as never);
  const [from, to] = e.isNegative() ? [e, new R(0)] : [new R(0), e];
  const poles = e.isZero() ? [] : polesInInterval(approximant, from, to, digits).filter((p) => !p.isZero());
  const atEps = polynomialAt(approximant.denominator.map((c) => new R(c)), e);
  const signChange = !atEps.isPositive() || atEps.isZero();
  const flagged = poles.length > 0 || signChange;
  if (!flagged) return { L, M, value: evaluatePade(approximant, e, digits), flagged, poles, signChange, reason: null };
  const where = poles.length ? `${poles.length > 1 ? 'poles' : 'pole'} at ε = ${poles.map(shortNumber).join(', ')}` : 'the denominator changes sign between 0 and ε';
  return { L, M, value: null, flagged, poles, signChange, reason: where };
}

/** Every [L/M] with M ≥ 1 and L + M ≤ order, by increasing L + M and then decreasing L, each checked at ε. */
export function checkedPadeTable(coefficients: RealInput[], order: number, eps: RealInput, digits: number): CheckedPade[] {
  const top = Math.min(order, coefficients.length - 1);
  const table: CheckedPade[] = [];
  for (let total = 1; total <= top; total++) {
    for (let L = total - 1; L >= 0; L--) table.push(checkedPade(coefficients, L, total - L, eps, digits));
  }
  return table;
}
