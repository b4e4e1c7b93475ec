import { createHash } from 'node:crypto';
import type { DataSource } from 'typeorm';
import type { Logger } from 'pino';
import { canonicalJson } from '../../shared/notebook/dependencies';
import type { RunView } from '../../shared/notebook/api';
import { JobRun } from '../db/entities';
import { AppError } from '../http/errors';
import { newId } from '../ids';
import { ENGINE_VERSION } from '../jobs/engineVersion';
import { RunAborted, type JobRunner } from '../jobs/runner';

export interface RunRequest {
  job: unknown;
  userId: string;
  cellId?: string;
}

export interface RunService {
  /** Queue a job (or answer it from the cache at once). Returns without waiting for the engine. */
  submit(request: RunRequest): Promise<JobRun>;
  /** Wait for a run to finish, up to `timeoutMs`; returns its latest state either way. */
  settle(runId: string, timeoutMs: number): Promise<JobRun>;
  find(runId: string): Promise<JobRun>;
  cancel(runId: string): Promise<JobRun>;
  close(): Promise<void>;
}

const MAX_JOB_JSON_LENGTH = 20_000;

export function jobHash(job: unknown): string {
  return createHash('sha256').update(`${ENGINE_VERSION}\n${canonicalJson(job)}`).digest('hex');
}

function isEngineError(result: unknown): result is { error: { code: string; message: string } } {
  return typeof result === 'object' && result !== null && 'error' in result;
}

export function toRunView(run: JobRun): RunView {
  return {
    id: run.id,
    status: run.status,
    progress: run.progress,
    cached: run.cached,
    engineVersion: run.engineVersion,
    durationMs: run.durationMs,
    result: run.resultJson ? JSON.parse(run.resultJson) : null,
    error: run.errorJson ? JSON.parse(run.errorJson) : null,
    startedAt: run.startedAt?.toISOString() ?? null,
    finishedAt: run.finishedAt?.toISOString() ?? null,
  };
}

class TimeLimitExceeded extends Error {
  constructor(readonly limitMs: number) {
    super(`Stopped after the time limit of ${(limitMs / 1000).toFixed(limitMs < 1000 ? 2 : 0)} s; the worker was replaced.`);
  }
}

/** A time-limited job failed; a cancelled one was cancelled; anything else means the worker crashed (and was replaced). */
function failureOf(error: unknown, abortReason: unknown): Partial<JobRun> {
  if (error instanceof RunAborted && abortReason instanceof TimeLimitExceeded) {
    return { status: 'failed', errorJson: JSON.stringify({ code: 'time-limit', message: abortReason.message }) };
  }
  if (error instanceof RunAborted) return { status: 'cancelled', errorJson: JSON.stringify({ code: 'cancelled', message: `Cancelled: ${error.message}` }) };
  return { status: 'failed', errorJson: JSON.stringify({ code: 'worker-crashed', message: 'The calculation worker crashed; it has been replaced. Run the cell again.' }) };
}

export function createRunService(dataSource: DataSource, runner: JobRunner, logger: Logger, timeLimitMs: number): RunService {
  const runs = dataSource.getRepository(JobRun);
  const inFlight = new Map<string, { done: Promise<void>; abort: AbortController }>();

  async function execute(run: JobRun, job: unknown, abort: AbortController) {
    let timer: NodeJS.Timeout | undefined;
    let started = Date.now();
    const onStarted = () => {
      started = Date.now();
      timer = setTimeout(() => abort.abort(new TimeLimitExceeded(timeLimitMs)), timeLimitMs);
      void runs.update({ id: run.id, status: 'queued' }, { status: 'running', startedAt: new Date(started) });
    };
    let lastProgressWrite = 0;
    const onProgress = (fraction: number) => {
      // At most a few database writes per second, whatever the engine reports.
      if (Date.now() - lastProgressWrite < 250) return;
      lastProgressWrite = Date.now();
      void runs.update({ id: run.id, status: 'running' }, { progress: Math.min(0.99, Math.max(0, fraction)) });
    };
    let patch: Partial<JobRun>;
    try {
      const result = await runner.run(job, { signal: abort.signal, onStarted, onProgress });
      patch = isEngineError(result)
        ? { status: 'failed', errorJson: JSON.stringify(result.error) }
        : { status: 'done', progress: 1, resultJson: JSON.stringify(result) };
    } catch (error) {
      patch = failureOf(error, abort.signal.reason);
      if (!(error instanceof RunAborted)) logger.error({ err: error, runId: run.id }, 'engine worker failed');
    } finally {
      clearTimeout(timer);
    }
    await runs.update({ id: run.id }, { ...patch, finishedAt: new Date(), durationMs: Date.now() - started });
  }

  async function find(runId: string) {
    const run = await runs.findOneBy({ id: runId });
    if (!run) throw new AppError('not_found', 'No such run.');
    return run;
  }

  return {
    find,

    async submit({ job, userId, cellId }) {
      const jobJson = canonicalJson(job);
      if (jobJson.length > MAX_JOB_JSON_LENGTH) throw new AppError('payload_too_large', 'This job is too large to run.');
      const inputHash = jobHash(job);
      const base = { id: newId(), inputHash, engineVersion: ENGINE_VERSION, jobJson, cellId: cellId ?? null, requestedBy: userId };
      const hit = await runs.findOne({ where: { inputHash, status: 'done' }, order: { createdAt: 'DESC' } });
      if (hit) {
        const cachedRun = runs.create({ ...base, status: 'done', progress: 1, cached: true, resultJson: hit.resultJson, durationMs: 0, startedAt: new Date(), finishedAt: new Date() });
        await runs.insert(cachedRun);
        return find(cachedRun.id);
      }
      const run = runs.create({ ...base, status: 'queued', progress: 0, cached: false });
      await runs.insert(run);
      const abort = new AbortController();
      const done = execute(run, job, abort)
        .catch((error) => logger.error({ err: error, runId: run.id }, 'recording a run failed'))
        .finally(() => inFlight.delete(run.id));
      inFlight.set(run.id, { done, abort });
      return find(run.id);
    },

    async settle(runId, timeoutMs) {
      const pending = inFlight.get(runId);
      if (pending) await Promise.race([pending.done, new Promise((resolve) => setTimeout(resolve, timeoutMs).unref())]);
      return find(runId);
    },

    async cancel(runId) {
      const run = await find(runId);
      const pending = inFlight.get(runId);
      if (pending) {
        pending.abort.abort(new Error('cancelled by request'));
        await pending.done;
      }
      return pending ? find(runId) : run;
    },

    async close() {
      for (const { abort } of inFlight.values()) abort.abort(new Error('server shutting down'));
      await Promise.allSettled([...inFlight.values()].map((entry) => entry.done));
      await runner.close();
    },
  };
}

/** Runs left unfinished by a previous server process can never finish: mark them failed at start-up. */
export async function failInterruptedRuns(dataSource: DataSource): Promise<void> {
  await dataSource
    .getRepository(JobRun)
    .createQueryBuilder()
    .update()
    .set({ status: 'failed', errorJson: JSON.stringify({ code: 'interrupted', message: 'The server restarted while this ran. Run it again.' }) })
    .where('status IN (:...open)', { open: ['queued', 'running'] })
    .execute();
}
