import assert from 'node:assert/strict';
import { test } from 'node:test';
import Decimal from 'decimal.js';
import { gamma } from 'mathjs';
import { runJob } from '../../../shared/jobs';
import { JOBS } from '../../../shared/jobs/contract';
import { assertDigits } from '../helpers/engine';

const D = Decimal.clone({ precision: 50 });

interface LnGammaResult {
  value: string;
  sign?: 1 | -1;
}

interface PadeEntryResult {
  L: number;
  M: number;
  value?: string;
  poles: string[];
  flagged: boolean;
  signChange?: boolean;
  reason?: string;
}

test('lngamma at −2.5 gives ln|Γ| and sign −1: Γ(−5/2) = −8√π/15 (DLMF 5.4.6 with 5.5.1)', () => {
  const r = runJob({ job: 'special', fn: 'lngamma', x: '-2.5', digits: 40 }) as LnGammaResult;
  assert.ok(JOBS.special.result.safeParse(r).success);
  assert.equal(r.sign, -1);
  // ln(8√π/15) = ln 8 + ½ ln π − ln 15, with π = arccos(−1), evaluated in decimal.js at 50 digits
  const expected = D.ln(8).plus(D.ln(D.acos(-1)).div(2)).minus(D.ln(15));
  assertDigits(r.value, expected.toString(), 40);
});

test('lngamma at −3.7 gives sign +1: ⌈3.7⌉ = 4 factors x(x+1)(x+2)(x+3) < 0 each, so Γ(−3.7) = Γ(0.3)/(+11.8881) (DLMF 5.5.1)', () => {
  const r = runJob({ job: 'special', fn: 'lngamma', x: '-3.7', digits: 20 }) as LnGammaResult;
  assert.equal(r.sign, 1);
  // (−3.7)(−2.7)(−1.7)(−0.7) = 9.99 × 1.19 = 11.8881 (hand derivation); Γ(0.3) from mathjs in double precision
  const reference = Math.log(gamma(0.3) / 11.8881);
  assert.ok(Math.abs(Number(r.value) - reference) < 1e-13, `${r.value} vs ${reference}`);
  assert.ok(gamma(-3.7) > 0, 'mathjs agrees on the sign');
});

test('gamma and lngamma at positive x: lngamma has sign +1, gamma no sign field', () => {
  assert.deepEqual(runJob({ job: 'special', fn: 'lngamma', x: '2', digits: 10 }), { value: '0', sign: 1 }); // Γ(2) = 1
  assert.deepEqual(Object.keys(runJob({ job: 'special', fn: 'gamma', x: '2.5', digits: 10 }) as object), ['value']);
});

test('pade: [0/1] of 1/(1 − 2x) = 1 + 2x + 4x² + … has its pole at x = 1/2; at x = 1 it is flagged with the pole and no value', () => {
  // [0/1]: q₁ = −c₁/c₀ = −2, so Q = 1 − 2x, zero at x = 1/2 ∈ (0, 1]; Q(1) = −1 < 0 (hand derivation)
  const entry = runJob({ job: 'pade', coeffs: ['1', '2'], L: 0, M: 1, at: '1', digits: 15 }) as PadeEntryResult;
  assert.ok(JOBS.pade.result.safeParse(entry).success);
  assert.equal(entry.flagged, true);
  assert.equal(entry.value, undefined);
  assert.deepEqual(entry.poles.map(Number), [0.5]);
  assert.equal(entry.signChange, true);
  assert.match(entry.reason ?? '', /pole at ε = 0\.5/);
  // before the pole the same approximant is continued from 0: 1/(1 − 2·0.25) = 2
  const before = runJob({ job: 'pade', coeffs: ['1', '2'], L: 0, M: 1, at: '0.25', digits: 15 }) as PadeEntryResult;
  assert.equal(before.flagged, false);
  assert.equal(Number(before.value), 2);
});

test('pade table of 1 + 2x + 4x² at x = 1: every [L/M] with L + M ≤ 2; the polynomials have values, every approximant with a denominator is flagged', () => {
  const { table } = runJob({ job: 'pade', coeffs: ['1', '2', '4'], at: '1', digits: 15 }) as { table: PadeEntryResult[] };
  assert.deepEqual(table.map((e) => `${e.L}/${e.M}`), ['0/0', '1/0', '0/1', '2/0', '1/1', '0/2']);
  // partial sums at x = 1: 1, 1 + 2, 1 + 2 + 4; [1/1] and [0/2] both reduce to 1/(1 − 2x) (geometric series)
  const values = Object.fromEntries(table.filter((e) => !e.flagged).map((e) => [`${e.L}/${e.M}`, Number(e.value)]));
  assert.deepEqual(values, { '0/0': 1, '1/0': 3, '2/0': 7 });
  for (const e of table.filter((entry) => entry.M > 0)) {
    assert.equal(e.flagged, true, `${e.L}/${e.M}`);
    assert.equal(e.value, undefined);
    assert.deepEqual(e.poles.map(Number), [0.5]);
  }
});

test('pade table: a degenerate approximant is one flagged entry with its reason, not a failed job', () => {
  // 1 + x²: [1/1] needs q₁c₁ = −c₂, i.e. 0 = −1: no solution (hand derivation)
  const { table } = runJob({ job: 'pade', coeffs: ['1', '0', '1'], at: '0.5', digits: 10 }) as { table: PadeEntryResult[] };
  const degenerate = table.find((e) => e.L === 1 && e.M === 1);
  assert.equal(degenerate?.flagged, true);
  assert.equal(degenerate?.value, undefined);
  assert.match(degenerate?.reason ?? '', /singular/);
  // [0/2] = 1/(1 − x²) at 0.5: 1/(1 − 1/4) = 4/3
  assert.equal(Number(table.find((e) => e.L === 0 && e.M === 2)?.value).toFixed(9), (4 / 3).toFixed(9));
});
