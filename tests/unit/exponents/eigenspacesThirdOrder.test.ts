import { test } from 'node:test';
import assert from 'node:assert/strict';
import Decimal from 'decimal.js';
import { eigenspaces } from '../../../shared/engine/exponents/quadratic';
import { symmetricEigen } from '../../../shared/engine/linalg/symmetric';
import { type Real } from '../../../shared/engine/precision/real';

const D = Decimal.clone({ precision: 50 });
const matrix = (rows: number[][]) => rows.map((r) => r.map((x) => new D(x) as unknown as Real));

// Rayleigh–Schrödinger perturbation theory checked against the exact eigenvalues of M₁ + εM₂ + ε²M₃
// (symmetric Jacobi at 50 digits): the third-order series must miss them by O(ε³) in γ/ε, i.e. the
// error at ε and ε/2 shrinks by 8. M₁ has a doubly degenerate eigenvalue that M₂ splits.
test('eigenspaces of γ(ε) = M₁ε + M₂ε² + M₃ε³: third-order coefficients match the exact eigenvalues to O(ε⁴)', () => {
  const m1 = matrix([[1, 0, 0], [0, 1, 0], [0, 0, 2]]);
  const m2 = matrix([[0.3, 0.7, -0.2], [0.7, -0.4, 0.5], [-0.2, 0.5, 0.1]]);
  const m3 = matrix([[0.9, -0.1, 0.4], [-0.1, 0.2, 0.3], [0.4, 0.3, -0.6]]);
  const spaces = eigenspaces(m1, m2, 50, m3);
  assert.equal(spaces.length, 3);
  const series = spaces.map(({ g1, g2, g3 }) => (e: number) => Number(g1.toString()) + e * Number(g2!.toString()) + e * e * Number(g3!.toString())).map((f) => f);
  const errorAt = (e: number) => {
    const m = m1.map((row, i) => row.map((x, j) => new D(x).plus(new D(m2[i][j]).times(e)).plus(new D(m3[i][j]).times(e * e)) as unknown as Real));
    const exact = symmetricEigen(m, 50).values.map((x) => Number(x.toString())).sort((a, b) => a - b);
    const approx = series.map((f) => f(e)).sort((a, b) => a - b);
    return Math.max(...exact.map((x, i) => Math.abs(x - approx[i])));
  };
  const ratio = errorAt(0.004) / errorAt(0.002);
  assert.ok(ratio > 7 && ratio < 9, `ratio ${ratio}`);
});
