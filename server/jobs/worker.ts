// Runs in a worker thread: one engine job per task, so a long or stuck job never blocks the server.
import type { MessagePort } from 'node:worker_threads';
import { runJob } from '../../shared/jobs';

export interface WorkerTask {
  job: unknown;
  /** Receives { type: 'started' } when the engine begins (time limits count engine time only), then { type: 'progress', fraction }. */
  port: MessagePort;
}

export default function runEngineJob({ job, port }: WorkerTask): unknown {
  port.postMessage({ type: 'started' });
  try {
    return runJob(job, { onProgress: (fraction) => port.postMessage({ type: 'progress', fraction }) });
  } finally {
    port.close();
  }
}
