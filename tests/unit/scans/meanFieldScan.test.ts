import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runFlowJob } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const run = (job: object) => runFlowJob(job) as Any;
const ALL = ['nuInv', 'omega', 'eta', 'Delta_phi', 'Delta_phi2', 'Delta_phi3', 'Delta_phi4', 'nu', 'gamma', 'alpha', 'beta', 'delta'];

/**
 * Gaussian/Landau values for s ≤ d/2 (common practice: the quartic coupling is irrelevant; docs/physics.md
 * §Regimes): composite operators have Gaussian dimensions, so Δ_{φ³} = 3Δ_φ = 3(d − s)/2.
 */
function meanField(d: number, s: number): Record<string, number> {
  return { nuInv: s, nu: 1 / s, eta: 2 - s, omega: d - 2 * s, Delta_phi: (d - s) / 2, Delta_phi2: d - s, Delta_phi3: (3 * (d - s)) / 2, Delta_phi4: 2 * (d - s), gamma: 1, alpha: 0, beta: 0.5, delta: 3 };
}

for (const model of [{ preset: 'on', N: 1 }, { preset: 'cubic', N: 2 }]) {
  test(`scan ${model.preset}: points with s ≤ d/2 carry the exact mean-field values and stay flagged (d = 3, s = 1.3, 1.4, 1.5)`, () => {
    const r = run({ job: 'scan', model, d: '3', s: { from: '1.3', to: '1.5', points: 3 }, quantities: ALL, digits: 20 });
    assert.equal(r.error, undefined, JSON.stringify(r.error));
    for (const p of r.points) {
      assert.equal(p.regime, 'mean-field');
      assert.equal(p.flagged, true);
      const expected = meanField(3, Number(p.s));
      for (const k of ALL) assert.ok(Math.abs(Number(p.values[k]) - expected[k]) < 1e-15, `${model.preset} s = ${p.s} ${k}: ${p.values[k]} vs ${expected[k]}`);
    }
    assert.equal(r.points[0].values.nuInv, '1.3');
    assert.equal(r.points[0].values.omega, '0.4', 'ω = d − 2s = −ε');
    // s < d/2: Gaussian regime; s = d/2: d = 2s is the upper critical dimension (logarithmic corrections; common practice)
    assert.deepEqual(r.points.map((p: Any) => p.notices), [['mean-field'], ['mean-field'], ['upper-critical-dimension']]);
    assert.deepEqual(r.notices.map((n: Any) => n.kind), ['mean-field', 'upper-critical-dimension']);
    assert.match(r.notices[1].message, /^At s = 1\.5: .*upper critical dimension.*logarithmic corrections/);
    assert.match(r.marks.meanFieldEndNote, /upper critical dimension.*logarithmic/);
  });
}
