import { test } from 'node:test';
import assert from 'node:assert/strict';
import { characteristicPolynomial, complexOps, eigenvaluesWithMultiplicity, nullSpace, polishedPolynomialRoots, realEigenvalues, solveLinear, symmetricEigen } from '../../../shared/engine/linalg/index';
import { numericRing } from '../../../shared/engine/series/numeric';
import { symbolicRing } from '../../../shared/engine/symbolic/ring';
import { Expression } from '../../../shared/engine/symbolic/expression';
import { realContext } from '../../../shared/engine/precision/real';
import { type Q, q, qToString } from '../../../shared/engine/symbolic/rational';

const digits = 50;
const ring = numericRing(digits);
const R = realContext(digits);
const isZero = (x: { abs(): { lte(y: number | string): boolean } }) => x.abs().lte('1e-42');
const real = (rows: number[][]) => rows.map((row) => row.map((x) => ring.fromRational(BigInt(x))));
const c = complexOps(ring);

test('characteristic polynomial (Faddeev–LeVerrier) of a 3×3 integer matrix equals the hand expansion x³ − tr x² + (Σ principal 2×2 minors) x − det', () => {
  // A = [[2,1,0],[1,3,1],[0,1,4]]: tr 9, minors 5 + 8 + 11 = 24, det 18 (hand computation, common practice)
  const p = characteristicPolynomial(ring, real([[2, 1, 0], [1, 3, 1], [0, 1, 4]]));
  assert.deepEqual(p.map((x) => x.toString()), ['-18', '24', '-9', '1']);
  // exact over the symbolic ring: [[1/2, 1], [0, 1/3]] has det(x − A) = x² − (5/6)x + 1/6
  const e = (n: number, d = 1) => Expression.rational(q(n, d));
  const exact = characteristicPolynomial(symbolicRing(), [[e(1, 2), e(1)], [e(0), e(1, 3)]]);
  assert.deepEqual(exact.map((x) => qToString(x.rationalValue() as Q)), ['1/6', '-5/6', '1']);
});

test('multiple roots are found to full precision with their multiplicity: (x − 1/3)³ (x + 2)', () => {
  // (x − 1/3)³ = x³ − x² + x/3 − 1/27 (binomial theorem), times (x + 2)
  const cubic = [new R(-1).div(27), new R(1).div(3), new R(-1), new R(1)];
  const coeffs = [0, 1, 2, 3, 4].map((k) => (k < 4 ? cubic[k].times(2) : new R(0)).plus(k > 0 ? cubic[k - 1] : 0));
  const roots = polishedPolynomialRoots(ring, coeffs.map((x) => c.of(x)), isZero);
  const triple = roots.find((r) => r.multiplicity === 3);
  assert.ok(triple, JSON.stringify(roots.map((r) => [r.root.re.toString(), r.multiplicity])));
  assert.ok(triple.root.re.minus(new R(1).div(3)).abs().lt('1e-45'), triple.root.re.toString());
  assert.ok(triple.root.im.isZero());
  const simple = roots.find((r) => r.multiplicity === 1);
  assert.equal(simple?.root.re.toString(), '-2');
});

test('eigenvalues with multiplicity of a non-triangular matrix P·diag(2, 2, 5)·P⁻¹, and an exactly zero eigenvalue prints as 0', () => {
  // P = [[1,1,0],[0,1,1],[1,0,1]], P⁻¹ = ½[[1,−1,1],[1,1,−1],[−1,1,1]] (hand inversion, det P = 2)
  const P = [[1, 1, 0], [0, 1, 1], [1, 0, 1]];
  const Pinv = [[0.5, -0.5, 0.5], [0.5, 0.5, -0.5], [-0.5, 0.5, 0.5]];
  const Dg = [2, 2, 5];
  const A = P.map((row) => Pinv[0].map((_, j) => row.reduce((s, x, k) => s + x * Dg[k] * Pinv[k][j], 0)));
  const groups = eigenvaluesWithMultiplicity(ring, A.map((row) => row.map((x) => c.of(new R(x)))), isZero);
  const sorted = groups.map((g) => [g.root.re.toSignificantDigits(45).toString(), g.multiplicity]).sort();
  assert.deepEqual(sorted, [['2', 2], ['5', 1]]);
  // [[1,1],[1,1]] has eigenvalues 0 and 2 (hand computation): the zero is exactly zero
  assert.deepEqual(realEigenvalues(ring, real([[1, 1], [1, 1]]), isZero).map(String).sort(), ['0', '2']);
});

test('null space and linear solve: a rank-1 matrix has a 2-dimensional null space; a regular system is solved exactly', () => {
  const { vectors, free } = nullSpace(ring, real([[1, 2, 3], [2, 4, 6]]), isZero, (x) => Math.abs(Number(x)));
  assert.equal(vectors.length, 2);
  assert.deepEqual(free, [1, 2]);
  for (const v of vectors) assert.ok(isZero(v[0].plus(v[1].times(2)).plus(v[2].times(3))));
  // 2x + y = 3, x − y = 0 → x = y = 1 (hand)
  assert.deepEqual(solveLinear(ring, real([[2, 1], [1, -1]]), real([[3], [0]]).map((r) => r[0]), isZero)?.map(String), ['1', '1']);
});

test('symmetric eigen-solver: [[2,1],[1,2]] has eigenvalues 1 and 3 with eigenvectors (1, ∓1)/√2 (hand computation)', () => {
  const { values, vectors } = symmetricEigen(real([[2, 1], [1, 2]]), 40);
  const order = values.map((_, i) => i).sort((i, j) => Number(values[i]) - Number(values[j]));
  assert.ok(values[order[0]].minus(1).abs().lt('1e-35'));
  assert.ok(values[order[1]].minus(3).abs().lt('1e-35'));
  const v = vectors.map((row) => row[order[1]]);
  assert.ok(v[0].minus(v[1]).abs().lt('1e-35'), 'eigenvector of 3 is (1, 1)/√2');
});
