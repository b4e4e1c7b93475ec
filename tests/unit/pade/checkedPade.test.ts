import { test } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { checkedPade, checkedPadeTable, padeApproximant, polesInInterval } from '../../../shared/engine/pade/pade';
import { realContext } from '../../../shared/engine/precision/real';

const R = realContext(50);
const close = (actual: { toString(): string } | null | undefined, expected: string | number, tolerance: string, what: string) => {
  assert.ok(actual !== null && actual !== undefined, `${what}: no value`);
  assert.ok(new R(actual.toString()).minus(expected).abs().lte(tolerance), `${what}: ${actual.toString()} vs ${expected}`);
};

test('1/(1 − 2ε) = Σ 2^k ε^k: [0/1] is exact with its pole at ε = 1/2 (by hand); flagged at ε = 1 with the pole and a sign change, a plain value below it', () => {
  const c = ['1', '2', '4'];
  const beyond = checkedPade(c, 0, 1, '1', 20);
  assert.equal(beyond.value, null);
  assert.equal(beyond.flagged, true);
  assert.deepEqual(beyond.poles.map(String), ['0.5']);
  assert.equal(beyond.signChange, true, 'Q(1) = 1 − 2 = −1 < 0 = opposite sign to Q(0) = 1');
  assert.equal(beyond.reason, 'pole at ε = 0.5');
  const below = checkedPade(c, 0, 1, '0.4', 20);
  assert.equal(below.flagged, false);
  assert.equal(below.reason, null);
  close(below.value, 5, '1e-18', '1/(1 − 0.8) = 5');
});

test('1/(1 − 2ε)² = 1 + 4ε + 12ε² (by hand): [0/2] has a double pole at 1/2 where Q = (1 − 2ε)² touches zero without a sign change — still flagged', () => {
  const r = checkedPade(['1', '4', '12'], 0, 2, '1', 20);
  assert.equal(r.signChange, false, 'Q(1) = 1 > 0');
  assert.equal(r.flagged, true);
  assert.equal(r.value, null);
  close(r.poles[0], '0.5', '1e-9', 'double pole');
  assert.equal(r.poles.length, 1, 'one pole (a double zero), not two copies');
});

test('1/((1 − ε)(1 − 3ε)) = Σ (3^{k+1} − 1)/2 ε^k: [0/2] = 1/(1 − 4ε + 3ε²) has poles at 1/3 and 1 (by hand); at ε = 1.5, Q(ε) > 0 again and both poles are reported', () => {
  const c = ['1', '4', '13'];
  const approximant = padeApproximant(c, 0, 2, 30);
  close(approximant.denominator[1], -4, '1e-28', 'q1');
  close(approximant.denominator[2], 3, '1e-28', 'q2');
  const r = checkedPade(c, 0, 2, '1.5', 20);
  assert.equal(r.signChange, false, 'Q(1.5) = 1 − 6 + 6.75 = 1.75 > 0: a sign test alone would miss both poles');
  assert.equal(r.flagged, true);
  assert.equal(r.value, null);
  assert.equal(r.poles.length, 2);
  close(r.poles[0], new R(1).div(3).toString(), '1e-18', 'pole 1/3');
  close(r.poles[1], 1, '1e-18', 'pole 1');
  assert.equal(r.reason, 'poles at ε = 0.333333, 1');
  // before the first pole the approximant is the function itself: 1/((1 − 0.2)(1 − 0.6)) = 3.125
  close(checkedPade(c, 0, 2, '0.2', 20).value, '3.125', '1e-18', 'value at ε = 0.2');
});

test('1 + ε + 2ε²: the full table [0/1], [1/1], [0/2] at ε = 1 — poles at 1 (the end point itself), 1/2 and (√5 − 1)/2 (mpmath 1.3.0: 0.618033988749894848204586834366)', () => {
  const table = checkedPadeTable(['1', '1', '2'], 2, '1', 20);
  assert.deepEqual(table.map((e) => `[${e.L}/${e.M}]`), ['[0/1]', '[1/1]', '[0/2]']);
  assert.ok(table.every((e) => e.flagged && e.value === null));
  close(table[0].poles[0], 1, '1e-18', '[0/1]: Q = 1 − ε');
  close(table[1].poles[0], '0.5', '1e-18', '[1/1]: Q = 1 − 2ε');
  // [0/2] = 1/(1 − ε − ε²) (reciprocal series 1 − ε − ε², by hand): zero at (√5 − 1)/2
  close(table[2].poles[0], '0.618033988749894848204586834366', '1e-18', '[0/2]');
});

test('log(1 + ε) = ε − ε²/2 + ε³/3 − ε⁴/4: [2/2] = (ε + ε²/2)/(1 + ε + ε²/6) (mpmath 1.3.0 pade); poles −3 ± √3 lie below 0, so ε = 1 is clean (9/13) and ε = −2 is flagged', () => {
  const c = ['0', '1', '-0.5', new R(1).div(3).toString(), '-0.25'];
  const up = checkedPade(c, 2, 2, '1', 25);
  assert.equal(up.flagged, false);
  close(up.value, new R(9).div(13).toString(), '1e-23', '[2/2] at ε = 1');
  const down = checkedPade(c, 2, 2, '-2', 25);
  assert.equal(down.flagged, true);
  close(down.poles[0], new R(3).sqrt().minus(3).toString(), '1e-20', 'pole −3 + √3 in [−2, 0)');
});

test('a degenerate approximant is flagged with a reason; a series whose higher coefficients vanish is its own approximant', () => {
  // ω = ε − ⅔ε² has c0 = 0: [0/1] would need q1·c0 = −c1, impossible (by hand)
  const degenerate = checkedPade(['0', '1', '-0.6'], 0, 1, '0.5', 20);
  assert.equal(degenerate.flagged, true);
  assert.equal(degenerate.value, null);
  assert.match(degenerate.reason ?? '', /degenerate/);
  // η = 2 − s exactly (a constant): every [L/M] is the constant (Q = 1 satisfies the Padé equations)
  for (const entry of checkedPadeTable(['0.25', '0', '0'], 2, '0.5', 20)) assert.deepEqual([entry.flagged, entry.value?.toString()], [false, '0.25'], `[${entry.L}/${entry.M}]`);
});

test('polesInInterval finds a double zero that no sign change shows (Q = (1 − 2x)², by hand)', () => {
  const approximant = padeApproximant(['1', '4', '12'], 0, 2, 30);
  const poles = polesInInterval(approximant, '0', '3', 30);
  assert.equal(poles.length, 1);
  close(poles[0], '0.5', '1e-12', 'double zero');
});

test('[L/1] on random series: flagged exactly when the closed-form pole c_L/c_{L+1} lies in (0, ε], and never a value when flagged (fast-check)', () => {
  const coefficient = fc.integer({ min: -50, max: 50 }).filter((k) => k !== 0).map((k) => k / 10);
  fc.assert(
    fc.property(fc.array(coefficient, { minLength: 3, maxLength: 3 }), fc.integer({ min: 1, max: 30 }).map((k) => k / 10), fc.integer({ min: 0, max: 1 }), (c, eps, L) => {
      const pole = c[L] / c[L + 1]; // Q = 1 − (c_{L+1}/c_L) ε (by hand)
      if (Math.abs(pole - eps) < 1e-9) return true; // the end point itself: covered by the cases above
      const r = checkedPade(c.map(String), L, 1, String(eps), 20);
      const expected = pole > 0 && pole <= eps;
      if (r.flagged !== expected) return false;
      if (r.flagged) return r.value === null && r.reason !== null && Math.abs(Number(r.poles[0]) - pole) < 1e-12;
      // P/Q at ε written out: P = c_0 + … + c_L ε^L − (c_{L+1}/c_L)(c_0 ε + … ), Q = 1 − (c_{L+1}/c_L) ε
      const q1 = -c[L + 1] / c[L];
      const p = L === 0 ? [c[0]] : [c[0], c[1] + q1 * c[0]];
      const value = p.reduceRight((sum, x) => sum * eps + x, 0) / (1 + q1 * eps);
      return r.value !== null && Math.abs(Number(r.value) - value) <= 1e-9 * (1 + Math.abs(value));
    }),
    { numRuns: 300 },
  );
});
