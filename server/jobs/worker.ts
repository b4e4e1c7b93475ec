// Runs in a worker thread: one engine job per task, so a long or stuck job never blocks the server.
import { parentPort, type MessagePort } from 'node:worker_threads';
import { runJob } from '../../shared/jobs';
import { ENGINE_WARM_MESSAGE } from './runner';

export interface WorkerTask {
  job: unknown;
  /** Receives { type: 'started' } when the engine begins (time limits count engine time only), then { type: 'progress', fraction }. */
  port: MessagePort;
}

/**
 * Two-loop exponents jobs run as the thread loads, before it takes a task: a fresh thread's first job
 * otherwise pays for compiling the engine (about 100 ms instead of 35 ms for an O(1) cell, tests/bench/latency.bench.ts).
 */
export const WARM_UP_JOBS = [16, 17, 18].map((digits) => ({ job: 'exponents', model: { preset: 'on', N: 2 }, loops: 2, digits, d: '3', s: '1.7' }));

function warmUpEngine() {
  for (const job of WARM_UP_JOBS) runJob(job);
  parentPort?.postMessage({ type: ENGINE_WARM_MESSAGE });
}

warmUpEngine();

export default function runEngineJob({ job, port }: WorkerTask): unknown {
  port.postMessage({ type: 'started' });
  try {
    return runJob(job, { onProgress: (fraction) => port.postMessage({ type: 'progress', fraction }) });
  } finally {
    port.close();
  }
}
