import { test } from 'node:test';
import assert from 'node:assert/strict';
import { EngineError, special } from '../../../shared/engine/index';
import { assertDigits } from '../helpers/engine';
import { DIGITS_1000, ZETA_70, ZETA_NEAR_POLE_70 } from '../helpers/mpmath-values';

/** ζ(x) for every real x ≠ 1: the functional equation on the negative axis (DLMF 25.4.1–25.4.2), Borwein's series on (0, 1) ∪ (1, ∞). */

test('ζ(x) at 50 digits against mpmath (reference library): large, near 1 from both sides, (0, 1), negative', () => {
  for (const [x, value] of Object.entries(ZETA_70)) assertDigits(special.zeta(x, 50), value, 50, `zeta(${x})`);
});

test('ζ(1 ± 10⁻⁴⁰) at 50 digits: 1 − 2^{1−x} cancels, the working precision grows by the lost bits (mpmath at 400 digits)', () => {
  for (const [x, value] of Object.entries(ZETA_NEAR_POLE_70)) assertDigits(special.zeta(x, 50), value, 50, `zeta(${x})`);
});

test('trivial zeros ζ(−2n) = 0 exactly (DLMF 25.6.4), ζ(0) = −1/2 (DLMF 25.6.1), ζ(−1) = −1/12, ζ(−3) = 1/120 (DLMF 25.6.3)', () => {
  for (const x of ['-2', '-4', '-100', '-1000000000000']) assert.ok(special.zeta(x, 30).isZero(), `zeta(${x}) = 0`);
  assert.equal(special.zeta('0', 20).toString(), '-0.5');
  assertDigits(special.zeta('-1', 40), '-0.083333333333333333333333333333333333333333333333', 40, 'zeta(-1)');
  assertDigits(special.zeta('-3', 40), '0.0083333333333333333333333333333333333333333333333', 40, 'zeta(-3)');
});

test('ζ(−7.25) at 1000 digits against mpmath (reference library)', () => {
  assertDigits(special.zeta('-7.25', 1000), DIGITS_1000['zeta|-7.25'], 1000, 'zeta(-7.25) at 1000 digits');
});

test('ζ has a pole at x = 1', () => {
  assert.throws(() => special.zeta('1', 20), (e: unknown) => e instanceof EngineError && e.code === 'pole');
});
