import { randomUUID } from 'node:crypto';
import { Queue, QueueEvents } from 'bullmq';
import type { Logger } from 'pino';
import { CANCEL_CHANNEL, ENGINE_QUEUE, redisConnection, type QueuedEngineJob } from './queueNames';
import { QueueWaitExceeded, RunAborted, WORKER_TIME_LIMIT_PREFIX, WorkerTimeLimit, type JobRunner, type RunHooks } from './runner';

export interface QueueRunnerOptions {
  url: string;
  timeLimitMs: number;
  /** How long a job may wait in the shared queue for a worker before it is taken out. */
  queueWaitLimitMs: number;
  logger: Logger;
}

interface Waiting {
  hooks: RunHooks;
  started: boolean;
  resolve(value: unknown): void;
  reject(error: Error): void;
}

/** Why a worker failed a job (BullMQ's failedReason): cancelled and time-limited jobs are aborts, not crashes. */
export class WorkerFailure extends Error {}

/** Keeps finished jobs briefly for inspection; the database holds the results. */
const KEEP_FINISHED = { age: 3600, count: 1000 };

/** Marks a run cancelled from another server, so its own server does not add the job after the cancel. */
const cancelledKey = (jobId: string) => `rungbook:engine:cancelled:${jobId}`;
const CANCELLED_MARK_SECONDS = 24 * 3600;

/**
 * The JobRunner served by a BullMQ queue on Redis: `run` adds a job and follows its events (active,
 * progress, completed, failed) until it ends; workers in other processes (`npm run worker`) execute it.
 */
export async function createQueueRunner(options: QueueRunnerOptions): Promise<JobRunner & { status(): Promise<QueueStatus> }> {
  const connections = [redisConnection(options.url), redisConnection(options.url), redisConnection(options.url)];
  const [queueConnection, eventsConnection, publisher] = connections;
  const queue = new Queue<QueuedEngineJob>(ENGINE_QUEUE, { connection: queueConnection });
  // read the event stream from now on Redis's clock: a QueueEvents that starts at the stream's end ('$')
  // only when its first read is issued can miss the 'active' event of a job added right after creation
  // (and with it the time limit, which counts from 'active')
  const [seconds, micros] = await queueConnection.time();
  const events = new QueueEvents(ENGINE_QUEUE, { connection: eventsConnection, lastEventId: `${Number(seconds) * 1000 + Math.floor(Number(micros) / 1000)}-0` });
  await events.waitUntilReady();
  const waiting = new Map<string, Waiting>();

  events.on('active', ({ jobId }) => markStarted(waiting.get(jobId)));
  events.on('progress', ({ jobId, data }) => {
    const entry = waiting.get(jobId);
    if (typeof data === 'number') entry?.hooks.onProgress?.(data);
  });
  events.on('completed', ({ jobId, returnvalue }) => settle(jobId, (entry) => entry.resolve(returnvalue)));
  events.on('failed', ({ jobId, failedReason }) =>
    settle(jobId, (entry) => entry.reject(failedReason.startsWith(WORKER_TIME_LIMIT_PREFIX) ? new WorkerTimeLimit(failedReason.slice(WORKER_TIME_LIMIT_PREFIX.length)) : new WorkerFailure(failedReason))),
  );
  // another server cancelled a job that was still waiting
  events.on('removed', ({ jobId }) => settle(jobId, (entry) => entry.reject(new RunAborted('cancelled by request'))));
  events.on('error', (error) => options.logger.error({ err: error }, 'reading the job queue events failed'));

  function markStarted(entry: Waiting | undefined) {
    // a job retried after its worker died becomes active again: its time limit still counts from the first start
    if (!entry || entry.started) return;
    entry.started = true;
    entry.hooks.onStarted?.();
  }

  function settle(jobId: string, finish: (entry: Waiting) => void) {
    const entry = waiting.get(jobId);
    if (!entry) return;
    waiting.delete(jobId);
    finish(entry);
  }

  /** Takes the job out of the queue if no worker has it yet, else asks every worker to stop it. */
  async function withdraw(jobId: string, reason: string) {
    const removed = await queue.remove(jobId).catch(() => 0);
    if (!removed) await publisher.publish(CANCEL_CHANNEL, JSON.stringify({ jobId, reason }));
  }

  const cancelledElsewhere = async (runId: string | undefined) => runId !== undefined && (await publisher.exists(cancelledKey(runId))) === 1;

  return {
    async run(job, hooks) {
      if (hooks.signal.aborted) throw abortedBy(hooks.signal);
      const jobId = hooks.runId ?? randomUUID();
      const finished = new Promise<unknown>((resolve, reject) => waiting.set(jobId, { hooks, started: false, resolve, reject }));
      // it may end (removed by another server's cancel) before this awaits it below
      finished.catch(() => undefined);
      try {
        await queue.add('engine', { job, timeLimitMs: options.timeLimitMs }, { jobId, attempts: 1, removeOnComplete: KEEP_FINISHED, removeOnFail: KEEP_FINISHED });
      } catch (error) {
        waiting.delete(jobId);
        throw error;
      }
      const gaveUp = new AbortController();
      const waitTimer = setTimeout(() => gaveUp.abort(), options.queueWaitLimitMs);
      const stop = (error: Error) => {
        if (!waiting.has(jobId)) return;
        settle(jobId, (entry) => entry.reject(error));
        void withdraw(jobId, error.message).catch((failure) => options.logger.error({ err: failure, jobId }, 'withdrawing a queued job failed'));
      };
      const onAbort = () => stop(abortedBy(hooks.signal));
      const onWaitedTooLong = () => {
        if (!waiting.get(jobId)?.started) stop(new QueueWaitExceeded(`waited ${Math.round(options.queueWaitLimitMs / 1000)} s in the shared queue without a free worker`));
      };
      hooks.signal.addEventListener('abort', onAbort, { once: true });
      gaveUp.signal.addEventListener('abort', onWaitedTooLong, { once: true });
      // a cancel (from here, or from another server by the run's id) made while the job was being added found nothing to withdraw
      if (hooks.signal.aborted) onAbort();
      else if (await cancelledElsewhere(hooks.runId)) stop(new RunAborted('cancelled by request'));
      try {
        return await finished;
      } catch (error) {
        if (error instanceof WorkerFailure && hooks.signal.aborted) throw abortedBy(hooks.signal);
        throw error;
      } finally {
        clearTimeout(waitTimer);
        hooks.signal.removeEventListener('abort', onAbort);
      }
    },

    async cancel(runId, reason) {
      await publisher.set(cancelledKey(runId), reason, 'EX', CANCELLED_MARK_SECONDS);
      await withdraw(runId, reason);
    },

    status: () => queueStatus(queue),

    async close() {
      for (const [jobId, entry] of waiting) {
        waiting.delete(jobId);
        entry.reject(new RunAborted('server shutting down'));
      }
      await events.close();
      await queue.close();
      await Promise.all(connections.map((connection) => connection.quit().catch(() => undefined)));
    },
  };
}

function abortedBy(signal: AbortSignal): RunAborted {
  return new RunAborted(signal.reason instanceof Error ? signal.reason.message : String(signal.reason ?? 'cancelled'));
}

export interface QueueStatus {
  queue: 'ok' | 'unreachable';
  /** Worker processes connected to the queue now. */
  workers: number;
  waiting: number;
  active: number;
}

export async function queueStatus(queue: Queue): Promise<QueueStatus> {
  try {
    const [workers, counts] = await Promise.all([queue.getWorkersCount(), queue.getJobCounts('waiting', 'active')]);
    return { queue: 'ok', workers, waiting: counts.waiting ?? 0, active: counts.active ?? 0 };
  } catch {
    return { queue: 'unreachable', workers: 0, waiting: 0, active: 0 };
  }
}
