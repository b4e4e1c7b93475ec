import { polynomialValue, realRootsInInterval, solveLinear } from '../linalg';
import { type Real, type RealInput, EngineError, GUARD_DIGITS, fail, realContext } from '../precision';
import { numericRing } from '../series';

/**
 * Padé approximants [L/M] = P_L(x)/Q_M(x), Q(0) = 1, matching Σ c_k x^k through x^{L+M}.
 * Written here (a small linear solve in decimal arithmetic, linalg's `solveLinear`) because no
 * JavaScript package works at arbitrary precision.
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
  const matrix = Array.from({ length: M }, (_, i) => Array.from({ length: M }, (_, j) => c(L + i - j)));
  const rhs = Array.from({ length: M }, (_, i) => c(L + i + 1).neg());
  const q = [new R(1), ...denominatorCoefficients(matrix, rhs, digits + GUARD_DIGITS)];
  const p: Real[] = [];
  for (let i = 0; i <= L; i++) {
    let s = new R(0);
    for (let j = 0; j <= Math.min(i, M); j++) s = s.plus(q[j].times(c(i - j)));
    p.push(s);
  }
  return { L, M, numerator: p, denominator: q };
}

/**
 * The system for q_1 … q_M, solved with partial pivoting; a pivot below 10^(4 − workingDigits) times
 * the largest entry means the system is singular (a degenerate approximant).
 */
function denominatorCoefficients(matrix: Real[][], rhs: Real[], workingDigits: number): Real[] {
  const R = realContext(workingDigits);
  const largest = [...matrix.flat(), ...rhs].reduce((max, v) => (v.abs().gt(max) ? v.abs() : max), new R(0));
  const scale = largest.isZero() ? new R(1) : largest;
  const threshold = new R(10).pow(-(workingDigits - 4)).times(scale);
  const solution = solveLinear(numericRing(workingDigits), matrix, rhs, (v) => v.abs().lte(threshold), (v) => v.abs().div(scale).toNumber());
  return solution ?? fail('singular', 'Padé system is singular (the approximant is degenerate)');
}

export function evaluatePade(pade: PadeApproximant, x: RealInput, digits: number): Real {
  const R = realContext(digits + GUARD_DIGITS);
  const xv = new R(x as never);
  const den = polynomialValue(pade.denominator, xv);
  if (den.isZero()) fail('pole', 'the approximant has a pole at this point');
  return new (realContext(digits))(polynomialValue(pade.numerator, xv).div(den)).toSignificantDigits(digits);
}

/** Real zeros of Q inside [from, to], including zeros where Q only touches zero (even multiplicity). */
export function polesInInterval(pade: PadeApproximant, from: RealInput, to: RealInput, digits: number): Real[] {
  if (pade.M === 0) return [];
  const R = realContext(digits + GUARD_DIGITS);
  const zeros = realRootsInInterval(pade.denominator.map((c) => new R(c)), new R(from as never), new R(to as never), digits, R);
  return zeros.map((p) => new (realContext(digits))(p).toSignificantDigits(digits));
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
  const atEps = polynomialValue(approximant.denominator.map((c) => new R(c)), e);
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
