import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runFlowJob, isFlowJob } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const run = (job: object) => runFlowJob(job) as Any;

test('exponents job: contract shape, N = 1, d = 3, s = 7/4 (values are truncated series at ε = 1/2)', () => {
  const r = run({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', digits: 20 });
  assert.equal(r.eps, '0.5');
  for (const k of ['nuInv', 'omega', 'eta', 'Delta_phi2', 'Delta_phi4']) assert.equal(r.series[k].length, 3, k);
  for (const k of ['nuInv', 'nu', 'eta', 'gamma', 'alpha', 'beta', 'delta', 'omega', 'Delta_phi', 'Delta_phi2', 'Delta_phi3', 'Delta_phi4']) assert.equal(typeof r.values[k], 'string', k);
  assert.equal(r.values.Delta_phi, '0.625', 'Δφ = (d − s)/2 exactly (docs/physics.md §2)');
  assert.equal(r.values.Delta_phi3, '2.375', 'Δφ³ = d − Δφ (docs/physics.md §2)');
  assert.equal(r.series.nuInv[1], '-0.33333333333333333333', '−ε/3 (Fisher–Ma–Nickel 1972)');
});

test('exponents job symbolic in N and s returns {expr, latex} coefficients', () => {
  const r = run({ job: 'exponents', model: { preset: 'on', N: 'N' } });
  assert.equal(r.series.nuInv[0].expr, 's');
  assert.match(r.series.nuInv[1].expr, /N \+ 2|N \+ 8/);
  assert.equal(typeof r.series.omega[2].latex, 'string');
});

test('flow job: β per coupling and a readable derivation trail', () => {
  const r = run({ job: 'flow', model: { preset: 'on', N: 'N' } });
  assert.deepEqual(r.couplings, ['u']);
  assert.equal(r.trail.length, 7);
  const bubble = r.trail.find((t: Any) => t.graph === 'bubble');
  assert.equal(bubble.symmetryFactor, '1/2');
  assert.match(bubble.integral, /G/);
  assert.ok(r.checks.length >= 3);
  const corrected = r.trail.find((t: Any) => t.graph === 'vertexCorrected');
  assert.equal(corrected.counterterms.length, 1);
});

test('fixedpoints job: the cubic model at N = 3, d = 3.9, s = 2 has four fixed points; O(N) is the stable one', () => {
  const r = run({ job: 'fixedpoints', model: { preset: 'cubic', N: 3 }, d: '3.9', s: '2', digits: 20 });
  assert.deepEqual(r.fixedPoints.map((p: Any) => p.name).sort(), ['Gaussian', 'O(N)', 'cubic', 'decoupled Ising']);
  assert.deepEqual(r.fixedPoints.filter((p: Any) => p.stable).map((p: Any) => p.name), ['O(N)']);
});

test('mean-field statement for d ≥ 2s', () => {
  const r = run({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '3', s: '1.4' });
  assert.equal(r.meanField, true);
  assert.match(r.statement, /mean-field exponents are exact/);
  assert.equal(r.values.Delta_phi, '0.8');
});

test('scan job marks s = d/2 and s* = d − 2Δσ and flags points outside the window', () => {
  const r = run({ job: 'scan', model: { preset: 'on', N: 1 }, d: '3', s: { from: '1.45', to: '1.99', points: 4 }, quantities: ['nuInv', 'omega'], shortRange: { Delta_sigma: '0.5181489' }, digits: 20 });
  assert.equal(r.marks.meanFieldEnd, '1.5');
  assert.equal(r.marks.sStar, '1.9637022', 's* = 3 − 2·0.5181489 (docs/physics.md §7)');
  assert.deepEqual(r.points.map((p: Any) => p.regime), ['mean-field', 'long-range', 'long-range', 'short-range']);
});

test('bad jobs give clear errors', () => {
  const code = (job: object) => run(job).error?.code;
  assert.equal(code({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '3', s: '2.5' }), 'domain');
  assert.equal(code({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '3', s: '0' }), 'domain');
  assert.equal(code({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '-1', s: '1.5' }), 'domain');
  assert.equal(code({ job: 'flow', model: { preset: 'custom', fields: 2, potential: 'u*phi1^3' } }), 'invalid-job');
  assert.equal(code({ job: 'flow', model: { preset: 'custom', fields: 2, potential: 'u*phi1^4 + x' } }), 'invalid-job');
  assert.equal(code({ job: 'flow', model: { preset: 'on', N: 2e6 } }), 'invalid-job');
  assert.equal(code({ job: 'scan', model: { preset: 'on', N: 1 }, d: '3', s: { from: '1.5', to: '1.9', points: 5000 } }), 'invalid-job');
  assert.equal(code({ job: 'flow', model: { preset: 'on', N: 1 }, extra: 1 }), 'invalid-job');
  assert.equal(isFlowJob({ job: 'special' }), false);
});
