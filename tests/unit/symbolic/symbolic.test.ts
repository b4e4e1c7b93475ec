import { test } from 'node:test';
import assert from 'node:assert/strict';
import { evaluate } from 'mathjs';
import { EngineError, Expression, affine, affineParameter, eulerGammaExpr, evaluateExpression, expressionToLatex, expressionToString, gammaExpr, psiExpr, q, zetaExpr } from '../../../shared/engine/index';
import { polyFromAffine } from '../../../shared/engine/symbolic/polynomial';
import { ratDivideByPoly, ratFromPoly } from '../../../shared/engine/symbolic/ratfunc';
import { assertDigits, wide } from '../helpers/engine';

const N = affineParameter('N');
const linear = (c: number, n = 1) => polyFromAffine(affine(q(c), { N: q(n) }));
/** (N + a) / (N + b) as a symbolic coefficient. */
const ratio = (a: number, b: number) => Expression.ratfunc(ratDivideByPoly(ratFromPoly(linear(a)), linear(b)));

test('rational functions of N: (N+2)/(N+8) + 6/(N+8) = 1 and repeated factors collect (canonical form)', () => {
  const sum = ratio(2, 8).add(Expression.ratfunc(ratDivideByPoly(ratFromPoly(polyFromAffine(affine(q(6)))), linear(8))));
  assert.equal(expressionToString(sum), '1');
  const cube = ratio(2, 8).mul(ratio(0, 8)).mul(ratio(0, 8)); // (N+2)N²/(N+8)³
  assert.equal(expressionToString(cube), '(N^3 + 2*N^2)/(N + 8)^3');
  // the same value built another way prints the same
  const other = Expression.ratfunc(ratDivideByPoly(ratFromPoly(polyFromAffine(affine(q(0), { N: q(1) }))), linear(8), 3)).mul(Expression.ratfunc(ratFromPoly(polyFromAffine(affine(q(2), { N: q(1) }))))).mul(Expression.ratfunc(ratFromPoly(polyFromAffine(N))));
  assert.equal(expressionToString(other), expressionToString(cube));
  // inverse of an expanded product splits into linear factors again: 1/((N+2)(N+8))
  const product = Expression.ratfunc(ratFromPoly(linear(2))).mul(Expression.ratfunc(ratFromPoly(linear(8))));
  assert.equal(expressionToString(product.inverse()), '1/((N + 2)*(N + 8))');
  // O(N) one-loop weight check: (N+8)/6 · 6/(N+8) = 1 (docs/physics.md §5 weights)
  assert.equal(expressionToString(Expression.ratfunc(ratFromPoly(linear(8))).scale(q(1, 6)).mul(Expression.ratfunc(ratFromPoly(linear(8))).scale(q(1, 6)).inverse())), '1');
});

test('mixed coefficients print as mathjs-parsable text and LaTeX; the text evaluates back (issue 3 syntax)', () => {
  const s = affineParameter('s');
  const e = ratio(2, 8).mul(psiExpr(1, s)).add(zetaExpr(3).scale(q(-7, 4))).add(eulerGammaExpr().mul(gammaExpr(affine(q(1, 2), { s: q(1) })).inverse()));
  const text = expressionToString(e);
  const latex = expressionToLatex(e);
  assert.match(latex, /\\zeta\(3\)/);
  assert.match(latex, /\\Gamma/);
  const values = { s: q(13, 10), N: q(3) };
  const high = evaluateExpression(e, values, 30);
  const viaMathjs = evaluate(text, {
    s: 1.3,
    N: 3,
    psi: (k: number, x: number) => Number(evaluateExpression(psiExpr(k, affine(q(Math.round(x * 1e6), 1e6))), {}, 20)),
    eulergamma: 0.5772156649015329, // OEIS A001620
  }) as number;
  assert.ok(Math.abs(viaMathjs - Number(high)) < 1e-12 * Math.abs(Number(high)), `${text}: ${viaMathjs} vs ${high}`);
  // ζ(3) from mathjs' own zeta, γ_E from OEIS: the term −7/4 ζ(3) alone
  const zeta3 = wide('1.2020569031595942853997381615114499907650'); // OEIS A002117
  assertDigits(String(evaluate(expressionToString(zetaExpr(3).scale(q(-7, 4))))), zeta3.times(-1.75).toString(), 12, 'mathjs zeta(3)');
});

test('division by a sum of monomials is refused with a typed error (not-representable)', () => {
  const sumOfAtoms = psiExpr(0, affineParameter('s')).add(eulerGammaExpr());
  assert.throws(() => sumOfAtoms.inverse(), (e: unknown) => e instanceof EngineError && e.code === 'not-representable');
});
