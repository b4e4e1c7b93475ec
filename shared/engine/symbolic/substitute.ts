import { fail } from '../precision';
import { coefficientOf } from './affine';
import { type Atom, Expression } from './expression';
import { polyConstant, polyIsZero, polyPow, polySubstitute, polyToString } from './polynomial';
import { type Q, qIsZero, qToString } from './rational';
import { type RatFunc, ratFromPoly, ratInverse, ratMul } from './ratfunc';

/** r with the parameter `name` set to an exact number; a denominator that vanishes there is a pole (EngineError 'domain'). */
export function ratSubstitute(r: RatFunc, name: string, value: Q): RatFunc {
  const at = polyConstant(value);
  let result = ratFromPoly(polySubstitute(r.num, name, at));
  for (const f of r.den.values()) {
    const d = polySubstitute(f.poly, name, at);
    if (polyIsZero(d)) fail('domain', `pole at ${name} = ${qToString(value)}: the denominator ${polyToString(f.poly)} vanishes there`);
    result = ratMul(result, ratInverse(ratFromPoly(polyPow(d, f.power))));
  }
  return result;
}

const dependsOn = (a: Atom, name: string): boolean => (a.kind === 'psi' || a.kind === 'gamma' || a.kind === 'tetrahedron') && !qIsZero(coefficientOf(a.arg, name));

/**
 * e with the parameter `name` set to an exact number, in canonical form. Only rational-function
 * coefficients may depend on it (the symbolic-N families never put N inside ψ or Γ).
 */
export function substituteParameter(e: Expression, name: string, value: Q): Expression {
  return new Expression(
    [...e.terms.values()].map((t) => {
      if (t.monomial.some((p) => dependsOn(p.atom, name))) fail('not-representable', `${name} appears inside a ψ or Γ argument; it cannot be set to a number here`);
      return { coeff: ratSubstitute(t.coeff, name, value), monomial: t.monomial };
    }),
  );
}
