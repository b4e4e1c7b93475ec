import { type ExpansionContext, numericContext, symbolicContext } from '../integrals';
import { type Real, GUARD_DIGITS, fail, realContext } from '../precision';
import { type Affine, type Poly, type Q, Expression, affineConstant, affineParameter, polyConstantValue, ratFromPoly } from '../symbolic';

/**
 * Where series coefficients live: numbers at a given s (N numeric), or exact symbolic expressions
 * (s and/or N symbolic; a given s then enters as an exact rational).
 */
export interface Calculus<C> {
  readonly ctx: ExpansionContext<C>;
  readonly symbolic: boolean;
  /** s as it enters the integrals: the parameter "s" or a rational constant. */
  readonly s: Affine;
  readonly sValue: Q | null;
  /** Working digits (numeric mode). */
  readonly digits: number;
  fromPoly(p: Poly): C;
  /** True when a numeric coefficient is zero up to rounding (exact test symbolically). */
  isNegligible(c: C): boolean;
}

export function numericCalculus(s: Q, digits: number): Calculus<Real> {
  const work = digits + GUARD_DIGITS + 8;
  const ctx = numericContext({}, work);
  const R = realContext(work);
  const tolerance = new R(10).pow(-(work - 8));
  return {
    ctx,
    symbolic: false,
    s: affineConstant(s),
    sValue: s,
    digits: work,
    fromPoly: (p) => {
      const c = polyConstantValue(p);
      if (!c) return fail('invalid', 'numeric coefficients need a numeric N');
      return ctx.ring.fromRational(c.num, c.den);
    },
    isNegligible: (c) => c.abs().lte(tolerance),
  };
}

export function symbolicCalculus(s: Q | null): Calculus<Expression> {
  const ctx = symbolicContext();
  return {
    ctx,
    symbolic: true,
    s: s ? affineConstant(s) : affineParameter('s'),
    sValue: s,
    digits: 0,
    fromPoly: (p) => Expression.ratfunc(ratFromPoly(p)),
    isNegligible: (c) => c.isZero(),
  };
}
