import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { Queue } from 'bullmq';
import { startRedis, type RunningRedis } from '../../scripts/services/redis';
import { ENGINE_QUEUE, redisConnection } from '../../server/jobs/queueNames';
import { WORKER_TIME_LIMIT_PREFIX } from '../../server/jobs/runner';
import { startHarness, type Harness } from '../api/harness';
import { createPerson } from '../api/people';
import { finishedRun, GAMMA_QUARTER_30, gammaQuarterJob, queuedRunService, SLOW_SCAN_POINTS, slowScanJob, startWorkerProcess, type QueuedRunService, type WorkerProcess } from './processes';

const errorCode = (errorJson: string | null) => (errorJson ? (JSON.parse(errorJson) as { code: string }).code : null);

async function runningOn(runs: QueuedRunService['runs'], runId: string) {
  for (;;) {
    const run = await runs.find(runId);
    if (run.status !== 'queued') return run;
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

async function failedJob(queue: Queue, jobId: string, timeoutMs = 10_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    // the state first, then the job: a job read before it failed would carry no failure reason
    if ((await queue.getJobState(jobId)) === 'failed') return (await queue.getJob(jobId))!;
    if (Date.now() > deadline) throw new Error(`job ${jobId} was not marked failed within ${timeoutMs} ms`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

describe('engine jobs through the shared queue (Redis + worker processes, SQLite database)', () => {
  let redis: RunningRedis;
  let h: Harness;
  let userId: string;
  const workers: WorkerProcess[] = [];
  const services: QueuedRunService[] = [];

  before(async () => {
    redis = await startRedis();
    h = await startHarness();
    userId = (await createPerson(h, { signIn: false })).id;
  });

  after(async () => {
    for (const service of services) await service.close();
    for (const worker of workers) await worker.stop('SIGKILL');
    await h.close();
    await redis.stop();
  });

  async function service(jobs = {}) {
    const created = await queuedRunService(h.rungbook.services.dataSource, redis.url, jobs);
    services.push(created);
    return created;
  }

  async function worker(env: Record<string, string> = {}) {
    const started = await startWorkerProcess(redis.url, env);
    workers.push(started);
    return started;
  }

  test('a job runs in a worker process, and asking again is answered from the result cache', async () => {
    const only = await worker();
    const { runs, shared } = await service();
    const submitted = await runs.submit({ job: gammaQuarterJob, userId });
    const run = await finishedRun(runs, submitted.id);
    assert.equal(run.status, 'done', run.errorJson ?? '');
    assert.equal((JSON.parse(run.resultJson!) as { value: string }).value, GAMMA_QUARTER_30);
    assert.ok(only.lines.some((line) => line.msg === 'job finished' && line.role === 'worker'), 'the worker process logged the job');
    const again = await runs.submit({ job: gammaQuarterJob, userId });
    assert.equal(again.cached, true);
    assert.equal(again.resultRunId, run.id);
    assert.deepEqual(await shared.status(), { queue: 'ok', workers: 1 });
    await only.stop();
  });

  test('a job whose worker is killed mid-job is retried by another worker and finishes', async () => {
    const first = await worker();
    const second = await worker();
    const { runs } = await service();
    const submitted = await runs.submit({ job: slowScanJob('0.91'), userId });
    const started = await Promise.race([first, second].map((w) => w.waitForLine((line) => line.msg === 'job started').then(() => w)));
    const survivor = started === first ? second : first;
    await started.stop('SIGKILL');
    const run = await finishedRun(runs, submitted.id, 180_000);
    assert.equal(run.status, 'done', run.errorJson ?? '');
    // the retried job delivers every point the scan asked for
    assert.equal((JSON.parse(run.resultJson!) as { points: unknown[] }).points.length, SLOW_SCAN_POINTS);
    assert.ok(survivor.lines.some((line) => line.msg === 'job finished'), 'the surviving worker finished the job');
    await survivor.stop();
  });

  test('with no retries left, a job whose worker died fails with a clear reason', async () => {
    const doomed = await worker({ JOB_WORKER_RETRIES: '0' });
    const { runs } = await service();
    const submitted = await runs.submit({ job: slowScanJob('0.92'), userId });
    await doomed.waitForLine((line) => line.msg === 'job started');
    await doomed.stop('SIGKILL');
    // BullMQ's stalled-job check runs in workers: a fresh one notices the dead worker's job
    const checker = await worker({ JOB_WORKER_RETRIES: '0' });
    const run = await finishedRun(runs, submitted.id);
    assert.equal(run.status, 'failed');
    assert.equal(errorCode(run.errorJson), 'worker-crashed');
    await checker.stop();
  });

  test('cancelling a running job stops it in its worker, which then takes the next job', async () => {
    const only = await worker();
    const { runs } = await service();
    const slow = await runs.submit({ job: slowScanJob('0.93'), userId });
    assert.equal((await runningOn(runs, slow.id)).status, 'running');
    const cancelled = await runs.cancel(slow.id);
    assert.equal(cancelled.status, 'cancelled');
    await only.waitForLine((line) => line.msg === 'job cancelled');
    const next = await finishedRun(runs, (await runs.submit({ job: { ...gammaQuarterJob, digits: 31 }, userId })).id);
    assert.equal(next.status, 'done', next.errorJson ?? '');
    await only.stop();
  });

  test('a job over its time limit fails with the time-limit reason and frees its worker', async () => {
    const only = await worker();
    const { runs } = await service({ timeLimitMs: 1500 });
    const slow = await runs.submit({ job: slowScanJob('0.94'), userId });
    const run = await finishedRun(runs, slow.id);
    assert.equal(run.status, 'failed');
    assert.equal(errorCode(run.errorJson), 'time-limit');
    await only.waitForLine((line) => line.msg === 'job stopped');
    await only.stop();
  });

  test('a job no server stops is stopped by its worker at the time limit plus grace, and its failure says time limit (not a crash)', async () => {
    const only = await worker();
    // added straight to the queue, as a server does, but no server follows it: only the worker's own limit is left
    const connection = redisConnection(redis.url);
    const queue = new Queue(ENGINE_QUEUE, { connection });
    try {
      await queue.add('engine', { job: slowScanJob('0.96'), timeLimitMs: 500 }, { jobId: 'unwatched', attempts: 1 });
      const stopped = await only.waitForLine((line) => line.msg === 'job stopped', 30_000);
      assert.ok(Number(stopped.durationMs) >= 5_000, 'the worker waits out the grace period after the time limit');
      // the worker logs before BullMQ records the failure: wait for the job to be marked failed
      const job = await failedJob(queue, 'unwatched');
      assert.ok(job.failedReason?.startsWith(WORKER_TIME_LIMIT_PREFIX), job.failedReason);
    } finally {
      await queue.close();
      await connection.quit();
      await only.stop();
    }
  });

  test('a job no worker takes within the queue-wait limit fails with the queue-wait reason', async () => {
    // every worker of the earlier tests has stopped: nobody serves the queue now
    const { runs, shared } = await service({ queueWaitLimitMs: 1000 });
    assert.equal((await shared.status()).workers, 0);
    const run = await finishedRun(runs, (await runs.submit({ job: { ...gammaQuarterJob, digits: 32 }, userId })).id);
    assert.equal(run.status, 'failed');
    assert.equal(errorCode(run.errorJson), 'queue-wait');
  });
});
