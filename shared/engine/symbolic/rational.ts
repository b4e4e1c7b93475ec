import { type ExactRational, fail, gcd } from '../precision';

/** Exact rationals, always reduced with a positive denominator. */
export type Q = ExactRational;

export const Q0: Q = { num: 0n, den: 1n };
export const Q1: Q = { num: 1n, den: 1n };

export function q(num: bigint | number, den: bigint | number = 1n): Q {
  let n = BigInt(num);
  let d = BigInt(den);
  if (d === 0n) fail('domain', 'division by zero');
  if (d < 0n) {
    n = -n;
    d = -d;
  }
  const g = gcd(n, d);
  return g > 1n ? { num: n / g, den: d / g } : { num: n, den: d };
}

export const qAdd = (a: Q, b: Q): Q => (a.den === b.den ? q(a.num + b.num, a.den) : q(a.num * b.den + b.num * a.den, a.den * b.den));
export const qSub = (a: Q, b: Q): Q => qAdd(a, qNeg(b));
export const qMul = (a: Q, b: Q): Q => q(a.num * b.num, a.den * b.den);
export const qNeg = (a: Q): Q => ({ num: -a.num, den: a.den });
export const qDiv = (a: Q, b: Q): Q => {
  if (b.num === 0n) fail('domain', 'division by zero');
  return q(a.num * b.den, a.den * b.num);
};
export const qIsZero = (a: Q): boolean => a.num === 0n;
export const qIsOne = (a: Q): boolean => a.num === 1n && a.den === 1n;
export const qEquals = (a: Q, b: Q): boolean => a.num === b.num && a.den === b.den;
export const qCompare = (a: Q, b: Q): number => {
  const d = a.num * b.den - b.num * a.den;
  return d < 0n ? -1 : d > 0n ? 1 : 0;
};
export const qIsInteger = (a: Q): boolean => a.den === 1n;

/** ⌊a⌋ */
export function qFloor(a: Q): bigint {
  const f = a.num / a.den;
  return a.num < 0n && f * a.den !== a.num ? f - 1n : f;
}

export function qPowInt(a: Q, n: number): Q {
  if (n < 0) return qPowInt(qDiv(Q1, a), -n);
  return q(a.num ** BigInt(n), a.den ** BigInt(n));
}

export function qToString(a: Q): string {
  return a.den === 1n ? a.num.toString() : `${a.num}/${a.den}`;
}

export function qKey(a: Q): string {
  return qToString(a);
}
