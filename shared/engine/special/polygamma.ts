import { type ExactRational, type Fixed, changeBits, div, fromRational, mul, one } from '../precision/fixed';
import { fail } from '../precision/errors';
import { log2Factorial } from './accuracy';
import { bernoulliEvenUnreduced } from './bernoulli';
import { lnFixedPositive, piFixed } from './constants';
import {
  TAYLOR_PATH_MAX_BITS,
  TAYLOR_PATH_MAX_X,
  asymptoticThreshold,
  isNonPositiveInteger,
  log2AbsRational,
  nearestInteger,
  reciprocalGammaNearOne,
} from './gamma';
import { bitsNearInteger, cotPi } from './trigonometric';

/*
 * Polygamma ψ^(n)(x) for real rational x, every order n ≥ 0. Written here because no JavaScript
 * package offers arbitrary-precision polygamma. Paths:
 *  - n ≤ 1, moderate x and precision: derivatives of the cached Taylor series of 1/Γ(1+t);
 *  - otherwise: shift x upward and use the Bernoulli asymptotic series (DLMF 5.15.8, 5.11.2);
 *  - x < 0: reflection ψ^(n)(1−x) + (−1)^(n+1) ψ^(n)(x) = (−1)^n π d^n/dx^n cot(πx) (DLMF 5.15.6).
 */
export function polygammaFixed(n: number, x: ExactRational, bits: number): Fixed {
  if (!Number.isInteger(n) || n < 0) fail('domain', `polygamma order must be a non-negative integer, got ${n}`);
  if (isNonPositiveInteger(x)) fail('pole', `psi has a pole at ${x.num}`);
  if (x.num < 0n) return polygammaByReflection(n, x, bits);
  const work = bits + magnitudeDeficitBits(n, x) + 8;
  let value: Fixed;
  if (n <= 1 && work <= TAYLOR_PATH_MAX_BITS && x.num <= TAYLOR_PATH_MAX_X * x.den) value = polygammaByTaylor(n, x, work);
  else value = polygammaAsymptotic(n, x, work);
  return changeBits(value, work, bits);
}

/** Extra bits so a fixed-point result much smaller than 1 keeps its relative accuracy. */
function magnitudeDeficitBits(n: number, x: ExactRational): number {
  if (n === 0) return 0;
  const log2x = log2AbsRational(x.num, x.den);
  const estimate = Math.max(log2Factorial(n) - (n + 1) * log2x, log2Factorial(n - 1) - n * log2x);
  return estimate < 0 ? Math.ceil(-estimate) : 0;
}

function polygammaByTaylor(n: number, x: ExactRational, bits: number): Fixed {
  const unit = one(bits);
  if (2n * x.num < x.den) {
    // ψ(x) = ψ(x+1) − 1/x,  ψ'(x) = ψ'(x+1) + 1/x²
    const shifted = polygammaByTaylor(n, { num: x.num + x.den, den: x.den }, bits);
    const inverse = fromRational(x.den, x.num, bits);
    return n === 0 ? shifted - inverse : shifted + mul(inverse, inverse, bits);
  }
  const m = nearestInteger(x);
  const t = fromRational(x.num - m * x.den, x.den, bits);
  const [r0, r1, r2] = reciprocalGammaNearOne(x.num - m * x.den, x.den, bits, n + 1);
  // P(t) = Π_{j=1}^{m−1} (t+j) with derivatives, so Σ 1/(t+j) = P'/P and Σ 1/(t+j)² = (P'/P)² − P''/P
  let p0 = unit;
  let p1 = 0n;
  let p2 = 0n;
  for (let j = 1n; j < m; j++) {
    const factor = t + j * unit;
    p2 = mul(p2, factor, bits) + 2n * p1;
    p1 = mul(p1, factor, bits) + p0;
    p0 = mul(p0, factor, bits);
  }
  const logDerivP = div(p1, p0, bits);
  if (n === 0) return -div(r1, r0, bits) + logDerivP;
  const atOnePlusT = div(mul(r1, r1, bits) - mul(r0, r2, bits), mul(r0, r0, bits), bits);
  return atOnePlusT - (mul(logDerivP, logDerivP, bits) - div(p2, p0, bits));
}

interface AsymptoticCoefficients {
  coeffs: Fixed[]; // index k ≥ 1
  log2Abs: number[];
}
const asymptoticTables = new Map<string, AsymptoticCoefficients>();

/**
 * n = 0: B_{2k}/(2k);  n ≥ 1: B_{2k}·(2k+n−1)!/(2k)!  — the coefficients of w^{2k} in the
 * bracket of ψ^(n)(z) = (−1)^{n+1} w^n [(n−1)! + n!w/2 + Σ_k h_k w^{2k}], w = 1/z.
 */
function asymptoticCoefficients(n: number, bits: number, terms: number): AsymptoticCoefficients {
  const key = `${n}:${bits}`;
  let table = asymptoticTables.get(key);
  if (!table || table.coeffs.length <= terms) {
    const size = Math.max(terms + 1, table ? 2 * table.coeffs.length : 32);
    const coeffs: Fixed[] = [0n];
    const log2Abs: number[] = [0];
    let rising = 1n; // (2k+n−1)!/(2k)!
    for (let k = 1; k < size; k++) {
      const b = bernoulliEvenUnreduced(2 * k);
      let num: bigint;
      let den: bigint;
      if (n === 0) {
        num = b.num;
        den = b.den * BigInt(2 * k);
      } else {
        rising = k === 1 ? fallingRatio(n) : (rising * BigInt(2 * k + n - 2) * BigInt(2 * k + n - 1)) / BigInt((2 * k - 1) * 2 * k);
        num = b.num * rising;
        den = b.den;
      }
      coeffs.push(fromRational(num, den, bits));
      log2Abs.push(log2AbsRational(num, den));
    }
    table = { coeffs, log2Abs };
    asymptoticTables.set(key, table);
  }
  return table;
}

/** (n+1)!/2! ... i.e. (2k+n−1)!/(2k)! at k = 1: (n+1)!/2. */
function fallingRatio(n: number): bigint {
  let f = 1n;
  for (let i = 3n; i <= BigInt(n + 1); i++) f *= i;
  return f;
}

function polygammaAsymptotic(n: number, x: ExactRational, bits: number): Fixed {
  const work = bits + 16;
  const threshold = BigInt(asymptoticThreshold(work) + n);
  const shift = x.num < threshold * x.den ? threshold - x.num / x.den : 0n;
  const z: ExactRational = { num: x.num + shift * x.den, den: x.den };
  let value = n === 0 ? digammaAsymptotic(z, work) : polygammaAsymptoticLarge(n, z, work);
  if (shift > 0n) value -= shiftCorrection(n, x, shift, work);
  return changeBits(value, work, bits);
}

/** (−1)^n n! Σ_{j=0}^{shift−1} (x+j)^{−n−1}: ψ^(n)(x+shift) − ψ^(n)(x). */
function shiftCorrection(n: number, x: ExactRational, shift: bigint, bits: number): Fixed {
  let sum = 0n;
  for (let j = 0n; j < shift; j++) {
    const inverse = fromRational(x.den, x.num + j * x.den, bits);
    sum += powerFixed(inverse, n + 1, bits);
  }
  let nFactorial = 1n;
  for (let i = 2n; i <= BigInt(n); i++) nFactorial *= i;
  return (n % 2 === 0 ? 1n : -1n) * nFactorial * sum;
}

function powerFixed(base: Fixed, exponent: number, bits: number): Fixed {
  let result = one(bits);
  let b = base;
  let e = exponent;
  while (e > 0) {
    if (e & 1) result = mul(result, b, bits);
    e >>= 1;
    if (e > 0) b = mul(b, b, bits);
  }
  return result;
}

function termsNeeded(table: () => AsymptoticCoefficients, log2z: number, budget: number, grow: (k: number) => AsymptoticCoefficients): number {
  let t = table();
  for (let k = 1; ; k++) {
    if (k >= t.coeffs.length - 1) t = grow(2 * k);
    if (t.log2Abs[k] - 2 * k * log2z < budget) return k;
    if (k > 100000) fail('limit', 'asymptotic series did not converge');
  }
}

/** ψ(z) = ln z − 1/(2z) − Σ_k B_{2k}/(2k z^{2k})  (DLMF 5.11.2). */
function digammaAsymptotic(z: ExactRational, bits: number): Fixed {
  const log2z = log2AbsRational(z.num, z.den);
  const grow = (terms: number) => asymptoticCoefficients(0, bits, terms);
  const terms = termsNeeded(() => grow(32), log2z, -bits - 4, grow);
  const { coeffs } = grow(terms);
  const w = fromRational(z.den, z.num, bits);
  const w2 = mul(w, w, bits);
  let sum = 0n;
  for (let k = terms; k >= 1; k--) sum = mul(sum + coeffs[k], w2, bits);
  return lnFixedPositive(fromRational(z.num, z.den, bits), bits) - w / 2n - sum;
}

/** ψ^(n)(z) for n ≥ 1 from the asymptotic bracket (DLMF 5.15.8). */
function polygammaAsymptoticLarge(n: number, z: ExactRational, bits: number): Fixed {
  const log2z = log2AbsRational(z.num, z.den);
  const grow = (terms: number) => asymptoticCoefficients(n, bits, terms);
  const terms = termsNeeded(() => grow(32), log2z, log2Factorial(n - 1) - bits - 4, grow);
  const { coeffs } = grow(terms);
  const w = fromRational(z.den, z.num, bits);
  const w2 = mul(w, w, bits);
  let sum = 0n;
  for (let k = terms; k >= 1; k--) sum = mul(sum + coeffs[k], w2, bits);
  let nMinusOneFactorial = 1n;
  for (let i = 2n; i < BigInt(n); i++) nMinusOneFactorial *= i;
  const unit = one(bits);
  const bracket = nMinusOneFactorial * unit + (BigInt(n) * nMinusOneFactorial * w) / 2n + sum;
  const scaled = (bracket * z.den ** BigInt(n)) / z.num ** BigInt(n);
  return n % 2 === 1 ? scaled : -scaled;
}

const cotDerivativePolynomials: bigint[][] = [[0n, 1n]];

/** d^n/dθ^n cot θ as a polynomial in c = cot θ: C_0 = c, C_{k+1} = −(1+c²)·C_k'(c). */
function cotDerivativePolynomial(n: number): bigint[] {
  while (cotDerivativePolynomials.length <= n) {
    const prev = cotDerivativePolynomials[cotDerivativePolynomials.length - 1];
    const derivative = prev.slice(1).map((c, i) => c * BigInt(i + 1));
    const next: bigint[] = new Array(derivative.length + 2).fill(0n);
    derivative.forEach((c, i) => {
      next[i] -= c;
      next[i + 2] -= c;
    });
    while (next.length > 1 && next[next.length - 1] === 0n) next.pop();
    cotDerivativePolynomials.push(next);
  }
  return cotDerivativePolynomials[n];
}

function polygammaByReflection(n: number, x: ExactRational, bits: number): Fixed {
  const work = bits + bitsNearInteger(x) + Math.ceil(Math.log2(n + 2)) + 8;
  const mirrored = polygammaFixed(n, { num: x.den - x.num, den: x.den }, work);
  const c = cotPi(x, work);
  const poly = cotDerivativePolynomial(n);
  let cotDerivative = 0n;
  for (let i = poly.length - 1; i >= 0; i--) cotDerivative = mul(cotDerivative, c, work) + poly[i] * one(work);
  const pi = piFixed(work);
  let piPower = pi;
  for (let i = 0; i < n; i++) piPower = mul(piPower, pi, work);
  const value = (n % 2 === 0 ? mirrored : -mirrored) - mul(piPower, cotDerivative, work);
  return changeBits(value, work, bits);
}
