import { test } from 'node:test';
import assert from 'node:assert/strict';
import Decimal from 'decimal.js';
import { fraction, type Fraction } from 'mathjs';
import { checkedPadeTable, padeApproximant, padeBorel, padeBorelTable } from '../../../shared/engine/pade/index';

const D = Decimal.clone({ precision: 80 });
const near = (actual: Decimal.Value | null, expected: Decimal.Value, tol: string, label: string) => {
  assert.ok(actual !== null, `${label}: no value`);
  assert.ok(new D(actual).minus(expected).abs().lte(tol), `${label}: ${actual} vs ${expected.toString()}`);
};

// Euler's constant γ (OEIS A001620), 70 digits
const EULER = new D('0.5772156649015328606065120900824024310421593359399235988057672348848677');

/** E₁(x) = −γ − ln x − Σ_{k≥1} (−x)^k/(k·k!) (DLMF 6.6.2), at 80 digits (x ≤ 10: the cancellation costs < 5 digits). */
function e1(x: Decimal): Decimal {
  let sum = new D(0);
  let term = new D(1);
  for (let k = 1; k < 400; k++) {
    term = term.times(x.neg()).div(k);
    const add = term.div(k);
    sum = sum.plus(add);
    if (add.abs().lt('1e-90')) break;
  }
  return EULER.neg().minus(x.ln()).minus(sum);
}

test('Padé–Borel of Σ (−1)^k k! ε^k: B(t) = 1/(1 + t), and the Laplace integral is e^{1/ε}E₁(1/ε)/ε (DLMF 6.2.2, 6.7.1) to the working digits', () => {
  const coeffs = ['1', '-1', '2', '-6'];
  for (const eps of ['0.2', '1', '0.05']) {
    const x = new D(1).div(eps);
    const exact = x.exp().times(e1(x)).times(x);
    const [first, second, third] = padeBorelTable(coeffs, 3, eps, 30);
    assert.deepEqual([first.L, first.M, second.L, second.M, third.L, third.M], [2, 1, 1, 2, 0, 3]);
    near(first.value, exact, '1e-29', `[2/1] at ε = ${eps}`);
    assert.ok(first.error !== null && first.error.lte('1e-30'), `error estimate ${first.error}`);
    // 1/(1 + t) has rank-one Hankel systems beyond M = 1: [1/2] and [0/3] are degenerate, flagged without a value
    assert.equal(second.flagged, true);
    assert.equal(second.value, null);
  }
  // ε = 1: the Gompertz constant G = e·E₁(1) (OEIS A073003)
  near(padeBorel(coeffs, 2, 1, '1', 60).value, '0.596347362323194074341078499369279376074177860152548781573484910', '1e-59', 'Gompertz constant at 60 digits');
});

test('a [1/1] Borel–Padé worked by hand: a = (1, −1, 4) → B = (1 + x)/(1 + 2x) = 1/2 + (1/2)/(1 + 2x); at ε = 0.1 the sum is 1/2 + (5/2)e⁵E₁(5)', () => {
  const exact = new D('0.5').plus(new D(5).exp().times(e1(new D(5))).times('2.5'));
  const r = padeBorel(['1', '-1', '4'], 1, 1, '0.1', 40);
  near(r.value, exact, '1e-39', '[1/1]');
  assert.equal(r.flagged, false);
});

test('a pole on the positive t axis flags the sum: a = (1, 1, 2) → B = 1/(1 − x), a pole at t = 1/ε = 10 (hand computation)', () => {
  const r = padeBorel(['1', '1', '2'], 1, 1, '0.1', 30);
  assert.equal(r.flagged, true);
  assert.equal(r.value, null);
  assert.equal(r.error, null);
  assert.equal(r.poles.length, 1);
  near(r.poles[0].toString(), 10, '1e-25', 'pole');
  assert.match(r.reason ?? '', /pole on the positive t axis \(t = 10\)/);
});

test('a series that is a polynomial through its order (η = 2 − s for s < 2) sums exactly', () => {
  const r = padeBorel(['0.25', '0', '0', '0'], 2, 1, '0.5', 30);
  assert.equal(r.value?.toString(), '0.25');
  assert.equal(r.error?.isZero(), true);
});

/** [L/M] by an exact solve over fractions (mathjs), independent of the engine's linear algebra: M = 1, 2 by Cramer's rule. */
function exactPade(c: Fraction[], L: number, M: number): { p: Fraction[]; q: Fraction[] } {
  const at = (k: number) => (k < 0 ? fraction(0) : c[k]);
  const mul = (a: Fraction, b: Fraction) => a.mul(b);
  let q: Fraction[];
  if (M === 1) q = [fraction(1), at(L + 1).neg().div(at(L))];
  else {
    // [[c_L, c_{L−1}], [c_{L+1}, c_L]] (q1, q2) = −(c_{L+1}, c_{L+2})
    const det = mul(at(L), at(L)).sub(mul(at(L - 1), at(L + 1)));
    const r1 = at(L + 1).neg();
    const r2 = at(L + 2).neg();
    q = [fraction(1), mul(r1, at(L)).sub(mul(at(L - 1), r2)).div(det), mul(at(L), r2).sub(mul(at(L + 1), r1)).div(det)];
  }
  const p = Array.from({ length: L + 1 }, (_, i) => q.reduce((s, qj, j) => (j <= i ? s.add(mul(qj, at(i - j))) : s), fraction(0)));
  return { p, q };
}

test('Padé [2/1] and [1/2] of a three-loop series equal an exact rational solve (mathjs fractions), and the order-3 table lists [0/1] … [0/3]', () => {
  const c = ['2', '-0.75', '0.625', '-1.3125'];
  const exact = c.map((x) => fraction(x));
  for (const [L, M] of [[2, 1], [1, 2]] as const) {
    const mine = padeApproximant(c, L, M, 40);
    const { p, q } = exactPade(exact, L, M);
    p.forEach((x, i) => near(mine.numerator[i].toString(), new D(Number(x.n)).div(Number(x.d)).times(Number(x.s)), '1e-38', `[${L}/${M}] p${i}`));
    q.forEach((x, i) => near(mine.denominator[i].toString(), new D(Number(x.n)).div(Number(x.d)).times(Number(x.s)), '1e-38', `[${L}/${M}] q${i}`));
  }
  const table = checkedPadeTable(c, 3, '0.5', 30);
  assert.deepEqual(table.map((e) => `[${e.L}/${e.M}]`), ['[0/1]', '[1/1]', '[0/2]', '[2/1]', '[1/2]', '[0/3]']);
  // [2/1] at ε = 1/2 by hand from the exact solve: q1 = −c3/c2 = 2.1, P = 2 + 3.45ε − 0.95ε²
  near(table[3].value?.toString() ?? null, new D(2).plus(new D('3.45').times('0.5')).minus(new D('0.95').times('0.25')).div(new D(1).plus(new D('2.1').times('0.5'))), '1e-29', '[2/1] value');
});
