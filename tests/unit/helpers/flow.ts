import assert from 'node:assert/strict';
import { onFamily } from '../../../shared/engine/models/index';
import { flowFor } from '../../../shared/engine/flows/index';
import { findFixedPoints } from '../../../shared/engine/fixedpoints/index';
import { exponentSeries } from '../../../shared/engine/exponents/index';
import { type DerivedFlow } from '../../../shared/engine/diagrams/index';
import { Expression, eulerGammaExpr, psiExpr } from '../../../shared/engine/index';
import { affine, affineParameter, type Affine } from '../../../shared/engine/symbolic/affine';
import { type Q, q } from '../../../shared/engine/symbolic/rational';
import { ratFromPoly, ratInverse } from '../../../shared/engine/symbolic/ratfunc';
import { type Poly, polyAdd, polyConstant, polyMul, polyScale, polyVariable } from '../../../shared/engine/symbolic/polynomial';
import { type ModelSpec } from '../../../shared/engine/models/model';

/** A(s) = ψ(1) − 2ψ(s/2) + ψ(s), built here from atoms (docs/physics.md §5). */
export function aOfS(s: Affine = affineParameter('s')): Expression {
  const half = affine(q(0), s.terms.map(([n, c]) => [n, q(c.num, c.den * 2n)] as const));
  const halfS = { constant: q(s.constant.num, s.constant.den * 2n), terms: half.terms };
  return eulerGammaExpr().neg().sub(psiExpr(0, halfS).scale(q(2))).add(psiExpr(0, s));
}

export const N = polyVariable('N');
export const num = (c: number | Q): Poly => polyConstant(typeof c === 'number' ? q(c) : c);
export const lin = (a: number, b: number): Poly => polyAdd(polyScale(N, q(a)), num(b)); // a N + b

/** p1/p2 as a symbolic coefficient. */
export function ratio(p: Poly, den: Poly = num(1), power = 1): Expression {
  let d = num(1);
  for (let i = 0; i < power; i++) d = polyMul(d, den);
  return Expression.ratfunc(ratFromPoly(p)).mulRatFunc(ratInverse(ratFromPoly(d)));
}

export const sExpr = (): Expression => Expression.ratfunc(ratFromPoly(polyVariable('s')));

export function assertExprEqual(actual: Expression, expected: Expression, label: string): void {
  assert.ok(actual.sub(expected).isZero(), `${label}: got ${String(actual.terms.size)} terms differing from expected`);
}

export function symbolicExponents(model: ModelSpec = onFamily, s: Q | null = null) {
  const { flow } = flowFor({ model, s, loops: 2, digits: 30 });
  const f = flow as DerivedFlow<Expression>;
  const points = findFixedPoints(model, f, { eps: null });
  const wf = points.find((p) => p.name !== 'Gaussian');
  assert.ok(wf, 'non-Gaussian fixed point exists');
  return { flow: f, points, series: exponentSeries(f, wf) };
}
