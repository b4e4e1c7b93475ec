import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runFlowJob } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const run = (job: object) => runFlowJob(job) as Any;

// Shape as for the exponents job (issue 4 §6: omit s and d and/or give "N":"N" for symbolic coefficients).
test('fixedpoints job with symbolic N and no s/d: symbolic ε-series, no values (same shape as exponents)', () => {
  const r = run({ job: 'fixedpoints', model: { preset: 'on', N: 'N' } });
  assert.equal(r.error, undefined, JSON.stringify(r.error));
  assert.equal(r.eps, 'eps');
  assert.equal(r.meanField, false);
  assert.deepEqual(r.fixedPoints.map((p: Any) => p.name).sort(), ['Gaussian', 'O(N)']);
  const wf = r.fixedPoints.find((p: Any) => p.name === 'O(N)');
  assert.equal(wf.couplings.u.value, null);
  assert.equal(wf.stability.values, null);
  assert.equal(typeof wf.couplings.u.series[1].expr, 'string');
  // one-loop root u₁ = 3/(N + 8) (docs/physics.md §5: β = −εu + (N+8)/3 u² + …)
  assert.match(wf.couplings.u.series[1].expr.replace(/\s/g, ''), /3\/\(N\+8\)|3\*\(N\+8\)\^-1/);
  assert.equal(typeof wf.stability.series[0][2].latex, 'string');
});

test('fixedpoints job: cubic with symbolic N and no s/d lists the four points; s without d gives numeric series without values; d without s is rejected', () => {
  const cubic = run({ job: 'fixedpoints', model: { preset: 'cubic', N: 'N' } });
  assert.equal(cubic.error, undefined, JSON.stringify(cubic.error));
  assert.deepEqual(cubic.fixedPoints.map((p: Any) => p.name).sort(), ['Gaussian', 'O(N)', 'cubic', 'decoupled Ising']);
  const numericS = run({ job: 'fixedpoints', model: { preset: 'on', N: 1 }, s: '1.75' });
  assert.equal(numericS.eps, 'eps');
  const ising = numericS.fixedPoints.find((p: Any) => p.name !== 'Gaussian');
  assert.equal(ising.couplings.u.value, null);
  assert.equal(typeof ising.couplings.u.series[1], 'string');
  assert.equal(run({ job: 'fixedpoints', model: { preset: 'on', N: 1 }, d: '3' }).error.code, 'invalid-job');
});
