import path from 'node:path';
import { MessageChannel } from 'node:worker_threads';
import { Piscina } from 'piscina';

export interface RunHooks {
  signal: AbortSignal;
  /** Called when a worker actually starts the job (after any wait in the queue or for a worker to boot). */
  onStarted?: () => void;
  onProgress?: (fraction: number) => void;
  /** The run's id: a shared queue names its job by it, so any server can cancel the run. */
  runId?: string;
}

/** Where engine jobs execute. One small interface, so another runner (a queue, a cluster) can replace the pool. */
export interface JobRunner {
  /** Resolves with the engine's result; rejects with RunAborted when cancelled or over time, or on a worker crash. */
  run(job: unknown, hooks: RunHooks): Promise<unknown>;
  /**
   * Stops the job of a run by its id wherever it is (a shared queue only): the run another server started.
   * That server's `run` then rejects, and a job it has not added yet is refused.
   */
  cancel?(runId: string, reason: string): Promise<void>;
  /** Resolves once a job would start at once: for the pool, when every thread has loaded and warmed up the engine. */
  ready?(): Promise<void>;
  close(): Promise<void>;
}

/** What a pool thread posts once its engine is loaded and warmed up (worker.ts). */
export const ENGINE_WARM_MESSAGE = 'engine-warm';

export class RunAborted extends Error {}

/** No worker of a shared queue took the job within the queue-wait limit; it was taken out of the queue. */
export class QueueWaitExceeded extends RunAborted {}

/** A queue worker stopped the job at its own time limit (the backstop when no server's limit stopped it first). */
export class WorkerTimeLimit extends RunAborted {}

/** How a queue worker words the failure of a job it stopped at its time limit; the runner recognizes it. */
export const WORKER_TIME_LIMIT_PREFIX = 'time-limit: ';

/**
 * The run service's fair queue (scheduler.ts) hands the pool at most `threads` jobs at a time, so the order
 * of work is decided there, not by piscina's first-come queue.
 */
export function createWorkerPoolRunner(options: { threads: number }): JobRunner {
  const pool = new Piscina({
    filename: path.join(__dirname, 'worker.ts'),
    // Every thread starts with the pool and is never retired for idleness: loading and warming up the
    // engine takes over a second per thread, which no job should wait for. A replaced thread starts at once.
    minThreads: options.threads,
    maxThreads: options.threads,
    // Each engine job is CPU-bound: one at a time per thread.
    concurrentTasksPerWorker: 1,
  });
  const warmed = threadsWarmed(pool, options.threads);
  return {
    async run(job, { signal, onStarted, onProgress }) {
      const { port1, port2 } = new MessageChannel();
      port1.on('message', (message: { type?: string; fraction?: number }) => {
        if (message.type === 'started') onStarted?.();
        if (message.type === 'progress' && typeof message.fraction === 'number') onProgress?.(message.fraction);
      });
      try {
        return await pool.run({ job, port: port2 }, { signal, transferList: [port2] });
      } catch (error) {
        // Piscina terminates the worker of an aborted task and starts a fresh one in its place.
        if (signal.aborted) throw new RunAborted(signal.reason instanceof Error ? signal.reason.message : String(signal.reason ?? 'cancelled'));
        throw error;
      } finally {
        port1.close();
      }
    },
    ready: () => warmed,
    close: () => pool.destroy(),
  };
}

/** Resolves when `threads` threads of the pool have reported a warm engine. */
function threadsWarmed(pool: Piscina, threads: number): Promise<void> {
  let waiting = threads;
  return new Promise((resolve) => {
    const onMessage = (message: { type?: string }) => {
      if (message?.type !== ENGINE_WARM_MESSAGE || --waiting > 0) return;
      pool.off('message', onMessage);
      resolve();
    };
    pool.on('message', onMessage);
  });
}
