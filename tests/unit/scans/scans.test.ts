import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runFlowJob } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const run = (job: object) => runFlowJob(job) as Any;
const QUANTITIES = ['nuInv', 'omega', 'eta', 'Delta_phi2', 'nu'];

test('cubic N = 2 scan: the point at s = 1.75 equals the exponents job at s = 1.75 (independent path: direct job), IR-stable default and the named cubic point', () => {
  for (const fixedPoint of [undefined, 'cubic']) {
    const scan = run({ job: 'scan', model: { preset: 'cubic', N: 2 }, d: '3', s: { from: '1.6', to: '1.9', points: 3 }, quantities: QUANTITIES, digits: 20, ...(fixedPoint ? { fixedPoint } : {}) });
    assert.equal(scan.error, undefined, JSON.stringify(scan.error));
    const direct = run({ job: 'exponents', model: { preset: 'cubic', N: 2 }, d: '3', s: '1.75', digits: 20, ...(fixedPoint ? { fixedPoint } : {}) });
    const point = scan.points[1];
    assert.equal(point.s, '1.75');
    assert.equal(point.fixedPoint, direct.fixedPoint, 'same fixed point chosen');
    for (const k of QUANTITIES) {
      assert.equal(point.values[k], direct.values[k], `${fixedPoint ?? 'stable'} ${k}`);
      // the scan's Padé is the [1/1] entry of the exponents job's checked table
      const entry = direct.pade[k].find((e: Any) => e.L === 1 && e.M === 1);
      assert.equal(point.pade[k], entry.value, `${fixedPoint ?? 'stable'} Padé ${k}`);
    }
  }
});

test('a two-coupling custom potential (φ²)² + φ1⁴ + φ2⁴ at its "u only" point, and the single-coupling O(2) tensor, scan identically to the O(2) preset', () => {
  const grid = { d: '3', s: { from: '1.55', to: '1.95', points: 3 }, quantities: ['nuInv', 'omega', 'Delta_phi2'], digits: 20 };
  const preset = run({ job: 'scan', model: { preset: 'on', N: 2 }, ...grid });
  const two = run({ job: 'scan', model: { preset: 'custom', fields: 2, potential: 'u/24*(phi1^2+phi2^2)^2 + v/24*(phi1^4+phi2^4)' }, fixedPoint: 'u only', ...grid });
  const one = run({ job: 'scan', model: { preset: 'custom', fields: 2, potential: 'u/24*(phi1^2+phi2^2)^2' }, ...grid });
  assert.equal(two.error, undefined, JSON.stringify(two.error));
  preset.points.forEach((p: Any, i: number) => {
    for (const k of ['nuInv', 'Delta_phi2']) {
      assert.equal(one.points[i].values[k], p.values[k], `one coupling ${k} at s = ${p.s}`);
      assert.equal(two.points[i].values[k], p.values[k], `two couplings ${k} at s = ${p.s}`);
    }
    assert.equal(one.points[i].values.omega, p.values.omega, `one coupling ω at s = ${p.s}`);
  });
});

test('multi-coupling scan marks s = d/2 and s* = d − 2Δσ and flags points outside the window, as the single-coupling scan does', () => {
  const r = run({ job: 'scan', model: { preset: 'cubic', N: 3 }, d: '3', s: { from: '1.45', to: '1.99', points: 4 }, quantities: ['nuInv'], shortRange: { Delta_sigma: '0.5181489' }, digits: 20 });
  assert.equal(r.marks.meanFieldEnd, '1.5');
  assert.equal(r.marks.sStar, '1.9637022', 's* = 3 − 2·0.5181489 (docs/physics.md §7)');
  assert.deepEqual(r.points.map((p: Any) => p.regime), ['mean-field', 'long-range', 'long-range', 'short-range']);
  assert.deepEqual(r.points.map((p: Any) => p.flagged), [true, false, false, true]);
  assert.ok(r.points.every((p: Any) => typeof p.values.nuInv === 'string'));
});
