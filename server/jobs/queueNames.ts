import IORedis from 'ioredis';

/** The BullMQ queue engine jobs go through when JOB_QUEUE_URL is set (server and workers must agree). */
export const ENGINE_QUEUE = 'rungbook-engine';

/** Pub/sub channel on which servers ask every worker to stop a job (cancel, time limit). */
export const CANCEL_CHANNEL = 'rungbook:engine:cancel';

/** What a server puts in the queue for one engine job. */
export interface QueuedEngineJob {
  job: unknown;
  /** Engine time allowed; the worker stops the job itself past it, even when no server is left to ask. */
  timeLimitMs: number;
}

/** BullMQ blocks on its connections, so every queue, event reader and worker gets its own. */
export function redisConnection(url: string): IORedis {
  return new IORedis(url, { maxRetriesPerRequest: null });
}
