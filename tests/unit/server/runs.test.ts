import 'reflect-metadata';
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { pino } from 'pino';
import type { DataSource } from 'typeorm';
import { openDatabase } from '../../../server/db/data-source';
import type { JobRunner } from '../../../server/jobs/runner';
import { createRunService, failInterruptedRuns, jobHash } from '../../../server/services/runs';
import { JobRun } from '../../../server/db/entities';

/** A runner standing in for the worker pool: answers from a script, so each failure path is exact. */
function scriptedRunner(answer: (job: unknown) => Promise<unknown>): JobRunner {
  return { run: (job, hooks) => (hooks.onStarted?.(), answer(job)), close: async () => {} };
}

describe('runs service (results, failures, cache)', () => {
  let dataSource: DataSource;
  before(async () => {
    dataSource = await openDatabase(':memory:');
  });
  after(() => dataSource.destroy());

  test('a worker that crashes marks the run failed with a reason, and the next run still works', async () => {
    let calls = 0;
    const runs = createRunService(dataSource, scriptedRunner(async () => {
      calls += 1;
      if (calls === 1) throw new Error('worker exited with code 1');
      return { value: '42' };
    }), pino({ level: 'silent' }), 10_000);
    const crashed = await runs.settle((await runs.submit({ job: { job: 'a' }, userId: 'u' })).id, 5000);
    assert.equal(crashed.status, 'failed');
    assert.equal(JSON.parse(crashed.errorJson!).code, 'worker-crashed');
    const next = await runs.settle((await runs.submit({ job: { job: 'b' }, userId: 'u' })).id, 5000);
    assert.deepEqual([next.status, JSON.parse(next.resultJson!)], ['done', { value: '42' }]);
  });

  test('an engine error is a failed run carrying the engine message, and is not cached', async () => {
    const runs = createRunService(dataSource, scriptedRunner(async () => ({ error: { code: 'pole', message: 'Gamma has a pole at -1' } })), pino({ level: 'silent' }), 10_000);
    const first = await runs.settle((await runs.submit({ job: { job: 'c' }, userId: 'u' })).id, 5000);
    assert.deepEqual(JSON.parse(first.errorJson!), { code: 'pole', message: 'Gamma has a pole at -1' });
    const again = await runs.submit({ job: { job: 'c' }, userId: 'u' });
    assert.equal(again.cached, false);
  });

  test('the cache key ignores key order but not values (canonical JSON + engine version)', () => {
    assert.equal(jobHash({ a: 1, b: [1, 2] }), jobHash({ b: [1, 2], a: 1 }));
    assert.notEqual(jobHash({ a: 1 }), jobHash({ a: 2 }));
  });

  test('runs left open by a stopped server are failed at the next start', async () => {
    await dataSource.getRepository(JobRun).insert({ id: 'open1', inputHash: 'x', engineVersion: 'v', jobJson: '{}', status: 'running', progress: 0.5, cached: false });
    await failInterruptedRuns(dataSource);
    const run = await dataSource.getRepository(JobRun).findOneByOrFail({ id: 'open1' });
    assert.equal(run.status, 'failed');
    assert.equal(JSON.parse(run.errorJson!).code, 'interrupted');
  });
});
