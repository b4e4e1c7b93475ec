import 'reflect-metadata';
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { pino } from 'pino';
import type { DataSource } from 'typeorm';
import { openDatabase } from '../../../server/db/data-source';
import type { JobQueueConfig } from '../../../server/config';
import { RunAborted, WorkerTimeLimit, type JobRunner } from '../../../server/jobs/runner';
import { FairQueue } from '../../../server/jobs/scheduler';
import { AppError } from '../../../server/http/errors';
import { createRunService, failInterruptedRuns, jobHash } from '../../../server/services/runs';
import { JobRun } from '../../../server/db/entities';
import { RESULT_LIMITS } from '../../../shared/jobs/contract';

const queueLimits = (overrides: Partial<JobQueueConfig> = {}): JobQueueConfig => ({
  threads: 1, timeLimitMs: 10_000, perUserQueued: 3, perUserRunning: 1, queueWaitLimitMs: 60_000, ...overrides,
});

/** A small, valid engine job; `x` tells the jobs apart (and keeps them out of each other's cache). */
const gammaAt = (x: string) => ({ job: 'special', fn: 'gamma', x, digits: 20 });

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
    }), pino({ level: 'silent' }), queueLimits());
    const crashed = await runs.settle((await runs.submit({ job: gammaAt('1.01'), userId: 'u' })).id, 5000);
    assert.equal(crashed.status, 'failed');
    assert.equal(JSON.parse(crashed.errorJson!).code, 'worker-crashed');
    const next = await runs.settle((await runs.submit({ job: gammaAt('1.02'), userId: 'u' })).id, 5000);
    assert.deepEqual([next.status, JSON.parse(next.resultJson!)], ['done', { value: '42' }]);
  });

  test('a job its worker stopped at the time limit fails with code time-limit, not as a crash, and is not cached', async () => {
    const runs = createRunService(dataSource, scriptedRunner(async () => {
      throw new WorkerTimeLimit('stopped by its worker after 605 s');
    }), pino({ level: 'silent' }), queueLimits());
    const stopped = await runs.settle((await runs.submit({ job: gammaAt('1.04'), userId: 'u' })).id, 5000);
    assert.equal(stopped.status, 'failed');
    const error = JSON.parse(stopped.errorJson!) as { code: string; message: string };
    assert.equal(error.code, 'time-limit');
    assert.match(error.message, /stopped by its worker after 605 s/);
    assert.equal((await runs.submit({ job: gammaAt('1.04'), userId: 'u' })).cached, false);
  });

  test('an engine error is a failed run carrying the engine message, and is not cached', async () => {
    const runs = createRunService(dataSource, scriptedRunner(async () => ({ error: { code: 'pole', message: 'Gamma has a pole at -1' } })), pino({ level: 'silent' }), queueLimits());
    const first = await runs.settle((await runs.submit({ job: gammaAt('1.03'), userId: 'u' })).id, 5000);
    assert.deepEqual(JSON.parse(first.errorJson!), { code: 'pole', message: 'Gamma has a pole at -1' });
    const again = await runs.submit({ job: gammaAt('1.03'), userId: 'u' });
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

/** Jobs in the order take() hands them out, finishing each at once (one worker). */
function drain(queue: FairQueue<null>): string[] {
  const order: string[] = [];
  for (let job = queue.take(); job; job = queue.take()) {
    order.push(job.id);
    queue.finished(job.userId);
  }
  return order;
}

describe('fair queue (who gets the next worker)', () => {
  const add = (queue: FairQueue<null>, userId: string, ...ids: string[]) => ids.forEach((id) => queue.enqueue({ id, userId, queuedAt: 0, item: null }));

  test('people take turns, each in their own arrival order (round-robin over per-person FIFOs)', () => {
    const queue = new FairQueue<null>({ threads: 1, perUserRunning: 1 });
    add(queue, 'A', 'a1', 'a2', 'a3');
    add(queue, 'B', 'b1', 'b2');
    add(queue, 'C', 'c1');
    // Round-robin by definition: one from each person per round, in the order they first arrived.
    assert.deepEqual(drain(queue), ['a1', 'b1', 'c1', 'a2', 'b2', 'a3']);
  });

  test('a newcomer goes before the rest of a long queue whose owner has just been served', () => {
    const queue = new FairQueue<null>({ threads: 1, perUserRunning: 1 });
    add(queue, 'A', 'a1', 'a2', 'a3', 'a4');
    const first = queue.take()!;
    assert.equal(first.id, 'a1');
    add(queue, 'B', 'b1');
    assert.equal(queue.take(), null, 'the one worker is busy');
    assert.deepEqual([queue.ahead('b1'), queue.ahead('a2'), queue.ahead('a4')], [0, 1, 3]);
    queue.finished('A');
    assert.deepEqual(drain(queue), ['b1', 'a2', 'a3', 'a4']);
  });

  test('a person at their running limit leaves the free worker to someone else', () => {
    const queue = new FairQueue<null>({ threads: 2, perUserRunning: 1 });
    add(queue, 'A', 'a1', 'a2');
    assert.equal(queue.take()!.id, 'a1');
    assert.equal(queue.take(), null, 'A already runs one job; a2 waits although a worker is free');
    add(queue, 'B', 'b1');
    assert.equal(queue.take()!.id, 'b1');
    assert.deepEqual([queue.running, queue.queued, queue.runningBy('A'), queue.queuedBy('A')], [2, 1, 1, 1]);
  });

  test('a removed job is out of the queue and out of everyone\'s count', () => {
    const queue = new FairQueue<null>({ threads: 1, perUserRunning: 1 });
    add(queue, 'A', 'a1', 'a2', 'a3');
    assert.equal(queue.remove('a2')!.id, 'a2');
    assert.equal(queue.remove('a2'), null);
    assert.equal(queue.ahead('a3'), 1);
    assert.deepEqual(drain(queue), ['a1', 'a3']);
  });
});

/** A runner whose jobs end only when the test says so; records the order in which jobs start. */
function heldRunner() {
  const started: string[] = [];
  const release = new Map<string, () => void>();
  const runner: JobRunner = {
    run: (job, { signal, onStarted }) =>
      new Promise((resolve, reject) => {
        const x = (job as { x: string }).x;
        started.push(x);
        onStarted?.();
        release.set(x, () => resolve({ value: x }));
        signal.addEventListener('abort', () => reject(new RunAborted(String((signal.reason as Error)?.message))));
      }),
    close: async () => {},
  };
  return { runner, started, finish: (x: string) => release.get(x)!() };
}

async function until(condition: () => boolean, timeoutMs = 5000) {
  const deadline = Date.now() + timeoutMs;
  while (!condition()) {
    if (Date.now() > deadline) throw new Error('condition not met in time');
    await new Promise((resolve) => setTimeout(resolve, 5));
  }
}

describe('runs service queue (limits, fairness, wait limit, cancel)', () => {
  let dataSource: DataSource;
  before(async () => {
    dataSource = await openDatabase(':memory:');
  });
  after(() => dataSource.destroy());
  const silent = pino({ level: 'silent' });

  test('one person\'s full queue: their next job is refused, another person\'s job runs next', async () => {
    const { runner, started, finish } = heldRunner();
    const runs = createRunService(dataSource, runner, silent, queueLimits({ perUserQueued: 3 }));
    const a = [];
    for (const x of ['2.1', '2.2', '2.3', '2.4']) a.push(await runs.submit({ job: gammaAt(x), userId: 'A' }));
    assert.deepEqual(started, ['2.1'], 'one worker: A\'s first job runs, three wait');
    await assert.rejects(runs.submit({ job: gammaAt('2.5'), userId: 'A' }), (error: unknown) => {
      assert.ok(error instanceof AppError);
      assert.equal(error.code, 'queue_full');
      assert.match(error.message, /3 jobs waiting.*limit is 3/);
      return true;
    });
    const b = await runs.submit({ job: gammaAt('2.6'), userId: 'B' });
    const bView = runs.view(b);
    assert.equal(bView.status, 'queued');
    assert.equal(bView.queue!.ahead, 0, 'B waits only for the running job, not for A\'s queue');
    assert.equal(runs.view(await runs.find(a[3].id)).queue!.ahead, 3, 'A\'s last job: its two earlier ones and B\'s go first');
    finish('2.1');
    await until(() => started.length === 2);
    assert.deepEqual(started, ['2.1', '2.6']);
    finish('2.6');
    assert.equal((await runs.settle(b.id, 5000)).status, 'done');
    await until(() => started.length === 3);
    assert.equal(started[2], '2.2');
    await runs.close();
  });

  test('an identical job is answered from the cache at once, even with a full queue', async () => {
    const { runner, started, finish } = heldRunner();
    const runs = createRunService(dataSource, runner, silent, queueLimits({ perUserQueued: 1 }));
    const first = await runs.submit({ job: gammaAt('3.1'), userId: 'A' });
    finish('3.1');
    assert.equal((await runs.settle(first.id, 5000)).status, 'done');
    await runs.submit({ job: gammaAt('3.2'), userId: 'A' });
    await runs.submit({ job: gammaAt('3.3'), userId: 'A' });
    const again = await runs.submit({ job: gammaAt('3.1'), userId: 'A' });
    assert.deepEqual([again.status, again.cached, JSON.parse(again.resultJson!)], ['done', true, { value: '3.1' }]);
    assert.deepEqual(started, ['3.1', '3.2']);
    await runs.close();
  });

  test('cancelling a queued job takes it out of the queue: it never reaches a worker and frees its place', async () => {
    const { runner, started, finish } = heldRunner();
    const runs = createRunService(dataSource, runner, silent, queueLimits({ perUserQueued: 2 }));
    await runs.submit({ job: gammaAt('4.1'), userId: 'A' });
    const second = await runs.submit({ job: gammaAt('4.2'), userId: 'A' });
    const third = await runs.submit({ job: gammaAt('4.3'), userId: 'A' });
    const cancelled = await runs.cancel(second.id);
    assert.equal(cancelled.status, 'cancelled');
    assert.equal(JSON.parse(cancelled.errorJson!).code, 'cancelled');
    assert.equal(runs.view(await runs.find(third.id)).queue!.ahead, 0);
    await runs.submit({ job: gammaAt('4.4'), userId: 'A' });
    finish('4.1');
    await until(() => started.length === 2);
    finish('4.3');
    await until(() => started.length === 3);
    assert.deepEqual(started, ['4.1', '4.3', '4.4']);
    await runs.close();
  });

  test('cancelling a running job stops it and the next one starts', async () => {
    const { runner, started } = heldRunner();
    const runs = createRunService(dataSource, runner, silent, queueLimits());
    const running = await runs.submit({ job: gammaAt('5.1'), userId: 'A' });
    await runs.submit({ job: gammaAt('5.2'), userId: 'B' });
    assert.equal((await runs.cancel(running.id)).status, 'cancelled');
    await until(() => started.length === 2);
    assert.deepEqual(started, ['5.1', '5.2']);
    await runs.close();
  });

  test('a job waiting longer than the queue-wait limit fails with code queue-wait and never runs', async () => {
    const { runner, started } = heldRunner();
    const runs = createRunService(dataSource, runner, silent, queueLimits({ queueWaitLimitMs: 100 }));
    await runs.submit({ job: gammaAt('6.1'), userId: 'A' });
    const waiting = await runs.submit({ job: gammaAt('6.2'), userId: 'B' });
    assert.equal(runs.view(waiting).queue!.waitLimitMs, 100);
    const given = await runs.settle(waiting.id, 5000);
    assert.equal(given.status, 'failed');
    assert.equal(JSON.parse(given.errorJson!).code, 'queue-wait');
    assert.deepEqual(started, ['6.1']);
    await runs.close();
  });
});

describe('runs service: stored result sizes', () => {
  let dataSource: DataSource;
  before(async () => {
    dataSource = await openDatabase(':memory:');
  });
  after(() => dataSource.destroy());
  const silentLog = pino({ level: 'silent' });

  test('a cache hit points at the run that computed the result instead of copying it; asking again adds no row', async () => {
    const result = { value: '7.25', digits: 'x'.repeat(10_000) };
    const runs = createRunService(dataSource, scriptedRunner(async () => result), silentLog, queueLimits());
    const computed = await runs.settle((await runs.submit({ job: gammaAt('7.1'), userId: 'A' })).id, 5000);
    const hit = await runs.submit({ job: gammaAt('7.1'), userId: 'B' });
    assert.deepEqual([hit.cached, hit.status, JSON.parse(hit.resultJson!)], [true, 'done', result], 'the reply shows the computed result');
    const stored = await dataSource.getRepository(JobRun).findOneByOrFail({ id: hit.id });
    assert.deepEqual([stored.resultJson, stored.resultRunId], [null, computed.id], 'the row holds a pointer, not a copy');
    // a second cache hit points at the computing run too, never at another cache hit
    const other = await runs.submit({ job: gammaAt('7.1'), userId: 'C' });
    assert.equal((await dataSource.getRepository(JobRun).findOneByOrFail({ id: other.id })).resultRunId, computed.id);
    const rowsBefore = await dataSource.getRepository(JobRun).countBy({ inputHash: jobHash(gammaAt('7.1')) });
    const again = await runs.submit({ job: gammaAt('7.1'), userId: 'B' });
    assert.equal(again.id, hit.id, 'the same person asking again gets their earlier cache hit back');
    assert.equal(await dataSource.getRepository(JobRun).countBy({ inputHash: jobHash(gammaAt('7.1')) }), rowsBefore);
    const bytes = await dataSource.query(`SELECT SUM(length("resultJson")) AS total FROM "job_runs" WHERE "inputHash" = ?`, [jobHash(gammaAt('7.1'))]);
    assert.equal(Number(bytes[0].total), JSON.stringify(result).length, 'the result is stored once');
    assert.deepEqual(runs.view(await runs.find(other.id)).result, result, 'a cached run found later still shows the result');
    await runs.close();
  });

  test('a finished result over the size limit is not kept: the run fails with a reason', async () => {
    const huge = { value: 'x'.repeat(RESULT_LIMITS.maxResultBytes) };
    const runs = createRunService(dataSource, scriptedRunner(async () => huge), silentLog, queueLimits());
    const run = await runs.settle((await runs.submit({ job: gammaAt('7.2'), userId: 'A' })).id, 5000);
    assert.deepEqual([run.status, run.resultJson], ['failed', null]);
    const error = JSON.parse(run.errorJson!);
    assert.equal(error.code, 'result-too-large');
    assert.match(error.message, /over the limit of 4\.0 MB per result/);
    // not cached: asking again runs the engine again
    assert.equal((await runs.submit({ job: gammaAt('7.2'), userId: 'A' })).cached, false);
    await runs.close();
  });
});
