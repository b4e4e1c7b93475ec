import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { pino } from 'pino';
import type { DataSource } from 'typeorm';
import { loadConfig, type JobQueueConfig } from '../../server/config';
import { connectSharedState, type SharedState } from '../../server/jobs/sharedState';
import { createRunService, type RunService } from '../../server/services/runs';
import type { JobRun } from '../../server/db/entities';

const ROOT = path.resolve(__dirname, '..', '..');

export interface WorkerProcess {
  child: ChildProcess;
  /** Every log line the worker wrote (JSON, one object a line). */
  lines: Record<string, unknown>[];
  /** Resolves once a log line satisfies `test`. */
  waitForLine(test: (line: Record<string, unknown>) => boolean, timeoutMs?: number): Promise<Record<string, unknown>>;
  stop(signal?: NodeJS.Signals): Promise<void>;
}

/** `npm run worker` as its own process on the given queue (lock renewal every `lockMs`, so a killed worker's job is retried soon). */
export async function startWorkerProcess(queueUrl: string, env: Record<string, string> = {}): Promise<WorkerProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(ROOT, 'server', 'worker-main.ts')], {
    cwd: ROOT,
    env: { ...process.env, JOB_QUEUE_URL: queueUrl, LOG_LEVEL: 'info', JOB_WORKER_CONCURRENCY: '1', JOB_WORKER_LOCK_MS: '2000', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const lines: Record<string, unknown>[] = [];
  const waiters = new Set<() => void>();
  let buffered = '';
  let stderr = '';
  child.stderr!.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
  child.stdout!.on('data', (chunk: Buffer) => {
    buffered += chunk.toString();
    const complete = buffered.split('\n');
    buffered = complete.pop()!;
    for (const text of complete) if (text.trim()) lines.push(JSON.parse(text));
    waiters.forEach((check) => check());
  });
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  const worker: WorkerProcess = {
    child,
    lines,
    waitForLine(test, timeoutMs = 60_000) {
      return new Promise((resolve, reject) => {
        const timer = setTimeout(() => done(() => reject(new Error(`no such worker log line; stderr:\n${stderr}`))), timeoutMs);
        const done = (finish: () => void) => {
          clearTimeout(timer);
          waiters.delete(check);
          finish();
        };
        const check = () => {
          const found = lines.find(test);
          if (found) done(() => resolve(found));
          else if (child.exitCode !== null) done(() => reject(new Error(`worker exited (${child.exitCode}); stderr:\n${stderr}`)));
        };
        waiters.add(check);
        check();
      });
    },
    async stop(signal = 'SIGTERM') {
      if (child.exitCode === null && child.signalCode === null) child.kill(signal);
      await exited;
    },
  };
  await worker.waitForLine((line) => line.msg === 'started');
  return worker;
}

export interface QueuedRunService {
  runs: RunService;
  shared: SharedState;
  close(): Promise<void>;
}

/** The run service the server uses, served by the shared queue instead of the in-process pool. */
export async function queuedRunService(dataSource: DataSource, queueUrl: string, jobs: Partial<JobQueueConfig> = {}): Promise<QueuedRunService> {
  const config = loadConfig({ JOB_QUEUE_URL: queueUrl, SEED_DEMO_DATA: 'false' });
  Object.assign(config.jobs, jobs);
  const logger = pino({ level: 'silent' });
  const shared = await connectSharedState(config, logger);
  const runs = createRunService(dataSource, shared.runner, logger, config.jobs);
  return {
    runs,
    shared,
    async close() {
      await runs.close();
      await shared.close();
    },
  };
}

/** Polls the run row until it has finished (or `timeoutMs` passes). */
export async function finishedRun(runs: RunService, runId: string, timeoutMs = 120_000): Promise<JobRun> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const run = await runs.settle(runId, 1000);
    if (!['queued', 'running'].includes(run.status) || Date.now() > deadline) return run;
  }
}

/** Γ(1/4) to 30 digits: one special-function value, milliseconds of engine time. */
export const gammaQuarterJob = { job: 'special', fn: 'gamma', x: '0.25', digits: 30 };
/** Γ(1/4) = 3.6256099082219083119306851558676720… (OEIS A068466), rounded to 30 significant digits. */
export const GAMMA_QUARTER_30 = '3.62560990822190831193068515587';

/** A three-loop cubic-model scan: seconds of engine time that no cache shortens (one tetrahedron period P(s) per point, about 0.1–0.2 s each), so a worker can be killed or a job cancelled while it runs. */
export const SLOW_SCAN_POINTS = 60;
export const slowScanJob = (to = '0.95', points = SLOW_SCAN_POINTS) => ({
  job: 'scan', model: { preset: 'cubic', N: 3 }, d: '1', s: { from: '0.55', to, points }, quantities: ['nuInv', 'omega'], loops: 3, digits: 30,
});
