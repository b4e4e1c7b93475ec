import { type ExactRational, type Fixed, changeBits, div, fail, fromRational, mul, one } from '../precision';
import { log2AbsRational } from './asymptotic';
import { bernoulliExact } from './bernoulli';
import { ln2Fixed, piFixed } from './constants';
import { expFixed, lnFixedPositive } from './elementary';

/** ζ(2m) = q·π^{2m} with q = |B_{2m}|·2^{2m−1}/(2m)!  (DLMF 25.6.2). */
export function zetaEvenRationalFactor(n: number): ExactRational {
  const b = bernoulliExact(n);
  let factorial = 1n;
  for (let i = 2n; i <= BigInt(n); i++) factorial *= i;
  const num = (b.num < 0n ? -b.num : b.num) << BigInt(n - 1);
  return reduceRational(num, b.den * factorial);
}

function reduceRational(num: bigint, den: bigint): ExactRational {
  let a = num < 0n ? -num : num;
  let b = den;
  while (b !== 0n) [a, b] = [b, a % b];
  return { num: num / a, den: den / a };
}

interface BorweinWeights {
  bits: number;
  weights: Fixed[]; // (−1)^k (d_n − d_k)/d_n
}
const borweinCache = new Map<number, BorweinWeights>();

/**
 * Weights of Borwein's alternating-series algorithm for ζ ("An efficient algorithm for the
 * Riemann zeta function", 1991, Algorithm 2): error ≤ 3/(3+√8)^n, so n ≈ 0.3932·bits terms.
 */
function borweinWeights(bits: number): BorweinWeights {
  const cached = borweinCache.get(bits);
  if (cached) return cached;
  const n = Math.ceil((bits + 4) * 0.39321) + 2;
  const N = BigInt(n);
  const d: bigint[] = [];
  let term = 1n; // n·(n+i−1)!·4^i/((n−i)!(2i)!)
  let sum = 1n;
  d.push(sum);
  for (let i = 1n; i <= N; i++) {
    term = (term * (N + i - 1n) * 4n * (N - i + 1n)) / (2n * i * (2n * i - 1n));
    sum += term;
    d.push(sum);
  }
  const dn = d[n];
  const weights: Fixed[] = [];
  for (let k = 0; k < n; k++) weights.push(fromRational((k % 2 === 0 ? 1n : -1n) * (dn - d[k]), dn, bits));
  const result = { bits, weights };
  borweinCache.set(bits, result);
  return result;
}

/** ζ(n) for an integer n ≥ 2 in fixed point. */
export function zetaIntegerFixed(n: number, bits: number): Fixed {
  if (!Number.isInteger(n) || n < 2) fail('domain', `zeta(n) needs an integer n ≥ 2, got ${n}`);
  if (n * 6 >= bits) return zetaByDirectSum(n, bits);
  if (n % 2 === 0) {
    const q = zetaEvenRationalFactor(n);
    const work = bits + 8 + Math.ceil(n * 1.66);
    let power = one(work);
    const pi = piFixed(work);
    for (let i = 0; i < n; i++) power = mul(power, pi, work);
    return changeBits((power * q.num) / q.den, work, bits);
  }
  const work = bits + 8;
  const { weights } = borweinWeights(work);
  let sum = 0n;
  for (let k = 0; k < weights.length; k++) sum += weights[k] / BigInt(k + 1) ** BigInt(n);
  // ζ(n) = η(n)/(1 − 2^{1−n})
  const unit = one(work);
  const value = div(sum, unit - (unit >> BigInt(n - 1)), work);
  return changeBits(value, work, bits);
}

/** Σ j^{-n}, fast when n is large compared with the precision. */
function zetaByDirectSum(n: number, bits: number): Fixed {
  const work = bits + 8;
  const unit = one(work);
  let sum = unit;
  for (let j = 2n; ; j++) {
    const term = unit / j ** BigInt(n);
    if (term === 0n) break;
    sum += term;
  }
  return changeBits(sum, work, bits);
}

/** ζ(x) for a rational x > 0, x ≠ 1, in fixed point (Borwein's algorithm with real exponents). */
export function zetaRealFixed(x: ExactRational, bits: number): Fixed {
  if (x.num <= 0n) fail('domain', 'zetaRealFixed needs x > 0');
  if (x.num === x.den) fail('pole', 'zeta has a pole at x = 1');
  if (x.den === 1n && x.num < 100000n) return zetaIntegerFixed(Number(x.num), bits);
  const xValue = 2 ** log2AbsRational(x.num, x.den);
  if (xValue * 6 >= bits) return zetaRealByDirectSum(x, xValue, bits);
  // 1 − 2^{1−x} cancels near x = 1: add the bits it loses
  const extra = Math.max(0, Math.ceil(-log2AbsRational(x.num - x.den, x.den))) + 8;
  const work = bits + extra;
  const { weights } = borweinWeights(work);
  const xFixed = fromRational(x.num, x.den, work);
  // m^{-x} is multiplicative: exp/ln only at primes, products elsewhere
  const count = weights.length;
  const smallestFactor = smallestPrimeFactors(count);
  const powers: Fixed[] = new Array(count + 1);
  powers[1] = one(work);
  let sum = weights[0] << BigInt(work);
  for (let m = 2; m <= count; m++) {
    const p = smallestFactor[m];
    powers[m] = p === m ? expFixed(-mul(xFixed, lnInteger(m, work), work), work) : mul(powers[p], powers[m / p], work);
    sum += weights[m - 1] * powers[m];
  }
  const unit = one(work);
  const twoPower = expFixed(mul(unit - xFixed, ln2Fixed(work), work), work);
  return changeBits(div(sum >> BigInt(work), unit - twoPower, work), work, bits);
}

/** ln m for small integers m, cached at the highest precision asked for (ζ reuses them across x). */
const lnIntegerCache = new Map<number, { bits: number; value: Fixed }>();
function lnInteger(m: number, bits: number): Fixed {
  const cached = lnIntegerCache.get(m);
  if (cached && cached.bits >= bits) return changeBits(cached.value, cached.bits, bits);
  const work = Math.ceil(bits * 1.1) + 32;
  const value = lnFixedPositive(BigInt(m) << BigInt(work), work);
  lnIntegerCache.set(m, { bits: work, value });
  return changeBits(value, work, bits);
}

/** Σ m^{-x} while m^{-x} ≥ 2^-bits: few terms when x is large compared with the precision. */
function zetaRealByDirectSum(x: ExactRational, xValue: number, bits: number): Fixed {
  const work = bits + 8;
  const xFixed = fromRational(x.num, x.den, work);
  let sum = one(work);
  for (let m = 2; xValue * Math.log2(m) < work + 2; m++) sum += expFixed(-mul(xFixed, lnInteger(m, work), work), work);
  return changeBits(sum, work, bits);
}

/** ζ(2), …, ζ(maxN) at once (index = argument), for Taylor tables. */
export function zetaTableFixed(maxN: number, bits: number): Fixed[] {
  const table: Fixed[] = [0n, 0n];
  for (let n = 2; n <= maxN; n++) table.push(zetaIntegerFixed(n, bits));
  return table;
}

function smallestPrimeFactors(limit: number): number[] {
  const spf = new Array<number>(limit + 1).fill(0);
  for (let i = 2; i <= limit; i++) {
    if (spf[i] !== 0) continue;
    for (let j = i; j <= limit; j += i) if (spf[j] === 0) spf[j] = i;
  }
  return spf;
}
