import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runFlowJob } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const run = (job: object) => runFlowJob(job) as Any;

// Source: docs/physics.md §2 — for s < 2, Δφ = (d − s)/2 exactly (Lohmann–Slade–Wallace 2017) and
// Δφ³ = (d + s)/2 (Paulos–Rychkov–van Rees–Zan 2016), so δ = Δφ³/Δφ = (d + s)/(d − s), β = νΔφ.
test('exponents job, O(1), d = 3, s = 1.75: δ = (d + s)/(d − s) = 3.8 exactly and β = ν·(d − s)/2', () => {
  const [d, s] = [3, 1.75];
  const r = run({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', digits: 20 });
  assert.equal(Number(r.values.delta), (d + s) / (d - s));
  assert.equal(r.values.delta, '3.8');
  assert.ok(Math.abs(Number(r.values.beta) - Number(r.values.nu) * ((d - s) / 2)) < 1e-15, `β ${r.values.beta} vs ν ${r.values.nu} × ${(d - s) / 2}`);
});

test('scans agree: δ = (d + s)/(d − s) at each long-range grid point (O(1) and cubic N = 2, d = 3)', () => {
  for (const model of [{ preset: 'on', N: 1 }, { preset: 'cubic', N: 2 }]) {
    const r = run({ job: 'scan', model, d: '3', s: { from: '1.6', to: '1.8', points: 3 }, quantities: ['delta', 'beta', 'nu'], digits: 20 });
    assert.equal(r.error, undefined, JSON.stringify(r.error));
    for (const p of r.points) {
      const s = Number(p.s);
      assert.ok(Math.abs(Number(p.values.delta) - (3 + s) / (3 - s)) < 1e-15, `${model.preset} s = ${p.s}: δ ${p.values.delta}`);
      assert.ok(Math.abs(Number(p.values.beta) - Number(p.values.nu) * ((3 - s) / 2)) < 1e-15, `${model.preset} s = ${p.s}: β`);
    }
  }
});
