import { type ExactRational, type Fixed } from '../precision/fixed';
import { fail } from '../precision/errors';
import { type Real, type RealInput, MAX_DIGITS, MIN_DIGITS, bitsForDigits, fixedToReal, rationalToReal, toExactRational } from '../precision/real';
import { withRelativeAccuracy } from './accuracy';
import { bernoulliExact } from './bernoulli';
import { catalanFixed, eulerGammaFixed, ln2Fixed, piFixed } from './constants';
import { gammaScaled, lnGammaFixed } from './gamma';
import { polygammaFixed } from './polygamma';
import { zetaIntegerFixed, zetaRealFixed } from './zeta';

export { bernoulliExact } from './bernoulli';
export { zetaEvenRationalFactor } from './zeta';

/** Guard bits every public function adds on entry (results are rounded to `digits` on exit). */
const GUARD_BITS = 20;
const GAMMA_GUARD_BITS = 12;

function checkDigits(digits: number): void {
  if (!Number.isInteger(digits) || digits < 1 || digits > MAX_DIGITS + 200) fail('limit', `digits must be an integer in ${MIN_DIGITS}..${MAX_DIGITS}`);
}

function relative(digits: number, kernel: (bits: number) => Fixed): Real {
  checkDigits(digits);
  const target = bitsForDigits(digits, 4);
  const { value, bits } = withRelativeAccuracy(target, target + GUARD_BITS, kernel);
  return fixedToReal(value, bits, digits);
}

function exact(x: RealInput | ExactRational): ExactRational {
  return toExactRational(x);
}

/** Γ(x) for real x; poles (x = 0, −1, −2, …) raise an EngineError with code 'pole'. */
export function gamma(x: RealInput | ExactRational, digits: number): Real {
  checkDigits(digits);
  // Γ never cancels (no zeros), so no retry margin is needed: fewer guard bits than `relative`
  const bits = bitsForDigits(digits, 4) + GAMMA_GUARD_BITS;
  const g = gammaScaled(exact(x), bits);
  return fixedToReal(g.mant, bits, digits, g.exp2);
}

/** ln Γ(x) for x > 0. */
export function lnGamma(x: RealInput | ExactRational, digits: number): Real {
  const r = exact(x);
  if (r.den === 1n && (r.num === 1n || r.num === 2n)) return rationalToReal({ num: 0n, den: 1n }, digits);
  return relative(digits, (bits) => lnGammaFixed(r, bits));
}

/** ψ^(n)(x): n = 0 digamma, n = 1 trigamma, … */
export function polygamma(n: number, x: RealInput | ExactRational, digits: number): Real {
  const r = exact(x);
  return relative(digits, (bits) => polygammaFixed(n, r, bits));
}

export const digamma = (x: RealInput | ExactRational, digits: number): Real => polygamma(0, x, digits);
export const trigamma = (x: RealInput | ExactRational, digits: number): Real => polygamma(1, x, digits);

/** Riemann ζ(x) for real x > 1. */
export function zeta(x: RealInput | ExactRational, digits: number): Real {
  const r = exact(x);
  return relative(digits, (bits) => zetaRealFixed(r, bits));
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
