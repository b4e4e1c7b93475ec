import { checkedPade } from '../pade';
import { type Real, GUARD_DIGITS, realContext } from '../precision';
import { type Q, q, qMul, qSub } from '../symbolic';

/**
 * Holding exponent series against data: the x-axes a comparison uses, the series variants drawn
 * (truncations at each order, Padé approximants checked for poles), residuals, pulls and χ² summaries.
 */

/** The axes data can be given on: s itself, or Δφ = (d − s)/2 (exact in the long-range region, s < s* and s < 2, where φ is not renormalized). */
export type ComparisonAxis = 's' | 'Delta_phi';

export function deltaPhiFromS(d: Q, s: Q): Q {
  return qMul(qSub(d, s), q(1, 2));
}

export function sFromDeltaPhi(d: Q, deltaPhi: Q): Q {
  return qSub(d, qMul(q(2), deltaPhi));
}

export function sFromAxis(axis: ComparisonAxis, d: Q, x: Q): Q {
  return axis === 's' ? x : sFromDeltaPhi(d, x);
}

export function axisFromS(axis: ComparisonAxis, d: Q, s: Q): Q {
  return axis === 's' ? s : deltaPhiFromS(d, s);
}

export interface VariantSpec {
  key: string;
  label: string;
  kind: 'truncated' | 'pade';
  /** Highest power of ε used. */
  order: number;
  /** Padé degrees (numerator L, denominator M). */
  L?: number;
  M?: number;
}

const ORDER_LABELS = ['mean field (ε⁰)', 'one loop (ε¹)', 'two loops (ε²)', 'three loops (ε³)'];

/** Truncations through ε¹ … ε^loops, then the Padé approximants [L/M] with M ≥ 1 and L + M ≤ loops. */
export function seriesVariants(loops: 1 | 2 | 3): VariantSpec[] {
  const truncated: VariantSpec[] = Array.from({ length: loops }, (_, i) => ({ key: `order${i + 1}`, label: ORDER_LABELS[i + 1], kind: 'truncated', order: i + 1 }));
  const pade: VariantSpec[] = [];
  for (let total = 1; total <= loops; total++) {
    for (let M = total; M >= 1; M--) {
      const L = total - M;
      pade.push({ key: `pade_${L}_${M}`, label: `Padé [${L}/${M}]`, kind: 'pade', order: total, L, M });
    }
  }
  return [...truncated, ...pade.sort((a, b) => a.order - b.order || (b.L ?? 0) - (a.L ?? 0))];
}

export interface VariantValue {
  value: Real | null;
  /** Why the value is missing (a pole of the approximant in (0, ε], a degenerate approximant). */
  defect?: string;
}

/** Σ_{k ≤ order} c_k ε^k at working precision, rounded to `digits`. */
export function truncatedValue(coefficients: Real[], eps: Real, order: number, digits: number): Real {
  const R = realContext(digits + GUARD_DIGITS);
  let sum = new R(0);
  for (let k = Math.min(order, coefficients.length - 1); k >= 0; k--) sum = sum.times(eps).plus(coefficients[k]);
  return new (realContext(digits))(sum).toSignificantDigits(digits);
}

/**
 * The [L/M] approximant at ε, or null with the reason: an approximant with a pole between 0 and ε (or a
 * denominator changing sign there) is not continued from ε = 0 to the physical ε, so its value there
 * means nothing. The same check as every other Padé value (checkedPade).
 */
export function padeVariant(coefficients: Real[], L: number, M: number, eps: Real, digits: number): VariantValue {
  const checked = checkedPade(coefficients, L, M, eps, digits);
  return checked.value !== null ? { value: checked.value } : { value: null, defect: checked.reason ?? 'defective approximant' };
}

/**
 * Every variant at one ε from the series coefficients c_0 … c_loops at that s. `truncatedAt(order)`
 * gives a truncation's value when the printed value is not the quantity's own truncated series
 * (e.g. ν = 1/(1/ν truncated at that order)); without it the series is truncated.
 */
export function variantValues(variants: VariantSpec[], coefficients: Real[], eps: Real, digits: number, truncatedAt?: (order: number) => Real | null): Record<string, VariantValue> {
  const truncation = (order: number): VariantValue => {
    const value = truncatedAt ? truncatedAt(order) : truncatedValue(coefficients, eps, order, digits);
    return value === null ? { value: null, defect: 'undefined at this order (its relation divides by zero)' } : { value };
  };
  return Object.fromEntries(variants.map((v) => [v.key, v.kind === 'truncated' ? truncation(v.order) : padeVariant(coefficients, v.L ?? 0, v.M ?? 1, eps, digits)]));
}

/**
 * The residual in units of the data's error on the side where the series lies: above the data point
 * (residual > 0) the upper error, below it the lower one. Null when that error is zero.
 */
export function pullOf(residual: Real, errLow: Real, errHigh: Real): Real | null {
  const sigma = residual.isNegative() ? errLow : errHigh;
  return sigma.isZero() ? null : residual.div(sigma);
}

export interface FitSummary {
  /** Points where the variant has a value. */
  points: number;
  /** Σ pull² over the points with a pull; null when no point has one. */
  chi2: Real | null;
  /** Points with a pull (a value and a non-zero error on the side of the series): the count χ² sums over. */
  chi2Points: number;
  /** χ² / chi2Points. */
  chi2PerPoint: Real | null;
  rms: Real | null;
  maxAbs: Real | null;
}

export function fitSummary(residuals: (Real | null)[], pulls: (Real | null)[] | null, digits: number): FitSummary {
  const R = realContext(digits + GUARD_DIGITS);
  const present = residuals.filter((r): r is Real => r !== null);
  const counted = (pulls ?? []).filter((p): p is Real => p !== null);
  const chi2 = counted.length ? counted.reduce((sum, p) => sum.plus(p.times(p)), new R(0)) : null;
  const squares = present.reduce((sum, r) => sum.plus(r.times(r)), new R(0));
  return {
    points: present.length,
    chi2,
    chi2Points: counted.length,
    chi2PerPoint: chi2 ? chi2.div(counted.length) : null,
    rms: present.length ? squares.div(present.length).sqrt() : null,
    maxAbs: present.length ? present.reduce((m, r) => (r.abs().gt(m) ? r.abs() : m), new R(0)) : null,
  };
}
