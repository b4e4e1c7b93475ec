import { type ExactRational, type Fixed, changeBits, div, fromInteger, fromRational, mul, one } from '../precision/fixed';
import { fail } from '../precision/errors';
import { bernoulliEvenUnreduced } from './bernoulli';
import { eulerGammaFixed, expFixedSplit, ln2Fixed, lnFixedPositive, piFixed } from './constants';
import { bitsNearInteger, sinCosPi } from './trigonometric';
import { zetaTableFixed } from './zeta';

/** value = mant·2^exp2 (mant in fixed point at the caller's bits); keeps huge Γ values small. */
export interface ScaledFixed {
  mant: Fixed;
  exp2: bigint;
}

/** Above this precision the Taylor table of 1/Γ gets long; the Stirling path is used instead. */
export const TAYLOR_PATH_MAX_BITS = 1300;
/** Arguments up to this size are shifted down to [1/2, 3/2) by the recurrence. */
export const TAYLOR_PATH_MAX_X = 80n;

export function isNonPositiveInteger(x: ExactRational): boolean {
  return x.den === 1n && x.num <= 0n;
}

export function nearestInteger(x: ExactRational): bigint {
  const twice = 2n * x.num + x.den;
  const d = 2n * x.den;
  let q = twice / d;
  if (twice % d !== 0n && twice < 0n) q -= 1n;
  return q;
}

// ---------------------------------------------------------------------------------------------
// Taylor series of 1/Γ(1+t): entire, so |t| ≤ 1/2 converges quickly. Coefficients from
// ln Γ(1+t) = −γt + Σ_{k≥2} (−1)^k ζ(k) t^k / k (DLMF 5.7.3), exponentiated as a power series.

interface TaylorTable {
  bits: number;
  coeffs: Fixed[];
}
const reciprocalGammaTables = new Map<number, TaylorTable>();

export function reciprocalGammaTaylor(bits: number): Fixed[] {
  const cached = reciprocalGammaTables.get(bits);
  if (cached) return cached.coeffs;
  let count = Math.ceil(bits / 4) + 16;
  for (;;) {
    const work = bits + 24;
    const zetas = zetaTableFixed(count, work);
    const logCoeffs: Fixed[] = [0n, eulerGammaFixed(work)];
    for (let k = 2; k <= count; k++) logCoeffs.push((k % 2 === 0 ? -zetas[k] : zetas[k]) / BigInt(k));
    const e: Fixed[] = [one(work)];
    for (let n = 1; n <= count; n++) {
      let s = 0n;
      for (let k = 1; k <= n; k++) s += BigInt(k) * mul(logCoeffs[k], e[n - k], work);
      e.push(s / BigInt(n));
    }
    // keep terms while |E_n|·2^{-n} (the size at |t| = 1/2) exceeds 2^-(bits+4); require a quiet tail
    const negligible = (n: number) => ((e[n] < 0n ? -e[n] : e[n]) >> BigInt(n + work - bits - 4)) === 0n;
    let last = -1;
    for (let n = count; n >= 0; n--) {
      if (!negligible(n)) {
        last = n;
        break;
      }
    }
    if (last <= count - 4) {
      const coeffs = e.slice(0, last + 1).map((c) => changeBits(c, work, bits));
      reciprocalGammaTables.set(bits, { bits, coeffs });
      return coeffs;
    }
    count *= 2;
  }
}

/*
 * Evaluation speed: the table above is re-expanded about CENTRE_COUNT equally spaced centres
 * u0 = (2j+1−C)/(2C) in [−1/2, 1/2], so |t − u0| ≤ 1/(2C) and far fewer terms are needed; the
 * smallest high-order terms are summed in double precision (their total is below 2^-(bits−60),
 * so 53 bits of relative accuracy suffice).
 */
interface CenteredTable {
  coeffs: Fixed[];
  doubles: number[];
  /** Terms from this index up are summed in double precision. */
  splitIndex: number;
}
const CENTRE_COUNT = 8;
const HALF_WIDTH_LOG2 = Math.log2(2 * CENTRE_COUNT); // |v| ≤ 2^-HALF_WIDTH_LOG2
const centredTables = new Map<number, CenteredTable[]>();

function centredReciprocalGamma(bits: number): CenteredTable[] {
  const cached = centredTables.get(bits);
  if (cached) return cached;
  const work = bits + 16;
  const base = reciprocalGammaTaylor(work);
  const tables: CenteredTable[] = [];
  for (let j = 0; j < CENTRE_COUNT; j++) {
    // b_m = Σ_{k≥m} c_k C(k,m) u0^{k−m}
    const u0 = fromRational(BigInt(2 * j + 1 - CENTRE_COUNT), BigInt(2 * CENTRE_COUNT), work);
    const shifted: Fixed[] = [];
    for (let m = 0; m < base.length; m++) {
      let sum = 0n;
      let binomial = 1n;
      let power = one(work);
      for (let k = m; k < base.length; k++) {
        sum += mul(base[k], power, work) * binomial;
        binomial = (binomial * BigInt(k + 1)) / BigInt(k + 1 - m);
        power = mul(power, u0, work);
      }
      shifted.push(sum);
    }
    // drop terms below 2^-(bits+4) at the largest |v| (with room for second derivatives)
    let last = shifted.length - 1;
    const negligible = (m: number) => ((shifted[m] < 0n ? -shifted[m] : shifted[m]) * BigInt((m + 1) * (m + 1))) >> BigInt(Math.floor(HALF_WIDTH_LOG2 * m) + work - bits - 4) === 0n;
    while (last > 0 && negligible(last)) last--;
    const coeffs = shifted.slice(0, last + 1).map((c) => changeBits(c, work, bits));
    const doubles = coeffs.map((c) => fixedToDouble(c, bits));
    let splitIndex = coeffs.length;
    const tailThreshold = 2 ** -(bits - 60);
    while (splitIndex > 1 && Math.abs(doubles[splitIndex - 1]) * (splitIndex * splitIndex) * 2 ** (-HALF_WIDTH_LOG2 * (splitIndex - 1)) < tailThreshold) splitIndex--;
    tables.push({ coeffs, doubles, splitIndex });
  }
  centredTables.set(bits, tables);
  return tables;
}

/**
 * A fixed-point value as a double. `Number(v) / 2 ** bits` overflows to NaN from 1024 bits on, so the
 * mantissa is cut to 64 bits first and the binary exponent applied in two steps.
 */
function fixedToDouble(v: Fixed, bits: number): number {
  if (v === 0n) return 0;
  const shift = Math.max(0, (v < 0n ? -v : v).toString(2).length - 64);
  const exponent = shift - bits;
  const half = Math.trunc(exponent / 2);
  return Number(v >> BigInt(shift)) * 2 ** half * 2 ** (exponent - half);
}

/** A double converted exactly (all 53 bits kept) to fixed point. */
function doubleToFixed(a: number, bits: number): Fixed {
  if (a === 0) return 0n;
  const k = 52 - Math.floor(Math.log2(Math.abs(a)));
  // scale in two steps so neither power of two overflows a double
  const mantissa = BigInt(Math.round(k > 1000 ? a * 2 ** 1000 * 2 ** (k - 1000) : a * 2 ** k));
  return bits >= k ? mantissa << BigInt(bits - k) : mantissa >> BigInt(k - bits);
}

/**
 * 1/Γ(1+t) and its derivatives (up to 2) at t = tNum/den ∈ [−1/2, 1/2]:
 * returns [R, R', R''] (as many as asked), fixed point at `bits`.
 */
export function reciprocalGammaNearOne(tNum: bigint, den: bigint, bits: number, derivatives: number): Fixed[] {
  const index = Math.min(CENTRE_COUNT - 1, Math.max(0, Number(((2n * tNum + den) * BigInt(CENTRE_COUNT)) / (2n * den))));
  const table = centredReciprocalGamma(bits)[index];
  // v = t − u0 = (2C·tNum − (2j+1−C)·den) / (2C·den)
  const twoC = BigInt(2 * CENTRE_COUNT);
  const v = fromRational(twoC * tNum - BigInt(2 * index + 1 - CENTRE_COUNT) * den, twoC * den, bits);
  const vd = fixedToDouble(v, bits);
  const { coeffs, doubles, splitIndex } = table;
  const accD = [0, 0, 0];
  for (let k = doubles.length - 1; k >= splitIndex; k--) {
    for (let d = derivatives; d >= 1; d--) accD[d] = accD[d] * vd + accD[d - 1];
    accD[0] = accD[0] * vd + doubles[k];
  }
  const B = BigInt(bits);
  const acc: Fixed[] = accD.slice(0, derivatives + 1).map((a) => doubleToFixed(a, bits));
  for (let k = splitIndex - 1; k >= 0; k--) {
    for (let d = derivatives; d >= 1; d--) acc[d] = ((acc[d] * v) >> B) + acc[d - 1];
    acc[0] = ((acc[0] * v) >> B) + coeffs[k];
  }
  if (derivatives >= 2) acc[2] *= 2n;
  return acc;
}

// ---------------------------------------------------------------------------------------------
// Stirling series: ln Γ(z) = (z−½)ln z − z + ½ln(2π) + Σ_k B_{2k}/(2k(2k−1) z^{2k−1})  (DLMF 5.11.1)

interface StirlingTable {
  coeffs: Fixed[]; // index k ≥ 1
  log2Abs: number[];
  halfLogTwoPi: Fixed;
}
const stirlingTables = new Map<number, StirlingTable>();

function stirlingTable(bits: number, terms: number): StirlingTable {
  let table = stirlingTables.get(bits);
  if (!table || table.coeffs.length <= terms) {
    const coeffs: Fixed[] = [0n];
    const log2Abs: number[] = [0];
    const size = Math.max(terms + 1, table ? 2 * table.coeffs.length : 32);
    for (let k = 1; k < size; k++) {
      const b = bernoulliEvenUnreduced(2 * k);
      const den = b.den * BigInt(2 * k * (2 * k - 1));
      coeffs.push(fromRational(b.num, den, bits));
      log2Abs.push(log2AbsRational(b.num, den));
    }
    const pi = piFixed(bits + 8);
    const halfLogTwoPi = changeBits(lnFixedPositive(2n * pi, bits + 8) / 2n, bits + 8, bits);
    table = { coeffs, log2Abs, halfLogTwoPi };
    stirlingTables.set(bits, table);
  }
  return table;
}

export function log2AbsRational(num: bigint, den: bigint): number {
  const a = num < 0n ? -num : num;
  const na = a.toString(2).length;
  const nd = den.toString(2).length;
  const sa = Number(a >> BigInt(Math.max(0, na - 53))) * 2 ** 0;
  const sd = Number(den >> BigInt(Math.max(0, nd - 53)));
  return Math.log2(sa) + Math.max(0, na - 53) - Math.log2(sd) - Math.max(0, nd - 53);
}

/** Smallest shift target Z for which the Stirling/Bernoulli series reaches 2^-bits. */
export function asymptoticThreshold(bits: number): number {
  return Math.max(12, Math.ceil(0.25 * bits));
}

/** ln Γ(z) for z ≥ asymptoticThreshold(bits), z given exactly. */
function lnGammaStirling(z: ExactRational, bits: number): Fixed {
  const work = bits + 16;
  const zf = fromRational(z.num, z.den, work);
  const w = fromRational(z.den, z.num, work);
  const w2 = mul(w, w, work);
  const log2z = log2AbsRational(z.num, z.den);
  let terms = 1;
  let table = stirlingTable(work, 64);
  for (;; terms++) {
    if (terms >= table.coeffs.length - 1) table = stirlingTable(work, terms * 2);
    const est = table.log2Abs[terms] - (2 * terms - 1) * log2z;
    if (est < -work) break;
    if (terms > 4 * work) fail('limit', 'Stirling series did not converge');
  }
  let sum = 0n;
  for (let k = terms; k >= 1; k--) sum = mul(sum, w2, work) + table.coeffs[k];
  sum = mul(sum, w, work);
  const lnz = lnFixedPositive(zf, work);
  const half = one(work) >> 1n;
  const value = mul(zf - half, lnz, work) - zf + table.halfLogTwoPi + sum;
  return changeBits(value, work, bits);
}

// ---------------------------------------------------------------------------------------------

/** Γ(x) for exact rational x (not a pole), relative accuracy about 2^-(bits−8). */
export function gammaScaled(x: ExactRational, bits: number): ScaledFixed {
  if (isNonPositiveInteger(x)) fail('pole', `Gamma has a pole at ${x.num}`);
  if (x.num < 0n) return gammaByReflection(x, bits);
  if (2n * x.num < x.den) {
    // Γ(x) = Γ(x+1)/x, dividing by the exact rational keeps relative accuracy for tiny x
    const g = gammaScaled({ num: x.num + x.den, den: x.den }, bits);
    return { mant: (g.mant * x.den) / x.num, exp2: g.exp2 };
  }
  if (x.den === 1n && x.num <= 170n) return { mant: fromInteger(factorial(x.num - 1n), bits), exp2: 0n };
  if (bits <= TAYLOR_PATH_MAX_BITS && x.num <= TAYLOR_PATH_MAX_X * x.den) return gammaByTaylor(x, bits);
  return gammaByStirling(x, bits);
}

function factorial(n: bigint): bigint {
  let f = 1n;
  for (let i = 2n; i <= n; i++) f *= i;
  return f;
}

function gammaByTaylor(x: ExactRational, bits: number): ScaledFixed {
  const work = bits + 8;
  const n = nearestInteger(x);
  const tNum = x.num - n * x.den;
  const [r] = reciprocalGammaNearOne(tNum, x.den, work, 0);
  if (n <= 1n) return { mant: changeBits(div(one(work), r, work), work, bits), exp2: 0n };
  // Γ(1+t+m) = Γ(1+t)·Π_{j=1}^{m}(t+j)
  const unit = one(work);
  const B = BigInt(work);
  let factor = fromRational(tNum, x.den, work) + unit;
  let product = factor;
  for (let j = 2n; j < n; j++) {
    factor += unit;
    product = (product * factor) >> B;
  }
  return { mant: changeBits(div(product, r, work), work, bits), exp2: 0n };
}

function gammaByStirling(x: ExactRational, bits: number): ScaledFixed {
  const work = bits + 16;
  const threshold = BigInt(asymptoticThreshold(work));
  let shift = 0n;
  if (x.num < threshold * x.den) shift = threshold - x.num / x.den;
  const z = { num: x.num + shift * x.den, den: x.den };
  const [m, e] = expFixedSplit(lnGammaStirling(z, work), work);
  let mant = m;
  let exp2 = e;
  if (shift > 0n) {
    const unit = one(work);
    const xf = fromRational(x.num, x.den, work);
    let product = unit;
    for (let j = 0n; j < shift; j++) product = mul(product, xf + j * unit, work);
    // divide by the normalised product, moving its binary magnitude into the exponent
    const magnitude = BigInt(product.toString(2).length - 1 - work);
    mant = div(mant, magnitude > 0n ? product >> magnitude : product, work);
    if (magnitude > 0n) exp2 -= magnitude;
  }
  return { mant: changeBits(mant, work, bits), exp2 };
}

/** Γ(x) = π / (sin(πx)·Γ(1−x))  (DLMF 5.5.3). */
function gammaByReflection(x: ExactRational, bits: number): ScaledFixed {
  const work = bits + bitsNearInteger(x) + 8;
  const g = normalised(gammaScaled({ num: x.den - x.num, den: x.den }, work), work);
  const { sin } = sinCosPi(x, work);
  const mant = div(piFixed(work), mul(sin, g.mant, work), work);
  return { mant: changeBits(mant, work, bits), exp2: -g.exp2 };
}

/** Move the binary magnitude of the mantissa into the exponent (mant ∈ [1,2)·2^bits). */
function normalised(v: ScaledFixed, bits: number): ScaledFixed {
  const shift = v.mant.toString(2).length - 1 - bits;
  if (shift <= 0) return v;
  return { mant: v.mant >> BigInt(shift), exp2: v.exp2 + BigInt(shift) };
}

/** ln Γ(x) for x > 0. */
export function lnGammaFixed(x: ExactRational, bits: number): Fixed {
  if (x.num <= 0n) fail('domain', 'lngamma is provided for x > 0');
  if (x.den === 1n && (x.num === 1n || x.num === 2n)) return 0n;
  const work = bits + 8;
  const large = x.num > TAYLOR_PATH_MAX_X * x.den || work > TAYLOR_PATH_MAX_BITS;
  if (large && x.num >= BigInt(asymptoticThreshold(work)) * x.den) return changeBits(lnGammaStirling(x, work), work, bits);
  const g = gammaScaled(x, work);
  const value = lnFixedPositive(g.mant, work) + g.exp2 * ln2Fixed(work);
  return changeBits(value, work, bits);
}
