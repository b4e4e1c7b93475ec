import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runFlowJob } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const run = (job: object) => runFlowJob(job) as Any;

// Source: Aharony 1973 (recalled from memory): at one loop the cubic fixed point has
// v* ∝ (N − 4), so at N = 4 it coincides with the O(N) point (and the cubic eigenvalue there is 0).
// Independent check below: the one-loop cubic root solved by hand (Cramer's rule) from the printed β.
test('cubic N = 4, one loop: the cubic point coincides with O(N); listed once, degenerate, with a caveat naming both', () => {
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
  assert.deepEqual(r.fixedPoints.map((p: Any) => p.name).sort(), ['Gaussian', 'O(N)', 'decoupled Ising']);
  const on = r.fixedPoints.find((p: Any) => p.name === 'O(N)');
  assert.equal(on.status, 'degenerate');
  assert.ok(on.caveats.some((x: Any) => x.kind === 'degenerate-one-loop' && /O\(N\) and cubic coincide at one loop/.test(x.message)), JSON.stringify(on.caveats));
  assert.ok(Math.abs(Number(on.couplings.u.value) - uStar) < 1e-15, `u* ${on.couplings.u.value} vs ${uStar}`);
  assert.equal(on.couplings.u.value, '0.025'); // ε/4 exactly (a = (N+8)/3 = 4)
  assert.equal(on.couplings.v.value, '0');
  // the marginal direction: an exactly zero eigenvalue prints "0"; its sign undecided, so stable = null
  assert.deepEqual([...on.stability.values].sort(), ['0', '0.1']);
  assert.equal(on.stable, null);
});
