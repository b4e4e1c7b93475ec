import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { RunAborted, createWorkerPoolRunner } from '../../../server/jobs/runner';
import { WARM_UP_JOBS } from '../../../server/jobs/worker';
import { runJob } from '../../../shared/jobs';

const gammaAt = (x: string) => ({ job: 'special', fn: 'gamma', x, digits: 20 });
const hooks = () => ({ signal: new AbortController().signal });

describe('engine worker pool', () => {
  test('ready() resolves once every thread has warmed up its engine, and the pool then runs jobs', async () => {
    const runner = createWorkerPoolRunner({ threads: 2 });
    try {
      await runner.ready!();
      const results = await Promise.all([runner.run(gammaAt('5'), hooks()), runner.run(gammaAt('6'), hooks())]);
      // Γ(n) = (n − 1)!: Γ(5) = 24, Γ(6) = 120 (DLMF 5.4.1)
      assert.deepEqual(results, [{ value: '24.000000000000000000' }, { value: '120.00000000000000000' }]);
    } finally {
      await runner.close();
    }
  });

  test('the warm-up jobs run the two-loop exponents path and give its exact long-range values', () => {
    for (const job of WARM_UP_JOBS) {
      const result = runJob(job) as { values: Record<string, string>; series: Record<string, string[]> };
      // docs/physics.md §2: η = 2 − s and Δφ = (d − s)/2 exactly; at d = 3, s = 1.7: 0.3 and 0.65
      assert.equal(result.values.eta, '0.3');
      assert.equal(result.values.Delta_phi, '0.65');
      // docs/physics.md §5, O(N) at N = 2: 1/ν = s − (N + 2)/(N + 8) ε − …, so the ε coefficient is −4/10
      assert.equal(result.series.nuInv[1], '-0.4');
      // §5: the ε² coefficients of 1/ν and ω share A(s); their ratio is (N + 2)(7N + 20) / (2(5N + 22)(N + 8)) = 136/640
      const ratio = Number(result.series.nuInv[2]) / Number(result.series.omega[2]);
      assert.ok(Math.abs(ratio - 136 / 640) < 1e-12, `ratio ${ratio}`);
    }
  });

  test('a job stopped while it runs rejects with RunAborted, and the thread put in its place runs the next job', async () => {
    const runner = createWorkerPoolRunner({ threads: 1 });
    try {
      await runner.ready!();
      const abort = new AbortController();
      const longScan = { job: 'scan', model: { preset: 'cubic', N: 3 }, d: '3', s: { from: '1.55', to: '2', points: 200 }, digits: 40, quantities: ['nuInv', 'omega', 'eta'] };
      await assert.rejects(runner.run(longScan, { signal: abort.signal, onStarted: () => abort.abort(new Error('stopped by the test')) }), RunAborted);
      // Γ(4) = 3! = 6 (DLMF 5.4.1)
      assert.deepEqual(await runner.run(gammaAt('4'), hooks()), { value: '6.0000000000000000000' });
    } finally {
      await runner.close();
    }
  });
});
