import type Decimal from 'decimal.js';
import { type Real, fail, realContext } from '../precision';
import { type CoefficientRing } from './ring';

/** Coefficients as Reals rounded to `workingDigits` significant digits after every operation. */
export function numericRing(workingDigits: number): CoefficientRing<Real> {
  const R = realContext(workingDigits);
  const make = (v: Decimal.Value | Real): Real => new R(v as Decimal.Value);
  return {
    kind: 'numeric',
    zero: () => make(0),
    one: () => make(1),
    fromRational: (num, den = 1n) => (den === 1n ? make(num.toString()) : make(num.toString()).div(den.toString())),
    add: (a, b) => make(a).plus(b),
    sub: (a, b) => make(a).minus(b),
    mul: (a, b) => make(a).times(b),
    neg: (a) => make(a).neg(),
    scale: (a, num, den = 1n) => (den === 1n ? make(a).times(num.toString()) : make(a).times(num.toString()).div(den.toString())),
    inverse: (a) => {
      if (a.isZero()) fail('domain', 'division by a zero coefficient');
      return make(1).div(a);
    },
    isZero: (a) => a.isZero(),
    exp: (a) => make(a).exp(),
    log: (a) => {
      if (!a.isPositive()) fail('domain', 'logarithm of a non-positive coefficient');
      return make(a).ln();
    },
    powRational: (a, num, den) => {
      if (den === 1n) return make(a).pow(num.toString());
      if (!a.isPositive()) fail('domain', 'fractional power of a non-positive coefficient');
      return make(a).pow(make(num.toString()).div(den.toString()));
    },
  };
}
