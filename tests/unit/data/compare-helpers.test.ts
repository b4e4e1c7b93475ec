import { test } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { fraction, add, subtract, multiply, divide, equal } from 'mathjs';
import { realContext } from '../../../shared/engine/precision/real';
import { type Q, q } from '../../../shared/engine/symbolic/rational';
import { deltaPhiFromS, fitSummary, padeVariant, pullOf, sFromDeltaPhi, seriesVariants, truncatedValue } from '../../../shared/engine/scans/compare';

const R = realContext(40);
const real = (value: string | number) => new R(value);
const rational = fc.record({ num: fc.bigInt({ min: -(10n ** 12n), max: 10n ** 12n }), den: fc.bigInt({ min: 1n, max: 10n ** 9n }) }).map(({ num, den }) => q(num, den));
/** mathjs's Fraction (an independent rational implementation) of one of ours. */
const asFraction = (x: Q) => fraction(x.num, x.den);
const sameRational = (ours: Q, theirs: ReturnType<typeof fraction>) => equal(asFraction(ours), theirs) as boolean;

test('Δφ = (d − s)/2 for random rationals, checked with mathjs fractions (the exact relation of the long-range theory, s < 2)', () => {
  fc.assert(
    fc.property(rational, rational, (d, s) => {
      const expected = divide(subtract(asFraction(d), asFraction(s)), fraction(2)) as ReturnType<typeof fraction>;
      return sameRational(deltaPhiFromS(d, s), expected);
    }),
  );
});

test('s = d − 2Δφ undoes Δφ = (d − s)/2 exactly (rational round trip both ways)', () => {
  fc.assert(
    fc.property(rational, rational, (d, s) => {
      const back = sFromDeltaPhi(d, deltaPhiFromS(d, s));
      const again = deltaPhiFromS(d, sFromDeltaPhi(d, s));
      return back.num === s.num && back.den === s.den && again.num === s.num && again.den === s.den;
    }),
  );
  // A fixed case by hand: d = 3, s = 7/4 → Δφ = 5/8 (and s = 3 − 2·5/8 = 7/4).
  assert.deepEqual(deltaPhiFromS(q(3), q(7, 4)), q(5, 8));
  assert.ok(sameRational(sFromDeltaPhi(q(3), q(5, 8)), add(fraction(3), multiply(fraction(-2), fraction(5, 8))) as ReturnType<typeof fraction>));
});

test('variants: truncations at each order and the Padé approximants [0/1] (one loop), [1/1] and [0/2] (two loops)', () => {
  assert.deepEqual(seriesVariants(1).map((v) => v.key), ['order1', 'pade_0_1']);
  assert.deepEqual(seriesVariants(2).map((v) => v.key), ['order1', 'order2', 'pade_0_1', 'pade_1_1', 'pade_0_2']);
  assert.deepEqual(seriesVariants(2).map((v) => v.order), [1, 2, 1, 2, 2]);
});

test('truncations and Padé values equal the closed forms written out by hand', () => {
  const c = [real('0.5'), real('0.3'), real('-0.2')];
  const eps = real('0.4');
  // c0 + c1 ε = 0.62; c0 + c1 ε + c2 ε² = 0.588
  assert.equal(truncatedValue(c, eps, 1, 20).toString(), '0.62');
  assert.equal(truncatedValue(c, eps, 2, 20).toString(), '0.588');
  // [0/1] = c0 / (1 − (c1/c0) ε) = 0.5 / (1 − 0.24) = 0.5/0.76
  assert.equal(padeVariant(c, 0, 1, eps, 20).value?.toString(), real('0.5').div('0.76').toSignificantDigits(20).toString());
  // [1/1] = c0 + c1 ε / (1 − (c2/c1) ε) = 0.5 + 0.12/(1 + 0.8/3)
  const pade11 = real('0.5').plus(real('0.12').div(real(1).plus(real('0.8').div(3))));
  assert.ok(padeVariant(c, 1, 1, eps, 20).value!.minus(pade11).abs().lt('1e-19'));
});

test('a Padé approximant with a pole in (0, ε] is a defect with the pole position, never a number', () => {
  // c = 1 + ε + 2ε²: [1/1] has Q = 1 − 2ε (pole at 1/2), [0/1] has Q = 1 − ε (pole at 1, the end of (0, ε] itself)
  const c = [real(1), real(1), real(2)];
  assert.deepEqual(padeVariant(c, 1, 1, real(1), 20), { value: null, defect: 'pole at ε = 0.5' });
  assert.deepEqual(padeVariant(c, 0, 1, real(1), 20), { value: null, defect: 'pole at ε = 1' });
  // below the pole the value is finite: at ε = 0.4, [1/1] = 1 + 0.4/(1 − 0.8) = 3
  assert.equal(padeVariant(c, 1, 1, real('0.4'), 20).value?.toString(), '3');
  // 1/(1 − 2ε)² = 1 + 4ε + 12ε² + …: [0/2] has a double zero of Q at 1/2, where Q does not change sign
  const double = [real(1), real(4), real(12)];
  assert.deepEqual(padeVariant(double, 0, 2, real(1), 20), { value: null, defect: 'pole at ε = 0.5' });
  assert.ok(padeVariant(double, 0, 2, real('0.25'), 20).value!.minus(4).abs().lt('1e-18'), '1/(1 − 0.5)² = 4 below the pole');
});

test('a degenerate approximant (vanishing c1 with c2 ≠ 0 for [1/1]) is a defect too; a series with c1 = c2 = 0 is its own approximant', () => {
  // [1/1] needs q1·c1 = −c2: with c1 = 0 and c2 = 1 there is no solution (by hand)
  const v = padeVariant([real(2), real(0), real(1)], 1, 1, real('0.5'), 20);
  assert.equal(v.value, null);
  assert.match(v.defect ?? '', /degenerate/);
  // 2 + 0ε + 0ε²: Q = 1, P = 2 matches through ε² (the Padé equations hold with q1 = 0), so [1/1] = 2
  assert.equal(padeVariant([real(2), real(0), real(0)], 1, 1, real('0.5'), 20).value?.toString(), '2');
});

test('the pull uses the error on the side where the series lies (above the data: upper error; below: lower error)', () => {
  assert.equal(pullOf(real('0.2'), real('0.1'), real('0.4'))?.toString(), '0.5');
  assert.equal(pullOf(real('-0.1'), real('0.05'), real('0.4'))?.toString(), '-2');
  assert.equal(pullOf(real('0.1'), real('0.1'), real('0')), null, 'a zero error gives no pull');
});

test('χ² = Σ pull², χ²/point, RMS and max |residual| on a hand-made list (missing values left out)', () => {
  const summary = fitSummary([real('0.2'), null, real('-0.1')], [real('0.5'), null, real('-2')], 20);
  assert.equal(summary.points, 2);
  assert.equal(summary.chi2Points, 2);
  assert.equal(summary.chi2?.toString(), '4.25'); // 0.25 + 4
  assert.equal(summary.chi2PerPoint?.toString(), '2.125');
  assert.ok(summary.rms!.minus(real('0.025').sqrt()).abs().lt('1e-30'), 'sqrt((0.04 + 0.01)/2)');
  assert.equal(summary.maxAbs?.toString(), '0.2');
  const noErrors = fitSummary([real('0.3')], null, 20);
  assert.equal(noErrors.chi2, null);
  assert.equal(noErrors.rms?.toString(), '0.3');
});

test('a residual without a pull (zero error on its side) counts in the RMS but not in χ²: χ²/point divides by the points with a pull', () => {
  // residuals 0.2, −0.1, 0.3; the second has no pull. χ² = 0.5² + 1.5² = 2.5 over 2 points (by hand)
  const summary = fitSummary([real('0.2'), real('-0.1'), real('0.3')], [real('0.5'), null, real('1.5')], 20);
  assert.equal(summary.points, 3);
  assert.equal(summary.chi2Points, 2);
  assert.equal(summary.chi2?.toString(), '2.5');
  assert.equal(summary.chi2PerPoint?.toString(), '1.25');
  assert.ok(summary.rms!.minus(real('0.14').div(3).sqrt()).abs().lt('1e-30'), 'sqrt((0.04 + 0.01 + 0.09)/3)');
  assert.equal(fitSummary([real('0.1')], [null], 20).chi2Points, 0);
});
