import { type Real, GUARD_DIGITS, fail, rationalToReal, realContext } from '../precision';
import { eulerGamma, gamma, ln2, pi, polygamma, tetrahedronPeriod, zetaInteger } from '../special';
import { evaluateAffine } from './affine';
import { type Atom, type Expression } from './expression';
import { type Q } from './rational';
import { ratEvaluate } from './ratfunc';

/** Numeric value of a symbolic coefficient at exact parameter values, to `digits` working digits. */
export function evaluateExpression(e: Expression, values: Readonly<Record<string, Q>>, digits: number): Real {
  const work = digits + GUARD_DIGITS;
  const R = realContext(work);
  let sum = new R(0);
  for (const t of e.terms.values()) {
    let term = rationalToReal(ratEvaluate(t.coeff, values), work);
    for (const p of t.monomial) {
      const base = evaluateAtom(p.atom, values, work);
      const exponent = p.exponent.den === 1n ? new R(p.exponent.num.toString()) : new R(p.exponent.num.toString()).div(p.exponent.den.toString());
      term = term.times(p.exponent.den === 1n ? base.pow(exponent) : base.abs().pow(exponent));
    }
    sum = sum.plus(term);
  }
  return new (realContext(digits))(sum).toSignificantDigits(digits);
}

/** The value of one atom (ψ, Γ, π, ln 2, γ_E, ζ(n)) at numeric parameter values. */
export function evaluateAtom(a: Atom, values: Readonly<Record<string, Q>>, digits: number): Real {
  switch (a.kind) {
    case 'pi':
      return pi(digits);
    case 'log2':
      return ln2(digits);
    case 'eulergamma':
      return eulerGamma(digits);
    case 'zeta':
      return zetaInteger(a.n, digits);
    case 'psi':
      return polygamma(a.order, evaluateAffine(a.arg, values), digits);
    case 'gamma':
      return gamma(evaluateAffine(a.arg, values), digits);
    case 'tetrahedron':
      return tetrahedronPeriod(evaluateAffine(a.arg, values), digits);
  }
  return fail('invalid', 'unknown atom');
}
