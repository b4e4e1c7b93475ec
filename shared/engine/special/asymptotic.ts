import { type Fixed } from '../precision';
import { bitLen } from './float';

/*
 * Shared machinery of the Bernoulli asymptotic series (Stirling for ln Γ, ψ, the Euler–Maclaurin
 * tail of the Hurwitz sum behind ψ⁽ⁿ⁾): coefficient tables cached at the highest precision asked
 * for, and Horner's rule in y = (Q/P)² for an exact argument z = P/Q.
 */

export interface CoefficientTable {
  /** Fractional bits of `coeffs`. */
  bits: number;
  /** coeffs[k] for k ≥ 1 (index 0 unused). */
  coeffs: Fixed[];
  /** log2|coeffs[k]| in double precision, for choosing the number of terms. */
  log2Abs: number[];
}

/**
 * A table of exact rational coefficients c_k (k ≥ 1) as fixed point, grown on demand: more terms
 * at the same precision, or rebuilt at a higher precision.
 */
export class CoefficientCache {
  private table: CoefficientTable = { bits: -1, coeffs: [0n], log2Abs: [0] };

  /**
   * @param coefficient c_k exactly
   * @param log2Estimate log2|c_k| in double precision (an estimate good to a few bits), so the number
   *   of terms can be chosen before any coefficient is built
   */
  private readonly estimates: number[] = [0];

  constructor(
    private readonly coefficient: (k: number) => { num: bigint; den: bigint },
    private readonly estimate: (k: number) => number,
  ) {}

  private truncations = new Map<string, Fixed[]>();

  /**
   * c_k at max(16, top − (k−1)·d) fractional bits, k = 1…terms: the precisions Horner's rule in
   * hornerInverseSquare works at (memoised for the last few (top, d)).
   */
  truncated(top: number, d: number, terms: number): Fixed[] {
    const key = `${top}:${d}`;
    let list = this.truncations.get(key);
    if (!list || list.length <= terms) {
      const table = this.get(top, terms);
      list = [0n];
      for (let k = 1; k <= terms; k++) list.push(table.coeffs[k] >> BigInt(table.bits - Math.max(16, top - (k - 1) * d)));
      if (this.truncations.size >= 4) this.truncations.delete(this.truncations.keys().next().value as string);
      this.truncations.set(key, list);
    }
    return list;
  }

  /** log2|c_k| in double precision (memoised). */
  log2Estimate(k: number): number {
    for (let i = this.estimates.length; i <= k; i++) this.estimates.push(this.estimate(i));
    return this.estimates[k];
  }

  get(bits: number, terms: number): CoefficientTable {
    let table = this.table;
    if (table.bits < bits) table = { bits: Math.ceil(bits * 1.1) + 32, coeffs: [0n], log2Abs: [0] };
    if (table.coeffs.length <= terms) {
      const coeffs = table.coeffs.slice();
      const log2Abs = table.log2Abs.slice();
      const size = Math.max(terms + 1, Math.ceil(1.25 * coeffs.length), 16);
      for (let k = coeffs.length; k < size; k++) {
        const { num, den } = this.coefficient(k);
        coeffs.push((num << BigInt(table.bits)) / den);
        log2Abs.push(log2AbsRational(num, den));
      }
      table = { bits: table.bits, coeffs, log2Abs };
    }
    this.table = table;
    return table;
  }
}

export function log2AbsRational(num: bigint, den: bigint): number {
  if (num === 0n) return -Infinity;
  const a = num < 0n ? -num : num;
  const na = bitLen(a);
  const nd = bitLen(den);
  const sa = Number(a >> BigInt(Math.max(0, na - 53)));
  const sd = Number(den >> BigInt(Math.max(0, nd - 53)));
  return Math.log2(sa) + Math.max(0, na - 53) - Math.log2(sd) - Math.max(0, nd - 53);
}

const log2Factorials: number[] = [0];

/** log2(n!) in double precision. */
export function log2Factorial(n: number): number {
  for (let i = log2Factorials.length; i <= n; i++) log2Factorials.push(log2Factorials[i - 1] + Math.log2(i));
  return log2Factorials[n];
}

/** log2|B_{2k}| = log2(2·(2k)!·ζ(2k)/(2π)^{2k})  (DLMF 25.6.2), in double precision. */
export function log2AbsBernoulli(k: number): number {
  const zeta = k === 1 ? Math.PI ** 2 / 6 : 1 + 2 ** (-2 * k) + 3 ** (-2 * k) + 4 ** (-2 * k);
  return 1 + Math.log2(zeta) + log2Factorial(2 * k) - 2 * k * Math.log2(2 * Math.PI);
}

/**
 * The number of terms K for which |c_K|·z^{−(2K+offset)} < 2^budget, or null when the terms
 * start growing first (z too small for this precision).
 */
export function termsForBudget(cache: CoefficientCache, log2z: number, budget: number, offset = 0): number | null {
  let previous = Infinity;
  for (let k = 1; k <= 20000; k++) {
    const estimate = cache.log2Estimate(k) - (2 * k + offset) * log2z;
    if (estimate < budget) return k;
    if (estimate > previous) return null;
    previous = estimate;
  }
  return null;
}

export function requireTerms(terms: number | null): number {
  if (terms === null) throw new Error('asymptotic series does not reach the precision at this argument');
  return terms;
}

/**
 * Σ_{k=1}^{terms} c_k·y^{k−1} for y = (Q/P)² (P > Q > 0 integers), fixed point at `bits`.
 * Each step needs the partial sum only to 2^-bits·y^{−(k−1)}, so the precision drops with k;
 * for small P and Q a step is one short product and one short division.
 */
export function hornerInverseSquare(cache: CoefficientCache, terms: number, P: bigint, Q: bigint, bits: number): Fixed {
  const yNum = Q * Q;
  const yDen = P * P;
  const d = Math.max(0, bitLen(yDen) - bitLen(yNum) - 1); // ≤ log2(1/y)
  const top = bits + 8;
  const coefficients = cache.truncated(top, d, terms);
  const precision = (k: number) => Math.max(16, top - (k - 1) * d);
  const short = bitLen(yDen) <= 192;
  const yFixed = short ? 0n : (yNum << BigInt(top)) / yDen;
  const yNumShifted = yNum << BigInt(d);
  let p = precision(terms);
  let acc = coefficients[terms];
  for (let k = terms - 1; k >= 1; k--) {
    const next = precision(k);
    const shift = next - p;
    if (short) acc = shift === d ? (acc * yNumShifted) / yDen : ((acc * yNum) << BigInt(shift)) / yDen;
    else acc = (acc * yFixed) >> BigInt(top - shift);
    acc += coefficients[k];
    p = next;
  }
  return acc >> 8n;
}
