import { fail } from '../precision';
import { type CoefficientRing } from '../series';
import { log2Expr } from './canonical';
import { Expression } from './expression';
import { q } from './rational';

/** Exact symbolic coefficients; exp/log exist only where the result stays in the atom algebra. */
export function symbolicRing(): CoefficientRing<Expression> {
  return {
    kind: 'symbolic',
    zero: () => Expression.rational(q(0)),
    one: () => Expression.rational(q(1)),
    fromRational: (num, den = 1n) => Expression.rational(q(num, den)),
    add: (a, b) => a.add(b),
    sub: (a, b) => a.sub(b),
    mul: (a, b) => a.mul(b),
    neg: (a) => a.neg(),
    scale: (a, num, den = 1n) => a.scale(q(num, den)),
    inverse: (a) => a.inverse(),
    isZero: (a) => a.isZero(),
    exp: (a) => {
      if (a.isZero()) return Expression.rational(q(1));
      return fail('not-representable', 'exp of a non-zero symbolic constant');
    },
    log: (a) => {
      const r = a.rationalValue();
      if (r && r.num > 0n && r.den === 1n && (r.num & (r.num - 1n)) === 0n) return log2Expr().scale(q(r.num.toString(2).length - 1));
      return fail('not-representable', 'log of a symbolic constant other than a power of 2');
    },
    powRational: (a, num, den) => a.pow(q(num, den)),
  };
}
