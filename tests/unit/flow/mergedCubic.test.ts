import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runFlowJob } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const run = (job: object) => runFlowJob(job) as Any;

// Source: Aharony 1973 (recalled from memory): at one loop the cubic fixed point has
// v* ∝ (N − 4), so at N = 4 it coincides with the O(N) point (and the cubic eigenvalue there is 0).
// Independent check below: the one-loop cubic root solved by hand (Cramer's rule) from the printed β.
test('cubic N = 4, one loop: the cubic point is kept as a degenerate entry that coincides with O(N)', () => {
  const job = { model: { preset: 'cubic', N: 4 }, s: '1.75', loops: 1, digits: 20 };
  const flow = run({ ...job, job: 'flow' });
  const c = (k: string, m: string) => Number(flow.beta[k].find((t: Any) => t.monomial === m)?.coeff ?? 0);
  // β_u/u = −ε + a u + b v, β_v/v = −ε + e u + f v (one loop; both divisible by their coupling)
  const [a, b, e, f] = [c('u', 'u^2'), c('u', 'u*v'), c('v', 'u*v'), c('v', 'v^2')];
  const eps = 0.1;
  const det = a * f - b * e;
  const uStar = (eps * f - b * eps) / det;
  const vStar = (a * eps - e * eps) / det;
  assert.ok(Math.abs(vStar) < 1e-15 * Math.abs(uStar), `v* = ${vStar}: the cubic root sits on v = 0`);

  const r = run({ ...job, job: 'fixedpoints', d: '3.4' });
  const names = r.fixedPoints.map((p: Any) => p.name);
  assert.deepEqual([...names].sort(), ['Gaussian', 'O(N)', 'cubic', 'decoupled Ising']);
  const cubic = r.fixedPoints.find((p: Any) => p.name === 'cubic');
  const on = r.fixedPoints.find((p: Any) => p.name === 'O(N)');
  assert.equal(cubic.status, 'degenerate');
  assert.ok(cubic.notes.some((n: string) => /coincides with O\(N\)/.test(n)), JSON.stringify(cubic.notes));
  assert.ok(Math.abs(Number(cubic.couplings.u.value) - uStar) < 1e-15, `u* ${cubic.couplings.u.value} vs ${uStar}`);
  assert.equal(Number(cubic.couplings.v.value), 0);
  assert.deepEqual(cubic.couplings, on.couplings);
  assert.ok(cubic.stability.values.some((v: string) => Number(v) === 0), 'a zero stability eigenvalue');
});
