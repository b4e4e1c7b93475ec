import { test } from 'node:test';
import assert from 'node:assert/strict';
import Decimal from 'decimal.js';
import { special } from '../../../shared/engine/index';
import { EngineError } from '../../../shared/engine/precision';
import { assertDigits } from '../helpers/engine';
import { ZETA3_212 } from '../helpers/threeLoop';
import { TETRAHEDRON_MPMATH, TETRAHEDRON_MPMATH_DIGITS } from '../helpers/tetrahedron-values';
import { TETRAHEDRON_SPECTRAL, TETRAHEDRON_SPECTRAL_BELOW_HALF, TETRAHEDRON_SPECTRAL_BELOW_HALF_DIGITS, TETRAHEDRON_SPECTRAL_CONTINUED, TETRAHEDRON_SPECTRAL_CONTINUED_DIGITS, TETRAHEDRON_SPECTRAL_DIGITS } from '../helpers/tetrahedron-spectral-values';

// ζ(3) to 40 digits, OEIS A002117 (same value as tests/unit/special/constants.test.ts)
const ZETA3_40 = '1.2020569031595942853997381615114499907650';
const Wide = Decimal.clone({ precision: 120 });

test('P(2) = 6ζ(3) to 30 digits (OEIS A002117; P(2) = 6ζ(3) is common practice: the wheel with three spokes)', () => {
  const expected = new Wide(ZETA3_40).times(6).toString();
  assertDigits(special.tetrahedronPeriod('2', 30), expected, 30, 'P(2)');
});

test('P(2) = 6ζ(3) to 50 digits (ζ(3) from the engine at 60 digits, itself checked against OEIS A002117 and mpmath)', () => {
  const expected = new Wide(special.zetaInteger(3, 60).toString()).times(6).toString();
  assertDigits(special.tetrahedronPeriod('2', 50), expected, 50, 'P(2)');
});

test('P(2) = 6ζ(3) to 100 digits (ζ(3) from the engine at 110 digits; the tail terms no longer underflow at high digits)', () => {
  const expected = new Wide(special.zetaInteger(3, 110).toString()).times(6).toString();
  assertDigits(special.tetrahedronPeriod('2', 100), expected, 100, 'P(2)');
});

test('P(2) = 6ζ(3) to 200 digits, the largest digit count a job may ask for (ζ(3) from mpmath at 212 digits, tests/unit/helpers/threeLoop.ts)', () => {
  const Huge = Decimal.clone({ precision: 230 });
  assert.ok(ZETA3_212.startsWith(ZETA3_40.slice(0, -2)), 'the stored value is ζ(3) (OEIS A002117)');
  assertDigits(special.tetrahedronPeriod('2', 200), new Huge(ZETA3_212).times(6).toString(), 200, 'P(2)');
});

test('P(s) agrees with the independent two-fold Mellin–Barnes integration in mpmath (tests/unit/helpers/tetrahedron_mpmath.py)', () => {
  for (const [s, value] of Object.entries(TETRAHEDRON_MPMATH)) {
    assertDigits(special.tetrahedronPeriod(s, 30), value, TETRAHEDRON_MPMATH_DIGITS, `P(${s})`);
  }
});

test('P(s) at 30 and at 48 digits agrees with an independent mpmath implementation of the spectral sum at nine s in [1/2, 2] (tests/unit/helpers/tetrahedron_spectral_mpmath.py)', () => {
  for (const [s, value] of Object.entries(TETRAHEDRON_SPECTRAL)) {
    assertDigits(special.tetrahedronPeriod(s, 30), value, 30, `P(${s}) at 30 digits`);
    assertDigits(special.tetrahedronPeriod(s, TETRAHEDRON_SPECTRAL_DIGITS), value, TETRAHEDRON_SPECTRAL_DIGITS, `P(${s}) at ${TETRAHEDRON_SPECTRAL_DIGITS} digits`);
  }
});

test('between s = 1/3 and 1/2 the continued integrals (subtracted large-t behaviour plus its integral) agree with the plain mpmath spectral sum to 38 digits', () => {
  for (const [s, value] of Object.entries(TETRAHEDRON_SPECTRAL_BELOW_HALF)) {
    assertDigits(special.tetrahedronPeriod(s, TETRAHEDRON_SPECTRAL_BELOW_HALF_DIGITS), value, TETRAHEDRON_SPECTRAL_BELOW_HALF_DIGITS, `P(${s})`);
  }
});

test('below s = 1/3 (and at 0.4) P(s) agrees to 30 digits with the mpmath helper\'s own implementation of the continued sum (tests/unit/helpers/tetrahedron_spectral_mpmath.py --continued)', () => {
  for (const [s, value] of Object.entries(TETRAHEDRON_SPECTRAL_CONTINUED)) {
    assertDigits(special.tetrahedronPeriod(s, TETRAHEDRON_SPECTRAL_CONTINUED_DIGITS), value, TETRAHEDRON_SPECTRAL_CONTINUED_DIGITS, `P(${s})`);
  }
});

test('the 30-digit value agrees with a 45-digit run to 30 digits (self-consistency of the bound)', () => {
  for (const s of ['1.6', '1.9', '0.75']) {
    const high = special.tetrahedronPeriod(s, 45);
    assertDigits(special.tetrahedronPeriod(s, 30), high.toString(), 30, `P(${s})`);
  }
});

test('the error bound certifies the digits asked for, and is below 10^-digits relative', () => {
  for (const s of ['1.75', '1.25']) {
    const r = special.tetrahedronPeriodWithBound(s, 40);
    const relative = new Wide(r.errorBound.toString()).div(new Wide(r.value.toString()).abs());
    assert.ok(relative.lt(new Wide(10).pow(-30)), `P(${s}): relative bound ${relative.toExponential(3)} not below 1e-30`);
    assert.ok(r.guaranteedDigits >= 30, `P(${s}): ${r.guaranteedDigits} guaranteed digits`);
    // the certified 30-digit value lies within the bound of the 40-digit one
    const diff = new Wide(special.tetrahedronPeriod(s, 30).toString()).minus(new Wide(r.value.toString())).abs();
    assert.ok(diff.lt(new Wide(10).pow(-28).times(new Wide(r.value.toString()))), `P(${s}) 30 vs 40 digits`);
  }
});

test('P(s) is continuous and decreasing from s = 0.4 to 2 (sanity: larger s, faster-decaying kernel)', () => {
  const grid = ['0.4', '0.5', '0.75', '1', '1.25', '1.5', '1.6', '1.75', '1.9', '2'];
  const values = grid.map((s) => new Wide(special.tetrahedronPeriod(s, 20).toString()));
  for (let i = 1; i < values.length; i++) assert.ok(values[i].lt(values[i - 1]), `P(${grid[i]}) < P(${grid[i - 1]})`);
  const left = new Wide(special.tetrahedronPeriod('1.749999', 20).toString());
  const right = new Wide(special.tetrahedronPeriod('1.750001', 20).toString());
  const mid = new Wide(special.tetrahedronPeriod('1.75', 20).toString());
  assert.ok(left.gt(mid) && mid.gt(right), 'monotone across 1.75 ± 1e-6');
  assert.ok(left.minus(right).abs().lt(1e-3), 'continuous across 1.75 ± 1e-6');
});

test('outside 0 < s ≤ 2, and at exactly s = 1/3 (a removable singularity of the representation), the period is refused with a domain error', () => {
  for (const s of ['0', '2.5', '-1']) {
    assert.throws(() => special.tetrahedronPeriod(s, 30), (e: unknown) => e instanceof EngineError && e.code === 'domain', `s = ${s}`);
  }
  assert.throws(() => special.tetrahedronPeriod({ num: 1n, den: 3n }, 30), (e: unknown) => e instanceof EngineError && e.code === 'domain', 's = 1/3');
});

test('below s = 1/2 the continued integrals give a smooth P(s) across s = 1/3 (sanity: increasing up to its maximum near s = 0.45, the two sides of 1/3 close)', () => {
  const grid = ['0.1', '0.2', '0.3', '0.3333', '0.3334', '0.35', '0.4', '0.45'];
  const values = grid.map((s) => new Wide(special.tetrahedronPeriod(s, 20).toString()));
  for (let i = 1; i < values.length; i++) assert.ok(values[i].gt(values[i - 1]), `P(${grid[i]}) > P(${grid[i - 1]})`);
  assert.ok(values[4].minus(values[3]).abs().lt(0.002), 'continuous across s = 1/3');
});
