import { fail } from '../precision/errors';
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

/** Real zeros of Q inside [from, to]: sign changes on a grid, refined by bisection. */
export function polesInInterval(pade: PadeApproximant, from: RealInput, to: RealInput, digits: number): Real[] {
  if (pade.M === 0) return [];
  const R = realContext(digits + GUARD_DIGITS);
  const a = new R(from as never);
  const b = new R(to as never);
  const samples = 64 * (pade.M + 1);
  const poles: Real[] = [];
  const step = b.minus(a).div(samples);
  let xPrev = a;
  let qPrev = polynomialAt(pade.denominator, a);
  if (qPrev.isZero()) poles.push(a);
  for (let i = 1; i <= samples; i++) {
    const x = i === samples ? b : a.plus(step.times(i));
    const qx = polynomialAt(pade.denominator, x);
    if (qx.isZero()) poles.push(x);
    else if (!qPrev.isZero() && qPrev.isNegative() !== qx.isNegative()) poles.push(bisect(pade.denominator, xPrev, x, digits + 4, R));
    xPrev = x;
    qPrev = qx;
  }
  return poles.map((p) => new (realContext(digits))(p).toSignificantDigits(digits));
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
