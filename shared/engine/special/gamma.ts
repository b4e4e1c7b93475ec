import { type ExactRational, type Fixed, changeBits, div, fail, fromRational, mul, one, sqrt } from '../precision';
import { CoefficientCache, hornerInverseSquare, log2AbsBernoulli, log2AbsRational, requireTerms, termsForBudget } from './asymptotic';
import { bernoulliEvenUnreduced } from './bernoulli';
import { cachedConstant, eulerGammaFixed, ln2Fixed, piFixed } from './constants';
import { expFixedSplit, lnFixedPositive, lnRational } from './elementary';
import { type BigFloat, bitLen, floatDiv, floatFromInteger, floatFromRational, floatMul, trim } from './float';
import { bitsNearInteger, sinPi } from './trigonometric';
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

const stirlingCoefficients = new CoefficientCache(
  (k) => {
    const b = bernoulliEvenUnreduced(2 * k);
    return { num: b.num, den: b.den * BigInt(2 * k * (2 * k - 1)) };
  },
  (k) => log2AbsBernoulli(k) - Math.log2(2 * k * (2 * k - 1)),
);

const halfLnTwoPi = cachedConstant((bits) => lnFixedPositive(2n * piFixed(bits), bits) / 2n);
const sqrtPi = cachedConstant((bits) => sqrt(piFixed(bits), bits));

/**
 * Shift target for the asymptotic series at `bits`: with z ≥ 0.4·bits the smallest Stirling term is
 * far below 2^-bits and a few hundred terms suffice at 1000 digits (fewer terms cost more shift).
 */
export function asymptoticThreshold(bits: number): number {
  return Math.max(12, Math.ceil(0.4 * bits));
}

/** ln Γ(z) for z = P/Q ≥ asymptoticThreshold(bits), absolute error a few units of 2^-bits. */
function lnGammaStirling(P: bigint, Q: bigint, bits: number): Fixed {
  const work = bits + 8;
  const log2z = log2AbsRational(P, Q);
  const terms = requireTerms(termsForBudget(stirlingCoefficients, log2z, -work - 6, -1));
  const series = hornerInverseSquare(stirlingCoefficients, terms, P, Q, work);
  const sum = (series * Q) / P;
  // (z−½)·ln z needs ln z to log2(z) more bits
  const lnBits = work + Math.max(0, Math.ceil(log2z)) + 2;
  const lnz = lnRational(P, Q, lnBits);
  const main = changeBits((lnz * (2n * P - Q)) / (2n * Q), lnBits, work);
  const value = main - fromRational(P, Q, work) + halfLnTwoPi(work) + sum;
  return changeBits(value, work, bits);
}

/** Π_{j=lo}^{hi−1} (a + j·d) by binary splitting (small factors are multiplied as doubles first). */
export function arithmeticProduct(a: bigint, d: bigint, lo: bigint, hi: bigint): bigint {
  if (hi <= lo) return 1n;
  const largest = a + (hi - 1n) * d;
  const limit = 1n << 26n;
  if (a > -limit && a < limit && largest > -limit && largest < limit && d > 0n) return smallArithmeticProduct(Number(a), Number(d), Number(lo), Number(hi));
  if (hi - lo <= 8n) {
    let p = 1n;
    for (let j = lo; j < hi; j++) p *= a + j * d;
    return p;
  }
  const mid = (lo + hi) >> 1n;
  return arithmeticProduct(a, d, lo, mid) * arithmeticProduct(a, d, mid, hi);
}

/** The same product when every |factor| is below 2^26: pairs of factors fit a double exactly. */
function smallArithmeticProduct(a: number, d: number, lo: number, hi: number): bigint {
  const words: bigint[] = [];
  let word = 1;
  for (let j = lo; j < hi; j++) {
    const factor = a + j * d;
    if (Math.abs(word * factor) >= 2 ** 53) {
      words.push(BigInt(word));
      word = factor;
    } else word *= factor;
  }
  words.push(BigInt(word));
  return productTree(words, 0, words.length);
}

function productTree(values: bigint[], lo: number, hi: number): bigint {
  if (hi - lo === 1) return values[lo];
  const mid = (lo + hi) >> 1;
  return productTree(values, lo, mid) * productTree(values, mid, hi);
}

/** Largest exact product (in bits) formed for the recurrence Γ(x) = Γ(x+N)/Π(x+j); beyond it, floats. */
const EXACT_PRODUCT_MAX_BITS = 1 << 20;

/** Π_{j<N} (x+j) for x = P0/Q as a float with `prec` bits. */
function risingFactorial(P0: bigint, Q: bigint, N: bigint, prec: number): BigFloat {
  if (N === 0n) return { man: 1n, exp: 0 };
  const last = P0 + (N - 1n) * Q;
  const estimate = Number(N) * Math.max(bitLen(last), 1) + Number(N) * bitLen(Q);
  if (estimate <= EXACT_PRODUCT_MAX_BITS) {
    const num = floatFromInteger(arithmeticProduct(P0, Q, 0n, N), prec + 8);
    const den = isPowerOfTwo(Q) ? { man: 1n, exp: (bitLen(Q) - 1) * Number(N) } : floatFromInteger(Q ** N, prec + 8);
    return floatDiv(num, den, prec);
  }
  let acc: BigFloat = { man: 1n, exp: 0 };
  for (let j = 0n; j < N; j++) acc = floatMul(acc, floatFromRational(P0 + j * Q, Q, prec + 8), prec + 8);
  return trim(acc, prec);
}

function isPowerOfTwo(n: bigint): boolean {
  return (n & (n - 1n)) === 0n;
}

/**
 * At Stirling-path precisions a moderately negative x is shifted up like a positive one: the exact
 * product Π(x+j) then carries the sign and the nearness to the poles, and no sin(πx) is needed.
 */
export function usesShiftOnNegativeAxis(x: ExactRational, bits: number): boolean {
  return bits > TAYLOR_PATH_MAX_BITS && -x.num <= BigInt(asymptoticThreshold(bits)) * x.den;
}

/** Upward shift N so that x + N reaches the asymptotic threshold. */
function shiftFor(x: ExactRational, bits: number): bigint {
  const threshold = BigInt(asymptoticThreshold(bits));
  return x.num < threshold * x.den ? threshold - x.num / x.den : 0n;
}

/** Γ(x) = exp(ln Γ(x+N))/Π_{j<N}(x+j) (DLMF 5.5.1), with the Stirling series at x + N. */
function gammaByStirling(x: ExactRational, bits: number): ScaledFixed {
  const work = bits + 16;
  const N = shiftFor(x, work);
  const [m, e] = expFixedSplit(lnGammaStirling(x.num + N * x.den, x.den, work), work);
  const value = floatDiv({ man: m, exp: Number(e) - work }, risingFactorial(x.num, x.den, N, work), work);
  return scaledFromFloat(value, bits);
}

function scaledFromFloat(v: BigFloat, bits: number): ScaledFixed {
  const shift = bitLen(v.man) - 1 - bits;
  const mant = shift >= 0 ? v.man >> BigInt(shift) : v.man << BigInt(-shift);
  return { mant, exp2: BigInt(v.exp + shift + bits) };
}

/** Γ(k+½) = √π·(2k−1)!!/2^k (DLMF 5.4.6) and Γ(½−k) = √π·(−2)^k/(2k−1)!! (with DLMF 5.5.3). */
function gammaHalfInteger(x: ExactRational, bits: number): ScaledFixed {
  const work = bits + 8;
  const k = x.num > 0n ? (x.num - 1n) / 2n : (1n - x.num) / 2n;
  const doubleFactorial = floatFromInteger(arithmeticProduct(1n, 2n, 0n, k), work);
  const root: BigFloat = { man: sqrtPi(work), exp: -work };
  const value = x.num > 0n ? floatMul(root, doubleFactorial, work) : floatDiv(root, doubleFactorial, work);
  const scaled = scaledFromFloat(value, bits);
  const negative = x.num < 0n && k % 2n === 1n;
  return { mant: negative ? -scaled.mant : scaled.mant, exp2: scaled.exp2 + (x.num > 0n ? -k : k) };
}

/** Half-integers and integers up to this size are computed exactly (products by binary splitting). */
const EXACT_ARGUMENT_MAX = 4000n;

// ---------------------------------------------------------------------------------------------

/** Γ(x) for exact rational x (not a pole), relative accuracy about 2^-(bits−8). */
export function gammaScaled(x: ExactRational, bits: number): ScaledFixed {
  if (isNonPositiveInteger(x)) fail('pole', `Gamma has a pole at ${x.num}`);
  if (x.den === 2n && (x.num < 0n ? -x.num : x.num) <= 2n * EXACT_ARGUMENT_MAX) return gammaHalfInteger(x, bits);
  if (x.num < 0n) return usesShiftOnNegativeAxis(x, bits) ? gammaByStirling(x, bits) : gammaByReflection(x, bits);
  if (x.den === 1n && x.num <= EXACT_ARGUMENT_MAX) return scaledFromFloat(floatFromInteger(arithmeticProduct(1n, 1n, 0n, x.num - 1n), bits + 8), bits);
  if (bits <= TAYLOR_PATH_MAX_BITS && x.num <= TAYLOR_PATH_MAX_X * x.den) {
    if (2n * x.num >= x.den) return gammaByTaylor(x, bits);
    // Γ(x) = Γ(x+1)/x, dividing by the exact rational keeps relative accuracy for tiny x
    const g = gammaByTaylor({ num: x.num + x.den, den: x.den }, bits);
    return { mant: (g.mant * x.den) / x.num, exp2: g.exp2 };
  }
  return gammaByStirling(x, bits);
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

/** Γ(x) = π / (sin(πx)·Γ(1−x))  (DLMF 5.5.3). */
function gammaByReflection(x: ExactRational, bits: number): ScaledFixed {
  const work = bits + bitsNearInteger(x) + 8;
  const g = normalised(gammaScaled({ num: x.den - x.num, den: x.den }, work), work);
  const sin = sinPi(x, work);
  const mant = div(piFixed(work), mul(sin, g.mant, work), work);
  return { mant: changeBits(mant, work, bits), exp2: -g.exp2 };
}

/** Move the binary magnitude of the mantissa into the exponent (mant ∈ [1,2)·2^bits). */
function normalised(v: ScaledFixed, bits: number): ScaledFixed {
  const shift = bitLen(v.mant) - 1 - bits;
  if (shift <= 0) return v;
  return { mant: v.mant >> BigInt(shift), exp2: v.exp2 + BigInt(shift) };
}

/** Sign of Γ(x) for real x that is not a pole: (−1)^⌈−x⌉ on the negative axis (Γ(x) = Γ(x+1)/x, DLMF 5.5.1). */
export function gammaSignOf(x: ExactRational): 1 | -1 {
  if (isNonPositiveInteger(x)) fail('pole', `Gamma has a pole at ${x.num}`);
  if (x.num > 0n) return 1;
  const ceilOfMinusX = (-x.num + x.den - 1n) / x.den;
  return ceilOfMinusX % 2n === 0n ? 1 : -1;
}

/** ln|Γ(x)| for real x that is not a pole; absolute error a few units of 2^-bits. */
export function lnGammaFixed(x: ExactRational, bits: number): Fixed {
  if (isNonPositiveInteger(x)) fail('pole', `Gamma has a pole at ${x.num}`);
  if (x.den === 1n && (x.num === 1n || x.num === 2n)) return 0n;
  const work = bits + 8;
  if (x.num < 0n && !usesShiftOnNegativeAxis(x, work)) return lnGammaByReflection(x, bits);
  const taylor = work <= TAYLOR_PATH_MAX_BITS && x.num <= TAYLOR_PATH_MAX_X * x.den;
  if (taylor || (x.den === 1n && x.num <= EXACT_ARGUMENT_MAX)) {
    const g = gammaScaled(x, work);
    return changeBits(lnFixedPositive(g.mant, work) + g.exp2 * ln2Fixed(work), work, bits);
  }
  const N = shiftFor(x, work);
  const lnShifted = lnGammaStirling(x.num + N * x.den, x.den, work);
  const product = risingFactorial(x.num, x.den, N, work);
  return changeBits(lnShifted - lnFloat({ man: product.man < 0n ? -product.man : product.man, exp: product.exp }, work), work, bits);
}

/** ln|Γ(x)| = ln π − ln|sin πx| − ln Γ(1−x) for x < 0  (DLMF 5.5.3). */
function lnGammaByReflection(x: ExactRational, bits: number): Fixed {
  const work = bits + bitsNearInteger(x) + 8;
  const sin = sinPi(x, work);
  const lnSin = lnFixedPositive(sin < 0n ? -sin : sin, work);
  const value = lnFixedPositive(piFixed(work), work) - lnSin - lnGammaFixed({ num: x.den - x.num, den: x.den }, work);
  return changeBits(value, work, bits);
}

/** ln v for a positive float, fixed point at `bits`. */
function lnFloat(v: BigFloat, bits: number): Fixed {
  // v = (man/2^L)·2^(exp+L) with L = bitLen(man): the fixed-point argument lies in [1/2, 1)
  const L = bitLen(v.man);
  return lnFixedPositive(changeBits(v.man, L, bits), bits) + BigInt(v.exp + L) * ln2Fixed(bits);
}
