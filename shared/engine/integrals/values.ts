import { type Real } from '../precision';
import { type CoefficientRing, numericRing } from '../series';
import { gamma, polygamma, tetrahedronPeriod } from '../special';
import { type Affine, type Expression, type Q, evaluateAffine, gammaExpr, isConstantAffine, psiExpr, qToString, symbolicRing, tetrahedronExpr } from '../symbolic';

/** Where Γ(x) and ψ^(k)(x) come from: numbers at a parameter point, or canonical symbols. */
export interface ExpansionContext<C> {
  ring: CoefficientRing<C>;
  gamma(x: Affine): C;
  psi(k: number, x: Affine): C;
  /** P(x), the period of the non-reducible three-loop graph (special/tetrahedron.ts). */
  tetrahedron(x: Affine): C;
  /** Substitute parameter values (numeric mode); symbolic mode returns x unchanged. */
  resolve(x: Affine): Affine;
}

export function symbolicContext(): ExpansionContext<Expression> {
  return { ring: symbolicRing(), gamma: gammaExpr, psi: psiExpr, tetrahedron: tetrahedronExpr, resolve: (x) => x };
}

/** Numeric mode at parameter values `at` (exact rationals); coefficients carry `workingDigits`. */
export function numericContext(at: Readonly<Record<string, Q>>, workingDigits: number): ExpansionContext<Real> {
  const cache = new Map<string, Real>();
  const point = (x: Affine): Q => {
    const value = evaluateAffine(x, at);
    return value;
  };
  const memo = (key: string, compute: () => Real) => {
    let v = cache.get(key);
    if (!v) {
      v = compute();
      cache.set(key, v);
    }
    return v;
  };
  return {
    ring: numericRing(workingDigits),
    gamma: (x) => {
      const p = point(x);
      return memo(`g:${qToString(p)}`, () => gamma(p, workingDigits));
    },
    psi: (k, x) => {
      const p = point(x);
      return memo(`p${k}:${qToString(p)}`, () => polygamma(k, p, workingDigits));
    },
    tetrahedron: (x) => {
      const p = point(x);
      return memo(`t:${qToString(p)}`, () => tetrahedronPeriod(p, workingDigits));
    },
    resolve: (x) => {
      if (isConstantAffine(x)) return x;
      const v = point(x);
      return { constant: v, terms: [] };
    },
  };
}
