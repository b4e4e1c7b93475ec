import { Worker, type Job } from 'bullmq';
import type { Logger } from 'pino';
import { CANCEL_CHANNEL, ENGINE_QUEUE, redisConnection, type QueuedEngineJob } from './queueNames';
import { WORKER_TIME_LIMIT_PREFIX, createWorkerPoolRunner } from './runner';

export interface QueueWorkerOptions {
  url: string;
  /** Engine jobs this process runs at once, each in its own thread. */
  concurrency: number;
  /** A worker that stops renewing its lock for this long (it died, or its machine did) has its jobs retried elsewhere. */
  lockMs: number;
  /** Times a job whose worker died is put back in the queue before it fails. */
  retriesAfterDeath: number;
  logger: Logger;
}

/** Beyond its time limit a job is stopped by its worker too, in case no server is left to ask. */
const TIME_LIMIT_GRACE_MS = 5_000;
const PROGRESS_INTERVAL_MS = 250;

/**
 * A worker process's side of the queue: takes engine jobs, runs each in a thread of its own pool (so the
 * process keeps renewing its locks and hearing cancels while the engine computes) and reports progress.
 */
export async function startQueueWorker(options: QueueWorkerOptions) {
  const pool = createWorkerPoolRunner({ threads: options.concurrency });
  const connections = [redisConnection(options.url), redisConnection(options.url)];
  const [workerConnection, subscriber] = connections;

  async function processJob(job: Job<QueuedEngineJob>, _token?: string, cancelled?: AbortSignal): Promise<unknown> {
    const overTime = AbortSignal.timeout(job.data.timeLimitMs + TIME_LIMIT_GRACE_MS);
    const signal = cancelled ? AbortSignal.any([cancelled, overTime]) : overTime;
    const started = Date.now();
    let lastProgress = 0;
    const onProgress = (fraction: number) => {
      if (Date.now() - lastProgress < PROGRESS_INTERVAL_MS) return;
      lastProgress = Date.now();
      void job.updateProgress(fraction).catch(() => undefined);
    };
    options.logger.info({ jobId: job.id, attempt: job.attemptsStarted }, 'job started');
    try {
      const result = await pool.run(job.data.job, { signal, onProgress });
      options.logger.info({ jobId: job.id, durationMs: Date.now() - started }, 'job finished');
      return result;
    } catch (error) {
      options.logger.warn({ jobId: job.id, durationMs: Date.now() - started, reason: (error as Error).message }, 'job stopped');
      if (overTime.aborted && !cancelled?.aborted) throw new Error(`${WORKER_TIME_LIMIT_PREFIX}stopped by its worker after ${Math.round((job.data.timeLimitMs + TIME_LIMIT_GRACE_MS) / 1000)} s`);
      throw error;
    }
  }

  const worker = new Worker<QueuedEngineJob>(ENGINE_QUEUE, processJob, {
    connection: workerConnection,
    concurrency: options.concurrency,
    lockDuration: options.lockMs,
    stalledInterval: options.lockMs,
    maxStalledCount: options.retriesAfterDeath,
  });
  worker.on('error', (error) => options.logger.error({ err: error }, 'job queue worker error'));
  worker.on('stalled', (jobId) => options.logger.warn({ jobId }, 'a job whose worker died was put back in the queue'));

  await subscriber.subscribe(CANCEL_CHANNEL);
  subscriber.on('message', (_channel, message: string) => {
    const { jobId, reason } = JSON.parse(message) as { jobId: string; reason: string };
    if (worker.cancelJob(jobId, reason)) options.logger.info({ jobId, reason }, 'job cancelled');
  });
  await worker.waitUntilReady();

  return {
    worker,
    async close() {
      await worker.close();
      await pool.close();
      await Promise.all(connections.map((connection) => connection.quit().catch(() => undefined)));
    },
  };
}
