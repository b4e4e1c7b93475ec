import { createHash } from 'node:crypto';
import { isDataJob } from '../../shared/jobs/contract';
import { In, IsNull, type DataSource } from 'typeorm';
import type { Logger } from 'pino';
import { canonicalJson } from '../../shared/notebook/dependencies';
import { estimatedResultBytes, jobCostProblem, megabytes } from '../../shared/jobs/cost';
import { RESULT_LIMITS } from '../../shared/jobs/contract';
import type { QueueStanding, RunView } from '../../shared/notebook/api';
import type { JobQueueConfig } from '../config';
import { JobRun } from '../db/entities';
import { AppError } from '../http/errors';
import { newId } from '../ids';
import { ENGINE_VERSION } from '../jobs/engineVersion';
import { QueueWaitExceeded, RunAborted, WorkerTimeLimit, type JobRunner } from '../jobs/runner';
import { FairQueue, type QueuedJob } from '../jobs/scheduler';

export interface RunRequest {
  job: unknown;
  userId: string;
  cellId?: string;
}

export interface RunService {
  /**
   * Queue a job (or answer it from the cache at once). Returns without waiting for the engine.
   * Refuses a job over the cost limit (job_too_large) and a person's job beyond their queue limit (queue_full).
   */
  submit(request: RunRequest): Promise<JobRun>;
  /** Wait for a run to finish, up to `timeoutMs`; returns its latest state either way. */
  settle(runId: string, timeoutMs: number): Promise<JobRun>;
  find(runId: string): Promise<JobRun>;
  /** Stops a running job, or takes a queued one out of the queue. */
  cancel(runId: string): Promise<JobRun>;
  /** The reply shape of a run, with its place in the queue while it waits; `result` when already parsed (see resultsOf). */
  view(run: JobRun, result?: StoredResult | null): RunView;
  /** Characters of result JSON the job will add: the cached result's size, else an estimate. */
  expectedResultBytes(job: unknown): Promise<number>;
  /** Called once a run is recorded as done, failed or cancelled (not for answers from the cache). */
  onFinished(listener: (run: FinishedRun) => void | Promise<void>): () => void;
  close(): Promise<void>;
}

export interface FinishedRun {
  id: string;
  cellId: string | null;
  status: JobRun['status'];
}

const MAX_JOB_JSON_LENGTH = 20_000;
/** Data jobs carry their points: 5 000 points of up to 4 columns of decimals of up to 60 characters, with room to spare. */
const MAX_DATA_JOB_JSON_LENGTH = 2_000_000;
const jobJsonLimit = (job: unknown) => (isDataJob(job) ? MAX_DATA_JOB_JSON_LENGTH : MAX_JOB_JSON_LENGTH);

export function jobHash(job: unknown): string {
  return createHash('sha256').update(`${ENGINE_VERSION}\n${canonicalJson(job)}`).digest('hex');
}

function isEngineError(result: unknown): result is { error: { code: string; message: string } } {
  return typeof result === 'object' && result !== null && 'error' in result;
}

/** A finished result, parsed once however many cached runs show it. */
export interface StoredResult {
  value: unknown;
  /** Characters of its JSON. */
  bytes: number;
}

/** The run whose resultJson a run shows: itself, or on a cache hit the run that computed the result. */
export const resultHolderId = (run: Pick<JobRun, 'id' | 'resultRunId'>): string => run.resultRunId ?? run.id;

/**
 * The results of these runs by holder id (resultHolderId), each read and parsed once: many cells answered
 * from the cache share one result. Only runs' own resultJson and their holders' are read.
 */
export async function resultsOf(dataSource: DataSource, runs: JobRun[]): Promise<Map<string, StoredResult>> {
  const json = new Map<string, string>();
  for (const run of runs) if (run.resultJson) json.set(run.id, run.resultJson);
  const missing = [...new Set(runs.filter((run) => run.resultRunId && !json.has(run.resultRunId)).map((run) => run.resultRunId!))];
  if (missing.length) {
    const holders: { id: string; resultJson: string | null }[] = await dataSource
      .getRepository(JobRun)
      .createQueryBuilder('r')
      .select(['r.id', 'r.resultJson'])
      .where('r.id IN (:...missing)', { missing })
      .getMany();
    for (const holder of holders) if (holder.resultJson) json.set(holder.id, holder.resultJson);
  }
  return new Map([...json].map(([id, text]) => [id, { value: JSON.parse(text), bytes: text.length }]));
}

export function toRunView(run: JobRun, queue: QueueStanding | null = null, result?: StoredResult | null): RunView {
  const value = result !== undefined ? (result?.value ?? null) : run.resultJson ? JSON.parse(run.resultJson) : null;
  return {
    id: run.id,
    status: run.status,
    progress: run.progress,
    cached: run.cached,
    engineVersion: run.engineVersion,
    durationMs: run.durationMs,
    result: value,
    error: run.errorJson ? JSON.parse(run.errorJson) : null,
    startedAt: run.startedAt?.toISOString() ?? null,
    finishedAt: run.finishedAt?.toISOString() ?? null,
    queue: run.status === 'queued' ? queue : null,
  };
}

const duration = (ms: number) => (ms < 120_000 ? `${(ms / 1000).toFixed(ms < 1000 ? 2 : 0)} s` : `${Math.round(ms / 60_000)} min`);

class TimeLimitExceeded extends Error {
  constructor(readonly limitMs: number) {
    super(`Stopped after the time limit of ${duration(limitMs)}; the worker was replaced.`);
  }
}

const errorJson = (code: string, message: string) => JSON.stringify({ code, message });

/** A run no worker took within the queue-wait limit, whether it waited in this server's queue or the shared one. */
function queueWaitFailure(limitMs: number): Partial<JobRun> {
  const message = `Waited ${duration(limitMs)} in the queue without a free worker, so it was given up. Run it again when the queue is shorter.`;
  return { status: 'failed', errorJson: errorJson('queue-wait', message) };
}

/** A time-limited job failed; a cancelled one was cancelled; anything else means the worker crashed (and was replaced). */
function failureOf(error: unknown, abortReason: unknown, limits: JobQueueConfig): Partial<JobRun> {
  if (error instanceof QueueWaitExceeded) return queueWaitFailure(limits.queueWaitLimitMs);
  if (error instanceof RunAborted && abortReason instanceof TimeLimitExceeded) {
    return { status: 'failed', errorJson: JSON.stringify({ code: 'time-limit', message: abortReason.message }) };
  }
  if (error instanceof WorkerTimeLimit) return { status: 'failed', errorJson: JSON.stringify({ code: 'time-limit', message: `Stopped after the time limit (${error.message}).` }) };
  if (error instanceof RunAborted) return { status: 'cancelled', errorJson: JSON.stringify({ code: 'cancelled', message: `Cancelled: ${error.message}` }) };
  return { status: 'failed', errorJson: JSON.stringify({ code: 'worker-crashed', message: 'The calculation worker crashed; it has been replaced. Run the cell again.' }) };
}

/** A finished result is stored unless it is too large to keep (and to send to the browser). */
function finished(resultJson: string): Partial<JobRun> {
  if (resultJson.length <= RESULT_LIMITS.maxResultBytes) return { status: 'done', progress: 1, resultJson };
  const message = `The result took ${megabytes(resultJson.length)}, over the limit of ${megabytes(RESULT_LIMITS.maxResultBytes)} per result, so it was not kept; reduce the points, quantities or digits.`;
  return { status: 'failed', errorJson: errorJson('result-too-large', message) };
}

/** Beyond the longest a run can take, before an open run is taken to have lost its server. */
const ORPHAN_GRACE_MS = 60_000;
const INTERRUPTED_ERROR = JSON.stringify({ code: 'interrupted', message: 'The server restarted while this ran. Run it again.' });

/** A run whose job may still be waiting or running somewhere. */
const OPEN_STATUSES: JobRun['status'][] = ['queued', 'running'];

interface InFlight {
  userId: string;
  job: unknown;
  abort: AbortController;
  /** Resolves once the run is recorded as finished, whichever way it ended. */
  done: Promise<void>;
  end: () => void;
  waitTimer?: NodeJS.Timeout;
}

export function createRunService(dataSource: DataSource, runner: JobRunner, logger: Logger, limits: JobQueueConfig): RunService {
  const runs = dataSource.getRepository(JobRun);
  const inFlight = new Map<string, InFlight>();
  const queue = new FairQueue<InFlight>({ threads: limits.threads, perUserRunning: limits.perUserRunning });
  // Jobs accepted but not yet in the queue (their row is being written): they count against the queue limit.
  const admitting = new Map<string, number>();
  let closing = false;
  const finishedListeners = new Set<(run: FinishedRun) => void | Promise<void>>();

  function announceFinished(id: string, status: JobRun['status']) {
    const cellId = cellOf.get(id) ?? null;
    cellOf.delete(id);
    for (const listener of finishedListeners) {
      Promise.resolve()
        .then(() => listener({ id, cellId, status }))
        .catch((error) => logger.error({ err: error, runId: id }, 'a listener of finished runs failed'));
    }
  }
  // The cell of each run in flight, so listeners learn it without another query.
  const cellOf = new Map<string, string | null>();

  async function execute(run: { id: string }, job: unknown, abort: AbortController) {
    let timer: NodeJS.Timeout | undefined;
    let started = Date.now();
    const onStarted = () => {
      started = Date.now();
      timer = setTimeout(() => abort.abort(new TimeLimitExceeded(limits.timeLimitMs)), limits.timeLimitMs);
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
      const result = await runner.run(job, { signal: abort.signal, onStarted, onProgress, runId: run.id });
      patch = isEngineError(result) ? { status: 'failed', errorJson: JSON.stringify(result.error) } : finished(JSON.stringify(result));
    } catch (error) {
      patch = failureOf(error, abort.signal.reason, limits);
      if (!(error instanceof RunAborted)) logger.error({ err: error, runId: run.id }, 'engine worker failed');
    } finally {
      clearTimeout(timer);
    }
    // another server may have cancelled the run meanwhile (shared queue): its record stands, and it announced the end
    const recorded = await runs.update({ id: run.id, status: In(OPEN_STATUSES) }, { ...patch, finishedAt: new Date(), durationMs: Date.now() - started });
    if (recorded.affected !== 0) announceFinished(run.id, patch.status!);
  }

  /** Hands free workers to waiting jobs, fairly across people. */
  function dispatch() {
    if (closing) return;
    for (let next = queue.take(); next; next = queue.take()) start(next);
  }

  function start({ id, userId, item }: QueuedJob<InFlight>) {
    clearTimeout(item.waitTimer);
    execute({ id }, item.job, item.abort)
      .catch((error) => logger.error({ err: error, runId: id }, 'recording a run failed'))
      .finally(() => {
        queue.finished(userId);
        item.end();
        dispatch();
      });
  }

  /** Ends a run that never left the queue. */
  async function endWaiting(id: string, patch: Partial<JobRun>) {
    const waiting = queue.remove(id);
    if (!waiting) return false;
    clearTimeout(waiting.item.waitTimer);
    try {
      await runs.update({ id, status: 'queued' }, { ...patch, finishedAt: new Date() });
      announceFinished(id, patch.status!);
    } catch (error) {
      logger.error({ err: error, runId: id }, 'recording a run failed');
    } finally {
      waiting.item.end();
    }
    return true;
  }

  function giveUpWaiting(id: string) {
    void endWaiting(id, queueWaitFailure(limits.queueWaitLimitMs));
  }

  /** A run this server does not hold, started by another server on the shared queue: record the cancel, then stop its job. */
  async function cancelElsewhere(run: JobRun) {
    if (!runner.cancel || !OPEN_STATUSES.includes(run.status)) return;
    const patch = { status: 'cancelled' as const, errorJson: errorJson('cancelled', 'Cancelled: cancelled by request'), finishedAt: new Date() };
    const recorded = await runs.update({ id: run.id, status: In(OPEN_STATUSES) }, patch);
    await runner.cancel(run.id, 'cancelled by request');
    if (recorded.affected === 0) return;
    cellOf.set(run.id, run.cellId);
    announceFinished(run.id, 'cancelled');
  }

  function assertRoomInQueue(userId: string) {
    const waiting = queue.queuedBy(userId) + (admitting.get(userId) ?? 0);
    if (waiting >= limits.perUserQueued) {
      throw new AppError('queue_full', `You already have ${waiting} job${waiting === 1 ? '' : 's'} waiting in the queue; the limit is ${limits.perUserQueued} per person. Wait for one to start, or cancel one, then try again.`);
    }
  }

  async function enqueue(base: Pick<JobRun, 'id' | 'inputHash' | 'engineVersion' | 'jobJson' | 'cellId' | 'requestedBy'>, userId: string, job: unknown) {
    assertRoomInQueue(userId);
    admitting.set(userId, (admitting.get(userId) ?? 0) + 1);
    try {
      await runs.insert(runs.create({ ...base, status: 'queued', progress: 0, cached: false }));
    } finally {
      const left = admitting.get(userId)! - 1;
      if (left) admitting.set(userId, left);
      else admitting.delete(userId);
    }
    let end = () => {};
    const done = new Promise<void>((resolve) => (end = resolve)).finally(() => {
      inFlight.delete(base.id);
      cellOf.delete(base.id);
    });
    const entry: InFlight = { userId, job, abort: new AbortController(), done, end };
    entry.waitTimer = setTimeout(() => giveUpWaiting(base.id), limits.queueWaitLimitMs);
    entry.waitTimer.unref();
    inFlight.set(base.id, entry);
    cellOf.set(base.id, base.cellId);
    queue.enqueue({ id: base.id, userId, queuedAt: Date.now(), item: entry });
    dispatch();
  }

  /** A run, with the result it shows (its own, or on a cache hit the computing run's) in resultJson. */
  async function find(runId: string) {
    const run = await runs.findOneBy({ id: runId });
    if (!run) throw new AppError('not_found', 'No such run.');
    if (isOrphaned(run)) {
      await markInterrupted(run.id);
      return find(runId);
    }
    if (run.resultRunId) run.resultJson = (await runs.findOne({ select: { id: true, resultJson: true }, where: { id: run.resultRunId } }))?.resultJson ?? null;
    return run;
  }

  /**
   * No run stays open longer than waiting here, waiting in a shared queue and running: one still open
   * after that, held by no live server here, lost its server (stopped or crashed while other servers run on).
   */
  const orphanAfterMs = 2 * limits.queueWaitLimitMs + limits.timeLimitMs + ORPHAN_GRACE_MS;
  const isOrphaned = (run: JobRun) => OPEN_STATUSES.includes(run.status) && !inFlight.has(run.id) && Date.now() - run.createdAt.getTime() > orphanAfterMs;

  async function markInterrupted(id: string) {
    await runs.update({ id, status: In(OPEN_STATUSES) }, { status: 'failed', errorJson: INTERRUPTED_ERROR, finishedAt: new Date() });
  }

  /** The newest run that computed this job's result itself (cache hits only point at such runs). */
  async function resultHolder(inputHash: string): Promise<{ id: string; bytes: number } | undefined> {
    const row: { id: string; bytes: number | null } | undefined = await runs
      .createQueryBuilder('r')
      .select('r.id', 'id')
      .addSelect('length(r.resultJson)', 'bytes')
      .where("r.inputHash = :inputHash AND r.status = 'done' AND r.cached = FALSE", { inputHash })
      .orderBy('r.createdAt', 'DESC')
      .limit(1)
      .getRawOne();
    return row ? { id: row.id, bytes: Number(row.bytes ?? 0) } : undefined;
  }

  /**
   * A cache hit is a small row pointing at the computing run. The same person asking again for the same
   * result in the same place (the calculator, or the same cell) gets their earlier row back, so repeating
   * a cached request adds nothing to the database.
   */
  async function recordCacheHit(base: Pick<JobRun, 'id' | 'inputHash' | 'engineVersion' | 'jobJson' | 'cellId' | 'requestedBy'>, holderId: string): Promise<string> {
    const earlier = await runs.findOne({ select: { id: true }, where: { resultRunId: holderId, requestedBy: base.requestedBy!, cellId: base.cellId ?? IsNull() } });
    if (earlier) return earlier.id;
    const now = new Date();
    await runs.insert(runs.create({ ...base, status: 'done', progress: 1, cached: true, resultRunId: holderId, durationMs: 0, startedAt: now, finishedAt: now }));
    return base.id;
  }

  function standing(run: JobRun): QueueStanding {
    const waiting = queue.find(run.id);
    return {
      // A run taken from the queue but whose worker has not begun yet is next in line.
      ahead: queue.ahead(run.id) ?? 0,
      since: new Date(waiting?.queuedAt ?? run.createdAt).toISOString(),
      waitLimitMs: limits.queueWaitLimitMs,
    };
  }

  return {
    find,

    async submit({ job, userId, cellId }) {
      const jobJson = canonicalJson(job);
      if (jobJson.length > jobJsonLimit(job)) throw new AppError('payload_too_large', 'This job is too large to run.');
      const costProblem = jobCostProblem(job);
      if (costProblem) throw new AppError('job_too_large', costProblem);
      const inputHash = jobHash(job);
      const base = { id: newId(), inputHash, engineVersion: ENGINE_VERSION, jobJson, cellId: cellId ?? null, requestedBy: userId };
      const holder = await resultHolder(inputHash);
      if (holder) return find(await recordCacheHit(base, holder.id));
      await enqueue(base, userId, job);
      return find(base.id);
    },

    async settle(runId, timeoutMs) {
      const pending = inFlight.get(runId);
      if (pending) await Promise.race([pending.done, new Promise((resolve) => setTimeout(resolve, timeoutMs).unref())]);
      return find(runId);
    },

    async cancel(runId) {
      const run = await find(runId);
      const pending = inFlight.get(runId);
      if (!pending) {
        await cancelElsewhere(run);
        return find(runId);
      }
      const cancelled = errorJson('cancelled', 'Cancelled while waiting in the queue.');
      if (!(await endWaiting(runId, { status: 'cancelled', errorJson: cancelled }))) {
        pending.abort.abort(new Error('cancelled by request'));
        await pending.done;
      }
      return find(runId);
    },

    view: (run, result) => toRunView(run, run.status === 'queued' ? standing(run) : null, result),

    async expectedResultBytes(job) {
      return (await resultHolder(jobHash(job)))?.bytes ?? estimatedResultBytes(job);
    },

    onFinished(listener) {
      finishedListeners.add(listener);
      return () => finishedListeners.delete(listener);
    },

    async close() {
      closing = true;
      const entries = [...inFlight.entries()];
      for (const [id] of entries) await endWaiting(id, { status: 'cancelled', errorJson: errorJson('cancelled', 'Cancelled: server shutting down') });
      for (const [, { abort }] of entries) abort.abort(new Error('server shutting down'));
      await Promise.allSettled(entries.map(([, entry]) => entry.done));
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
    .set({ status: 'failed', errorJson: INTERRUPTED_ERROR })
    .where('status IN (:...open)', { open: ['queued', 'running'] })
    .execute();
}
