import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runFlowJob } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const run = (job: object) => runFlowJob(job) as Any;

// Source (hand computation): (φ1² + φ2²)² = φ1⁴ + φ2⁴ + 2φ1²φ2², so u/24(φ1⁴ + φ2⁴) + v/4 φ1²φ2² is the
// O(2) tensor exactly when v = u/3; and u/24(φ1² + φ2²)² is O(2) for any u.
const POTENTIALS = ['u/24*(phi1^4+phi2^4) + v/4*phi1^2*phi2^2', 'u/24*(phi1^2+phi2^2)^2 + v/24*(phi1^4+phi2^4)'];

for (const potential of POTENTIALS) {
  for (const s of ['1.75', '1.9']) {
    test(`custom fixed-point names are unique and the O(2)-symmetric point is named O(2): ${potential}, s = ${s}`, () => {
      const r = run({ job: 'fixedpoints', model: { preset: 'custom', fields: 2, potential }, d: '3', s, loops: 2, digits: 20 });
      assert.equal(r.error, undefined, JSON.stringify(r.error));
      const names = r.fixedPoints.map((p: Any) => p.name);
      assert.equal(new Set(names).size, names.length, `unique: ${names.join(' | ')}`);
      const on = r.fixedPoints.filter((p: Any) => /O\(2\)/.test(p.name));
      assert.equal(on.length, 1, names.join(' | '));
      // independent check of the symmetry on its one-loop couplings (ε¹ coefficients)
      const [u1, v1] = ['u', 'v'].map((c) => Number(on[0].couplings[c].series[1]));
      if (potential === POTENTIALS[0]) assert.ok(Math.abs(v1 - u1 / 3) < 1e-15, `v = u/3: ${u1}, ${v1}`);
      else assert.equal(v1, 0);
    });
  }
}

test('a point can still be named by its plain (pre-disambiguation) name: "u only" for the O(2) (u only) point', () => {
  const r = run({ job: 'exponents', model: { preset: 'custom', fields: 2, potential: POTENTIALS[1] }, d: '3', s: '1.75', digits: 20, fixedPoint: 'u only' });
  assert.equal(r.error, undefined, JSON.stringify(r.error));
  assert.equal(r.fixedPoint, 'O(2) (u only)');
});
