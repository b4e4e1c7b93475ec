import { test } from 'node:test';
import assert from 'node:assert/strict';
import { exactEigenvalues, groupWithMultiplicity, polynomialValue, realRootsInInterval, solveLinear, triangularDiagonal } from '../../../shared/engine/linalg';
import { realContext } from '../../../shared/engine/precision';
import { symbolicRing } from '../../../shared/engine/symbolic/ring';
import { Expression } from '../../../shared/engine/symbolic/expression';
import { type Q, q, qDiv, qIsZero, qMul, qSub, qToString } from '../../../shared/engine/symbolic/rational';

const rational = { sub: qSub, mul: qMul, inverse: (x: Q) => qDiv(q(1), x), isZero: qIsZero };
const rows = (m: number[][]) => m.map((row) => row.map((x) => q(x)));

test('solveLinear over exact rationals: [[2,1],[1,3]]·x = [1,2] gives x = (1/5, 3/5) (Cramer’s rule by hand)', () => {
  // det = 5; x₁ = (1·3 − 1·2)/5 = 1/5, x₂ = (2·2 − 1·1)/5 = 3/5
  const x = solveLinear(rational, rows([[2, 1], [1, 3]]), [q(1), q(2)], qIsZero);
  assert.deepEqual(x?.map(qToString), ['1/5', '3/5']);
  assert.equal(solveLinear(rational, rows([[1, 2], [2, 4]]), [q(1), q(2)], qIsZero), null, 'a singular system has no unique solution');
});

test('triangularDiagonal: the diagonal of an upper or lower triangular matrix, null for a full one', () => {
  const isZero = (x: number) => x === 0;
  assert.deepEqual(triangularDiagonal([[1, 5], [0, 2]], isZero), [1, 2]);
  assert.deepEqual(triangularDiagonal([[1, 0], [7, 2]], isZero), [1, 2]);
  assert.equal(triangularDiagonal([[1, 5], [3, 2]], isZero), null);
  assert.deepEqual(groupWithMultiplicity([2, 1, 2, 2], (a, b) => a === b), [{ value: 2, multiplicity: 3 }, { value: 1, multiplicity: 1 }]);
});

test('exactEigenvalues accepts known eigenvalues only with the right multiplicities (power sums, Newton’s identities)', () => {
  const ring = symbolicRing();
  const e = (n: number) => Expression.rational(q(n));
  const isZero = (x: Expression) => x.isZero();
  const text = (values: Expression[] | null) => values?.map((x) => qToString(x.rationalValue() as Q)) ?? null;
  // A = [[1,1,0],[1,0,1],[0,1,1]]: det(x − A) = (x − 2)(x − 1)(x + 1) (by hand; mathjs eigs agrees)
  const a = [[1, 1, 0], [1, 0, 1], [0, 1, 1]].map((row) => row.map(e));
  assert.deepEqual(text(exactEigenvalues(ring, a, isZero, [e(-1), e(2), e(1)])), ['-1', '2', '1']);
  // 1, 1, 0 has the right trace 2 but Σx² = 2 ≠ tr A² = 6
  assert.equal(exactEigenvalues(ring, a, isZero, [e(1), e(1), e(0)]), null);
  // B = [[2,1,0],[0,1,1],[0,1,1]] has eigenvalues 2, 2, 0 (block triangular: 2 and those of [[1,1],[1,1]])
  const b = [[2, 1, 0], [0, 1, 1], [0, 1, 1]].map((row) => row.map(e));
  assert.deepEqual(text(exactEigenvalues(ring, b, isZero, [e(2), e(0), e(2)])), ['2', '0', '2']);
  // 2, 1, 1: right trace 4, but Σx² = 6 ≠ tr B² = 8
  assert.equal(exactEigenvalues(ring, b, isZero, [e(2), e(1), e(1)]), null);
  // C = [[1,1,0],[1,1,0],[0,0,1]] has eigenvalues 0, 2, 1 (by hand). The guess 1, 1, 1 is made of true
  // roots and has the right trace 3; only the higher power sums (Σx² = 3 ≠ tr C² = 5) refuse it
  const c = [[1, 1, 0], [1, 1, 0], [0, 0, 1]].map((row) => row.map(e));
  assert.deepEqual(text(exactEigenvalues(ring, c, isZero, [e(0), e(2), e(1)])), ['0', '2', '1']);
  assert.equal(exactEigenvalues(ring, c, isZero, [e(1), e(1), e(1)]), null);
});

test('realRootsInInterval finds simple and double zeros: (x − 1/3)²(x − 2)(x + 5) on [−1, 3] gives 1/3 and 2', () => {
  const R = realContext(40);
  // (x − 1/3)² = x² − 2x/3 + 1/9; (x − 2)(x + 5) = x² + 3x − 10; product coefficients by hand:
  // x⁴ + (3 − 2/3)x³ + (−10 − 2 + 1/9)x² + (20/3 + 1/3)x − 10/9 = x⁴ + 7/3 x³ − 107/9 x² + 7x − 10/9
  const coeffs = [new R(-10).div(9), new R(7), new R(-107).div(9), new R(7).div(3), new R(1)];
  const roots = realRootsInInterval(coeffs, new R(-1), new R(3), 30, R);
  assert.equal(roots.length, 2, roots.map(String).join(', '));
  assert.ok(roots[0].minus(new R(1).div(3)).abs().lt('1e-14'), roots[0].toString());
  assert.ok(roots[1].minus(2).abs().lt('1e-28'), roots[1].toString());
  assert.ok(polynomialValue(coeffs, new R(-5)).abs().lt('1e-30'), 'x = −5 is a zero, outside the interval');
  assert.deepEqual(realRootsInInterval(coeffs, new R(3), new R(4), 30, R), []);
});
