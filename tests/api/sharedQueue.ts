import type { Socket } from 'node:net';
import IORedis from 'ioredis';
import { startRedis, type RunningRedis } from '../../scripts/services/redis';
import { startWorkerProcess, type WorkerProcess } from '../queue/processes';

/** RUNGBOOK_TEST_QUEUE=redis: the API tests send engine jobs through a Redis queue served by worker processes. */
export function testsUseQueue(): boolean {
  return process.env.RUNGBOOK_TEST_QUEUE === 'redis';
}

/** Two workers of one engine thread each: as many jobs at once as the in-process pool's default two threads. */
const WORKER_PROCESSES = 2;
const WORKER_ENV = { JOB_WORKER_CONCURRENCY: '1', JOB_WORKER_LOCK_MS: '10000' };

interface SharedQueue {
  redis: RunningRedis;
  workers: WorkerProcess[];
}

let started: Promise<SharedQueue> | undefined;

/** The URL of this test process's queue: one redis-server and its workers, started on first use and killed at exit. */
export async function sharedQueueUrl(): Promise<string> {
  started ??= startSharedQueue();
  return (await started).redis.url;
}

async function startSharedQueue(): Promise<SharedQueue> {
  const redis = await startRedis();
  const workers: WorkerProcess[] = [];
  process.once('exit', () => {
    for (const worker of workers) worker.child.kill('SIGKILL');
    redis.stopNow();
  });
  redis.unref();
  for (let n = 0; n < WORKER_PROCESSES; n++) workers.push(await startWorkerProcess(redis.url, WORKER_ENV));
  for (const worker of workers) letProcessExitBeside(worker);
  return { redis, workers };
}

/** Test files end when their work is done; a worker still running must not keep the test process alive. */
function letProcessExitBeside(worker: WorkerProcess) {
  worker.child.unref();
  for (const pipe of [worker.child.stdout, worker.child.stderr]) (pipe as unknown as Socket | null)?.unref();
}

/**
 * Each harness starts with fresh rate-limit counts, as a server counting in its own memory does: the
 * harnesses of one test process share the queue's Redis, where the limits count.
 */
export async function forgetRateLimitCounts(url: string): Promise<void> {
  const redis = new IORedis(url);
  try {
    const keys = await redis.keys('rungbook:limit:*');
    if (keys.length) await redis.del(...keys);
  } finally {
    await redis.quit();
  }
}
