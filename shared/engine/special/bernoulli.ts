import { type ExactRational, fail, reduce } from '../precision';

/**
 * Exact Bernoulli numbers from tangent numbers (Brent–Harvey, "Fast computation of Bernoulli,
 * Tangent and Secant numbers", 2011): an O(n²) recurrence on integers, no rational arithmetic,
 * then B_{2k} = (−1)^{k−1}·2k·T_k / (4^k (4^k − 1)).
 */
let tangentNumbers: bigint[] = [0n]; // tangentNumbers[k] = T_k, k ≥ 1
const bernoulliCache = new Map<number, ExactRational>();

export const MAX_BERNOULLI_INDEX = 5000;

function ensureTangentNumbers(count: number): void {
  if (tangentNumbers.length > count) return;
  const n = Math.max(count, Math.ceil(1.25 * (tangentNumbers.length - 1)), 16);
  const t: bigint[] = new Array(n + 1).fill(0n);
  t[1] = 1n;
  for (let k = 2; k <= n; k++) t[k] = BigInt(k - 1) * t[k - 1];
  for (let k = 2; k <= n; k++) {
    for (let j = k; j <= n; j++) t[j] = BigInt(j - k) * t[j - 1] + BigInt(j - k + 2) * t[j];
  }
  tangentNumbers = t;
}

/**
 * B_{2k} as an unreduced fraction 2k·T_k / (4^k(4^k − 1)) with sign — no gcd, for building
 * fixed-point tables where the exact reduced form is not needed (gcd of 10⁴-bit integers is slow).
 */
export function bernoulliEvenUnreduced(n: number): ExactRational {
  if (n < 2 || n % 2 === 1) return bernoulliExact(n);
  const k = n / 2;
  ensureTangentNumbers(k);
  const fourK = 1n << BigInt(2 * k);
  return { num: (k % 2 === 1 ? 1n : -1n) * BigInt(2 * k) * tangentNumbers[k], den: fourK * (fourK - 1n) };
}

/** B_n with the convention B_1 = −1/2. */
export function bernoulliExact(n: number): ExactRational {
  if (!Number.isInteger(n) || n < 0) fail('domain', `Bernoulli index must be a non-negative integer, got ${n}`);
  if (n > MAX_BERNOULLI_INDEX) fail('limit', `Bernoulli index above ${MAX_BERNOULLI_INDEX}`);
  if (n === 0) return { num: 1n, den: 1n };
  if (n === 1) return { num: -1n, den: 2n };
  if (n % 2 === 1) return { num: 0n, den: 1n };
  const cached = bernoulliCache.get(n);
  if (cached) return cached;
  const k = n / 2;
  ensureTangentNumbers(k);
  const fourK = 1n << BigInt(2 * k);
  const value = reduce((k % 2 === 1 ? 1n : -1n) * BigInt(2 * k) * tangentNumbers[k], fourK * (fourK - 1n));
  bernoulliCache.set(n, value);
  return value;
}
