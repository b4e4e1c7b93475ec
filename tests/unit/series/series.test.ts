import { test } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import {
  LaurentSeries,
  affineParameter,
  evaluatePade,
  expressionToString,
  numericRing,
  padeApproximant,
  padeTable,
  polesInInterval,
  psiExpr,
  q,
  symbolicRing,
} from '../../../shared/engine/index';
import { assertDigits, wide } from '../helpers/engine';

const R = numericRing(50);
const num = (x: number | string) => R.fromRational(BigInt(Math.round(Number(x) * 1000)), 1000n);

function randomSeries(coeffs: number[], lowest = 0, order = lowest + coeffs.length - 1) {
  return LaurentSeries.of(R, lowest, coeffs.map(num), order);
}

function assertSeriesEqual(a: LaurentSeries<ReturnType<typeof num>>, b: LaurentSeries<ReturnType<typeof num>>, digits = 40) {
  assert.equal(a.order, b.order, 'orders differ');
  for (let k = Math.min(a.lowest, b.lowest); k <= a.order; k++) {
    const x = wide(a.coefficient(k));
    const y = wide(b.coefficient(k));
    assert.ok(x.minus(y).abs().lte(wide(10).pow(-digits).times(y.abs().plus(1))), `eps^${k}: ${x} vs ${y}`);
  }
}

const coeffList = fc.array(fc.integer({ min: -5000, max: 5000 }).map((n) => n / 1000), { minLength: 2, maxLength: 7 });

test('exp(log f) = f for random series with f(0) > 0 (common practice: formal power series identities)', () => {
  fc.assert(
    fc.property(coeffList, (c) => {
      c[0] = Math.abs(c[0]) + 0.5;
      const f = randomSeries(c);
      assertSeriesEqual(f.log().exp(), f);
    }),
    { numRuns: 30 },
  );
});

test('reversion twice is the identity; f(reversion(f)) = x (common practice: Lagrange inversion)', () => {
  fc.assert(
    fc.property(coeffList, (c) => {
      c[0] = 0;
      // keep the linear coefficient away from 0: reversion divides by it repeatedly (ill-conditioned otherwise)
      c[1] = Math.sign(c[1] || 1) * (0.5 + Math.abs(c[1]));
      const f = randomSeries(c);
      const h = f.reversion();
      assertSeriesEqual(h.reversion(), f);
      const composed = f.compose(h);
      assert.equal(composed.order, f.order);
      for (let k = 0; k <= composed.order; k++) assert.ok(wide(composed.coefficient(k)).minus(k === 1 ? 1 : 0).abs().lt('1e-40'), `coefficient ${k}`);
    }),
    { numRuns: 30 },
  );
});

test('truncation order is tracked exactly through products, inverses and powers', () => {
  const pole = randomSeries([1, 2, 3], -1); // ε^-1 + 2 + 3ε + O(ε²)
  const regular = randomSeries([2, 1, 0, 4]); // known through ε³
  assert.equal(pole.mul(regular).order, 1); // min(1 + 0, 3 − 1)
  assert.equal(pole.inverse().lowest, 1);
  assert.equal(pole.inverse().order, 3); // relative depth 2 kept
  assert.equal(pole.powInteger(2).order, 0);
  assert.equal(pole.add(regular).order, 1);
  assert.throws(() => pole.coefficient(2), /not determined/);
  // (1+ε)^(1/2) squared is 1+ε to the known order
  const sq = randomSeries([1, 1], 0, 6).powRational(1n, 2n).powInteger(2);
  assertSeriesEqual(sq, randomSeries([1, 1, 0, 0, 0, 0, 0]));
});

test('known series: 1/(1−ε) and exp(ε) coefficients (common practice)', () => {
  const geometric = randomSeries([1, -1], 0, 5).inverse();
  for (let k = 0; k <= 5; k++) assertDigits(geometric.coefficient(k), '1', 40);
  const e = LaurentSeries.variable(R, 6).exp();
  let factorial = 1;
  for (let k = 0; k <= 6; k++) {
    if (k > 0) factorial *= k;
    assertDigits(e.coefficient(k), wide(1).div(factorial).toString(), 40, `1/${k}!`);
  }
  let partial = wide(0);
  let f = 1;
  for (let k = 0; k <= 6; k++) {
    if (k > 0) f *= k;
    partial = partial.plus(wide(0.5).pow(k).div(f));
  }
  assertDigits(e.evaluate(R.fromRational(1n, 2n)), partial.toString(), 45, 'exp(1/2) truncated at x^6');
});

test('symbolic series: exp(log f) = f with coefficients in ψ(s) and N', () => {
  const S = symbolicRing();
  const psiS = psiExpr(0, affineParameter('s'));
  const f = LaurentSeries.of(S, 0, [S.one(), psiS, psiS.mul(psiS).scale(q(1, 2)), S.fromRational(3n, 7n)], 3);
  const g = f.log().exp();
  for (let k = 0; k <= 3; k++) assert.equal(expressionToString(g.coefficient(k)), expressionToString(f.coefficient(k)), `eps^${k}`);
  const h = f.sub(LaurentSeries.constant(S, S.one(), 3)).reversion().reversion();
  for (let k = 1; k <= 3; k++) assert.equal(expressionToString(h.coefficient(k)), expressionToString(f.coefficient(k)));
});

test('Padé of exp: [1/1] = (1+x/2)/(1−x/2), [2/2] = (1+x/2+x²/12)/(1−x/2+x²/12) (common practice; Baker & Graves-Morris, recalled from memory)', () => {
  const coeffs = ['1', '1', '0.5', wide(1).div(6).toString(), wide(1).div(24).toString(), wide(1).div(120).toString()];
  const p11 = padeApproximant(coeffs, 1, 1, 30);
  assertDigits(p11.numerator[1], '0.5', 30);
  assertDigits(p11.denominator[1], '-0.5', 30);
  const p22 = padeApproximant(coeffs, 2, 2, 30);
  assertDigits(p22.numerator[1], '0.5', 30);
  assertDigits(p22.numerator[2], wide(1).div(12).toString(), 30);
  assertDigits(p22.denominator[1], '-0.5', 30);
  assertDigits(p22.denominator[2], wide(1).div(12).toString(), 30);
  // [1/1] at x = 1 is 3; its pole is at x = 2
  assertDigits(evaluatePade(p11, '1', 30), '3', 30);
  const poles = polesInInterval(p11, '0', '3', 30);
  assert.equal(poles.length, 1);
  assertDigits(poles[0], '2', 30);
  assert.equal(polesInInterval(p11, '0', '1.5', 30).length, 0);
  const table = padeTable(coeffs, 4, 20, { at: '0.5', interval: ['0', '1'] });
  assert.equal(table.length, 15);
  for (const entry of table) {
    assert.ok(entry.value, `[${entry.L}/${entry.M}] has a value`);
    // every approximant with L+M = 4 matches e^0.5 to better than 1e-3 (error ~ x^5 terms)
    if (entry.L + entry.M === 4) assert.ok(wide(entry.value!).minus(wide('0.5').exp()).abs().lt('1e-3'), `[${entry.L}/${entry.M}]`);
  }
});

test('composition and reversion of a series stored from ε^1 (no explicit constant term)', () => {
  // f = ε + ε², stored with lowest = 1. Its inverse is Σ (−1)^(n−1) C_(n−1) ε^n with the Catalan
  // numbers C = 1, 1, 2, 5, 14 (OEIS A000108): ε − ε² + 2ε³ − 5ε⁴ + 14ε⁵.
  const f = randomSeries([1, 1, 0, 0, 0], 1);
  const h = f.reversion();
  [0, 1, -1, 2, -5, 14].forEach((expected, k) => assert.ok(wide(h.coefficient(k)).minus(expected).abs().lt('1e-40'), `ε^${k}`));
  // f(2ε) = 2ε + 4ε² (exact by hand).
  const composed = f.compose(randomSeries([2], 1, 5));
  [0, 2, 4, 0, 0, 0].forEach((expected, k) => assert.ok(wide(composed.coefficient(k)).minus(expected).abs().lt('1e-40'), `f(2ε) at ε^${k}`));
});
