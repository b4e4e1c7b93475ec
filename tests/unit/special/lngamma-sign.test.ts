import { test } from 'node:test';
import assert from 'node:assert/strict';
import { EngineError, special } from '../../../shared/engine/index';
import { assertDigits, wide } from '../helpers/engine';
import { DIGITS_1000, LN_ABS_GAMMA_70 } from '../helpers/mpmath-values';

/** ln|Γ(x)| on the whole real line except the poles, with the sign of Γ(x) exposed separately. */

test('ln|Γ(x)| at 50 digits against mpmath log|Γ(x)| (reference library), negative and positive x', () => {
  for (const [x, { value }] of Object.entries(LN_ABS_GAMMA_70)) assertDigits(special.lnGamma(x, 50), value, 50, `ln|Gamma(${x})|`);
});

test('sign of Γ(x) against the sign of mpmath Γ(x) (reference library) and (−1)^⌈−x⌉ for x < 0 (from Γ(x) = Γ(x+1)/x, DLMF 5.5.1)', () => {
  for (const [x, { sign }] of Object.entries(LN_ABS_GAMMA_70)) assert.equal(special.gammaSign(x), sign, `sign of Gamma(${x})`);
  // between the poles −1 and 0 Γ is negative, between −2 and −1 positive, … (common practice)
  assert.equal(special.gammaSign('-0.5'), -1);
  assert.equal(special.gammaSign('-1.5'), 1);
  assert.equal(special.gammaSign('-2.5'), -1);
  assert.equal(special.gammaSign('7'), 1);
});

test('ln|Γ(−1/2)| = ln(2√π) at 100 digits (Γ(1/2) = √π, DLMF 5.4.6, and Γ(x+1) = xΓ(x), DLMF 5.5.1, give Γ(−1/2) = −2√π)', () => {
  const pi = wide(special.pi(110));
  assertDigits(special.lnGamma('-0.5', 100), pi.sqrt().times(2).ln().toString(), 100, 'ln|Gamma(-1/2)|');
});

test('ln|Γ(−3.7)| at 1000 digits against mpmath (reference library)', () => {
  assertDigits(special.lnGamma('-3.7', 1000), DIGITS_1000['lngamma|-3.7'], 1000, 'ln|Gamma(-3.7)| at 1000 digits');
});

test('gammaSign and lnGamma raise "pole" at 0, −1, −2, …', () => {
  for (const x of ['0', '-1', '-7']) {
    assert.throws(() => special.gammaSign(x), (e: unknown) => e instanceof EngineError && e.code === 'pole');
    assert.throws(() => special.lnGamma(x, 20), (e: unknown) => e instanceof EngineError && e.code === 'pole');
  }
});
