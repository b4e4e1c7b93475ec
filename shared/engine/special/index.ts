import { type ExactRational, type Fixed, type Real, type RealInput, MAX_DIGITS, MIN_DIGITS, bitsForDigits, fail, fixedToReal, rationalToReal, toExactRational } from '../precision';
import { withRelativeAccuracy } from './accuracy';
import { bernoulliExact } from './bernoulli';
import { catalanFixed, eulerGammaFixed, ln2Fixed, piFixed } from './constants';
import { type BigFloat } from './float';
import { gammaScaled, gammaSignOf, lnGammaFixed } from './gamma';
import { polygammaFixed, polygammaFloat, polygammaUsesFixedPoint } from './polygamma';
import { zetaIntegerFixed, zetaRealFixed } from './zeta';
import { zetaNegativeFloat } from './zeta-negative';

export { bernoulliExact } from './bernoulli';
export { zetaEvenRationalFactor } from './zeta';
export { type TetrahedronResult, tetrahedronPeriod, tetrahedronPeriodWithBound } from './tetrahedron';

/** Guard bits every public function adds on entry (results are rounded to `digits` on exit). */
const GUARD_BITS = 20;
const GAMMA_GUARD_BITS = 12;

function checkDigits(digits: number): void {
  if (!Number.isInteger(digits) || digits < 1 || digits > MAX_DIGITS + 200) fail('limit', `digits must be an integer from 1 to ${MAX_DIGITS + 200} (jobs take ${MIN_DIGITS} to ${MAX_DIGITS}; the rest is room for guard digits)`);
}

function relative(digits: number, kernel: (bits: number) => Fixed): Real {
  checkDigits(digits);
  const target = bitsForDigits(digits, 4);
  const { value, bits } = withRelativeAccuracy(target, target + GUARD_BITS, kernel);
  return fixedToReal(value, bits, digits);
}

/**
 * Decimal inputs arrive as num/10^k; common factors 2 and 5 are removed (7.25 → 29/4, −2.5 → −5/2), so
 * the kernels see small fractions and spot half-integers. Cheaper than a gcd on every call.
 */
function exact(x: RealInput | ExactRational): ExactRational {
  const r = toExactRational(x);
  let { num, den } = r;
  if (den === 1n) return r;
  while ((num & 1n) === 0n && (den & 1n) === 0n) {
    num >>= 1n;
    den >>= 1n;
  }
  while (num % 5n === 0n && den % 5n === 0n) {
    num /= 5n;
    den /= 5n;
  }
  return { num, den };
}

/** Γ(x) for real x; poles (x = 0, −1, −2, …) raise an EngineError with code 'pole'. */
export function gamma(x: RealInput | ExactRational, digits: number): Real {
  checkDigits(digits);
  // Γ never cancels (no zeros), so no retry margin is needed: fewer guard bits than `relative`
  const bits = bitsForDigits(digits, 4) + GAMMA_GUARD_BITS;
  const g = gammaScaled(exact(x), bits);
  return fixedToReal(g.mant, bits, digits, g.exp2);
}

/** ln|Γ(x)| for real x that is not a pole (x = 0, −1, −2, … raise 'pole'); the sign is `gammaSign`. */
export function lnGamma(x: RealInput | ExactRational, digits: number): Real {
  const r = exact(x);
  if (r.den === 1n && (r.num === 1n || r.num === 2n)) return rationalToReal({ num: 0n, den: 1n }, digits);
  return relative(digits, (bits) => lnGammaFixed(r, bits));
}

/** Sign of Γ(x) (1 or −1) for real x that is not a pole: Γ(x) = gammaSign(x)·exp(lnGamma(x)). */
export function gammaSign(x: RealInput | ExactRational): 1 | -1 {
  return gammaSignOf(exact(x));
}

function floatToReal(v: BigFloat, digits: number): Real {
  return fixedToReal(v.man, 0, digits, BigInt(v.exp));
}

/** ψ^(n)(x): n = 0 digamma, n = 1 trigamma, …; every order n ≥ 0 (the job layer caps it). */
export function polygamma(n: number, x: RealInput | ExactRational, digits: number): Real {
  const r = exact(x);
  checkDigits(digits);
  const target = bitsForDigits(digits, 4);
  if (!Number.isInteger(n) || n < 0 || polygammaUsesFixedPoint(n, r, target + GUARD_BITS)) return relative(digits, (bits) => polygammaFixed(n, r, bits));
  return floatToReal(polygammaFloat(n, r, target + GUARD_BITS), digits);
}

export const digamma = (x: RealInput | ExactRational, digits: number): Real => polygamma(0, x, digits);
export const trigamma = (x: RealInput | ExactRational, digits: number): Real => polygamma(1, x, digits);

/** Negative odd integers up to this size get ζ(−n) = −B_{n+1}/(n+1) exactly (DLMF 25.6.3). */
const EXACT_NEGATIVE_ZETA_MAX = 400n;

/** Riemann ζ(x) for every real x ≠ 1 (x = 1 raises 'pole'); exactly 0 at −2, −4, … */
export function zeta(x: RealInput | ExactRational, digits: number): Real {
  const r = exact(x);
  checkDigits(digits);
  if (r.num === r.den) fail('pole', 'zeta has a pole at x = 1');
  if (r.num === 0n) return rationalToReal({ num: -1n, den: 2n }, digits);
  if (r.num > 0n) return relative(digits, (bits) => zetaRealFixed(r, bits));
  if (r.den === 1n && -r.num <= EXACT_NEGATIVE_ZETA_MAX && r.num % 2n !== 0n) {
    const b = bernoulliExact(Number(1n - r.num));
    return rationalToReal({ num: -b.num, den: b.den * (1n - r.num) }, digits);
  }
  return floatToReal(zetaNegativeFloat(r, bitsForDigits(digits, 4) + GUARD_BITS), digits);
}

export function zetaInteger(n: number, digits: number): Real {
  return relative(digits, (bits) => zetaIntegerFixed(n, bits));
}

export const pi = (digits: number): Real => relative(digits, piFixed);
export const ln2 = (digits: number): Real => relative(digits, ln2Fixed);
export const eulerGamma = (digits: number): Real => relative(digits, eulerGammaFixed);
export const catalan = (digits: number): Real => relative(digits, catalanFixed);

export function bernoulli(n: number, digits: number): Real {
  return rationalToReal(bernoulliExact(n), digits);
}
