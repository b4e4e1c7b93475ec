import Decimal from 'decimal.js';
import { fail } from './errors';
import { type ExactRational, type Fixed, bitLength } from './fixed';
import { JOB_LIMITS } from '../../jobs/contract/limits';

/**
 * The engine's one public number type: an arbitrary-precision decimal (decimal.js instance).
 * Internally the special functions work in binary fixed point; values cross the boundary only
 * through `toExactRational` (inputs, exact) and `fixedToReal` (outputs, rounded to `digits`).
 */
export type Real = Decimal;
export type RealInput = Real | string | number | bigint;

/** The digits a job may ask for: the contract's limits, stated once there. */
export const MIN_DIGITS = JOB_LIMITS.minDigits;
export const MAX_DIGITS = JOB_LIMITS.maxDigits;
/** Decimal guard digits carried by numeric series arithmetic. */
export const GUARD_DIGITS = 12;

const contexts = new Map<number, typeof Decimal>();

/** A decimal.js constructor rounding every operation to `digits` significant digits. */
export function realContext(digits: number): typeof Decimal {
  let ctx = contexts.get(digits);
  if (!ctx) {
    ctx = Decimal.clone({ precision: digits, rounding: Decimal.ROUND_HALF_EVEN, toExpNeg: -7, toExpPos: 21, maxE: 9e15, minE: -9e15 });
    contexts.set(digits, ctx);
  }
  return ctx;
}

/** Bits of binary precision that carry `digits` decimal digits plus guard bits. */
export function bitsForDigits(digits: number, guardBits = 24): number {
  return Math.ceil(digits * 3.321928094887362) + guardBits;
}

export function toReal(x: RealInput, digits = MAX_DIGITS + GUARD_DIGITS): Real {
  const ctx = realContext(digits);
  if (typeof x === 'bigint') return new ctx(x.toString());
  return new ctx(x as Decimal.Value);
}

const DECIMAL_PATTERN = /^([+-]?)(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?$/;
const PLAIN_DECIMAL = /^(-?)(\d+)\.(\d+)$/;

const powersOfTen: bigint[] = [1n];
/** 10^k as a BigInt, cached (conversions need the same few powers over and over). */
export function powerOfTen(k: number): bigint {
  while (powersOfTen.length <= Math.min(k, 4096)) powersOfTen.push(powersOfTen[powersOfTen.length - 1] * 10n);
  return k < powersOfTen.length ? powersOfTen[k] : 10n ** BigInt(k);
}

/**
 * The exact rational value of a finite decimal (string, number or Real). Fractions keep the
 * denominator 10^k with a non-zero last digit, so integers (and only integers) have den = 1.
 */
export function toExactRational(x: RealInput | ExactRational): ExactRational {
  if (typeof x === 'object' && x !== null && 'num' in x && 'den' in x) return x;
  if (typeof x === 'bigint') return { num: x, den: 1n };
  const text = typeof x === 'number' ? numberToDecimalString(x) : typeof x === 'string' ? x.trim() : (x as Decimal).toFixed();
  const plain = PLAIN_DECIMAL.exec(text);
  if (plain) return plainDecimal(plain[1], plain[2], plain[3]);
  const m = DECIMAL_PATTERN.exec(text);
  if (!m || (m[2] === '' && (m[3] === undefined || m[3] === ''))) fail('invalid', `not a decimal number: ${JSON.stringify(text).slice(0, 60)}`);
  const [, sign, intPart, fracPart = '', expPart = '0'] = m;
  const exponent = Number(expPart) - fracPart.length;
  if (!Number.isSafeInteger(exponent) || Math.abs(exponent) > 100000) fail('invalid', 'decimal exponent out of range');
  let num = BigInt((intPart || '0') + fracPart);
  if (sign === '-') num = -num;
  return exponent >= 0 ? { num: num * powerOfTen(exponent), den: 1n } : reduce(num, powerOfTen(-exponent));
}

function plainDecimal(sign: string, intPart: string, fracPart: string): ExactRational {
  let end = fracPart.length;
  while (end > 0 && fracPart.charCodeAt(end - 1) === 48) end--;
  const frac = fracPart.slice(0, end);
  const magnitude = BigInt(intPart + frac);
  return { num: sign === '-' ? -magnitude : magnitude, den: powerOfTen(frac.length) };
}

function numberToDecimalString(x: number): string {
  if (!Number.isFinite(x)) fail('invalid', `not a finite number: ${x}`);
  return x.toString();
}

export function gcd(a: bigint, b: bigint): bigint {
  if (a < 0n) a = -a;
  if (b < 0n) b = -b;
  while (b !== 0n) [a, b] = [b, a % b];
  return a;
}

export function reduce(num: bigint, den: bigint): ExactRational {
  if (den === 0n) fail('domain', 'division by zero');
  if (den < 0n) {
    num = -num;
    den = -den;
  }
  const g = gcd(num, den);
  return g > 1n ? { num: num / g, den: den / g } : { num, den };
}

const LOG10_2 = 0.30102999566398120;

/** Bit length, estimated through a double when the value fits (off by at most one). */
function approximateBitLength(v: bigint): number {
  const n = Number(v);
  if (n < 1e300) return n < 1 ? 0 : Math.floor(Math.log2(n)) + 1;
  return bitLength(v);
}

/**
 * Round a fixed-point value to a Real with `digits` significant digits.
 * `scaleExponent2` multiplies the value by 2^scaleExponent2 first (used for huge Γ values).
 */
export function fixedToReal(v: Fixed, bits: number, digits: number, scaleExponent2 = 0n): Real {
  const ctx = realContext(digits);
  if (v === 0n) return new ctx(0);
  const negative = v < 0n;
  const magnitude = negative ? -v : v;
  if (scaleExponent2 < 0n && scaleExponent2 > -100000n) return fixedToReal(v, bits - Number(scaleExponent2), digits);
  if (scaleExponent2 > 0n && scaleExponent2 < 100000n) return fixedToReal(v << scaleExponent2, bits, digits);
  if (scaleExponent2 !== 0n) {
    const big = realContext(digits + 10);
    const mant = fixedToReal(magnitude, bits, digits + 8);
    const scaled = new big(mant).times(new big(2).pow(new big(scaleExponent2.toString())));
    return new ctx(negative ? scaled.neg() : scaled).toSignificantDigits(digits);
  }
  const binaryExponent = approximateBitLength(magnitude) - bits;
  const decimalExponent = Math.floor(binaryExponent * LOG10_2);
  const shift = digits + 3 - decimalExponent;
  let scaled = shift >= 0 ? roundShift(magnitude * powerOfTen(shift), bits) : roundShift(magnitude / powerOfTen(-shift), bits);
  let exponent = -shift;
  // keep exactly `digits` significant digits, rounding half up on the integer
  let text = scaled.toString();
  const extra = text.length - digits;
  if (extra > 0) {
    const unit = powerOfTen(extra);
    scaled = (scaled + unit / 2n) / unit;
    exponent += extra;
    text = scaled.toString();
    if (text.length > digits) {
      text = text.slice(0, digits);
      exponent += 1;
    }
  }
  return new ctx(`${negative ? '-' : ''}${text}e${exponent}`);
}

function roundShift(v: bigint, bits: number): bigint {
  const b = BigInt(bits);
  return (v + (1n << (b - 1n))) >> b;
}

export function rationalToReal(r: ExactRational, digits: number): Real {
  const ctx = realContext(digits);
  return new ctx(r.num.toString()).div(r.den.toString());
}
