import path from 'node:path';
import { Piscina } from 'piscina';
import type { CellComparison } from '../../shared/notebook/api';
import type { DatasetPoints } from '../../shared/notebook/datasets';
import type { ImportOutcome, ReadDatasetOutcome, ReadDatasetTask, RestorableSnapshot } from './documentWorker';
import type { LatexExportOptions } from '../../shared/notebook/exports';
import { AppError } from '../http/errors';

export type { RestorableSnapshot } from './documentWorker';

/**
 * Document work off the request thread (exports, version comparisons, reading a version to restore): one
 * small pool, separate from the engine's job queue. `person` is whoever asked: each may have only a few
 * documents outstanding.
 */
export interface DocumentRenderer {
  /** The LaTeX file of a notebook document given as JSON text (see shared/notebook/exports.ts; datasets with `rowCount` in place of their points). */
  latex(documentJson: string, person: string, style?: LatexExportOptions): Promise<string>;
  compare(fromJson: string, toJson: string, person: string): Promise<CellComparison[]>;
  /** A version snapshot's title, summary and cell inputs, without its outputs. */
  restorable(snapshotJson: string, person: string): Promise<RestorableSnapshot>;
  /** A table (uploaded file or pasted text) read, checked and turned into stored points. */
  readDataset(task: ReadDatasetTask, person: string): Promise<ReadDatasetOutcome>;
  /** An exchange file's text parsed and checked (its datasets turned into stored points). */
  importDocument(text: string, person: string): Promise<ImportOutcome>;
  /** The stored columns of a dataset as CSV under the given header. */
  datasetCsv(pointsJson: string, columns: { key: keyof DatasetPoints; title: string }[], person: string): Promise<string>;
  /** The points with x in [from, to] (none, with their count, when more than a comparison takes). */
  datasetPointsInRange(task: { pointsJson: string; from?: string; to?: string }, person: string): Promise<{ points: DatasetPoints; kept: number }>;
  close(): Promise<void>;
}

export interface DocumentPoolOptions {
  threads?: number;
  /** Documents waiting for a thread; more are refused with queue_full (429). */
  maxQueue?: number;
  /** Documents one person may have waiting or in work at once; more are refused with queue_full (429). */
  perPerson?: number;
  /** Time a document may spend in a worker, counted from the moment a thread takes it. */
  timeLimitMs?: number;
  /** Time a document may wait for a thread. */
  queueWaitLimitMs?: number;
}

export const DOCUMENT_POOL_DEFAULTS = { threads: 2, maxQueue: 16, perPerson: 2, timeLimitMs: 60_000, queueWaitLimitMs: 60_000 } as const;

const BUSY = 'The server is busy preparing other exports; try again in a moment.';

interface Waiting {
  start(): void;
  refuse(error: AppError): void;
  timer: NodeJS.Timeout;
}

/** What a failed task tells the person who asked, by task. */
const FAILURE: Record<string, string> = {
  latex: 'This notebook could not be exported',
  compareVersions: 'These versions could not be compared',
  restorable: 'This version could not be read',
  readDataset: 'This table could not be read',
  importDocument: 'This notebook file could not be read',
  datasetCsv: 'This dataset could not be written as CSV',
  datasetPointsInRange: 'This dataset could not be read',
};

export function createDocumentRenderer(options: DocumentPoolOptions = {}): DocumentRenderer {
  const { threads, maxQueue, perPerson, timeLimitMs, queueWaitLimitMs } = { ...DOCUMENT_POOL_DEFAULTS, ...options };
  const pool = new Piscina({
    filename: path.join(__dirname, 'documentWorker.ts'),
    // One thread is started (and its modules loaded) at boot, so the first comparison does not pay for it.
    minThreads: 1,
    maxThreads: threads,
    idleTimeout: 30_000,
  });
  // The queue is kept here and piscina is given a task only when a thread is free, so the time limit
  // (an abort signal, which piscina starts counting at submission) measures work, not waiting.
  let working = 0;
  const queue: Waiting[] = [];
  const outstandingOf = new Map<string, number>();

  function startNext() {
    while (working < threads && queue.length) {
      const next = queue.shift()!;
      clearTimeout(next.timer);
      working += 1;
      next.start();
    }
  }

  /** Resolves once a thread is reserved for the caller (counted in `working` from that moment). */
  function reserveThread(): Promise<void> {
    if (working < threads) {
      working += 1;
      return Promise.resolve();
    }
    if (queue.length >= maxQueue) return Promise.reject(new AppError('queue_full', BUSY));
    return new Promise<void>((resolve, reject) => {
      const entry: Waiting = {
        start: resolve,
        refuse: reject,
        timer: setTimeout(() => {
          queue.splice(queue.indexOf(entry), 1);
          reject(new AppError('queue_full', BUSY));
        }, queueWaitLimitMs),
      };
      queue.push(entry);
    });
  }

  async function work<T>(task: unknown, name: string): Promise<T> {
    const signal = AbortSignal.timeout(timeLimitMs);
    try {
      return (await pool.run(task, { name, signal })) as T;
    } catch (error) {
      if (signal.aborted) throw new AppError('queue_full', `This took longer than the ${Math.round(timeLimitMs / 1000)} s allowed for one document and was stopped; try again when the server is less busy, or make the notebook smaller.`);
      const reason = error instanceof Error ? error.message : String(error);
      throw new AppError('validation_failed', `${FAILURE[name] ?? 'This document could not be prepared'}: ${reason.slice(0, 300)}`);
    }
  }

  async function run<T>(task: unknown, name: string, person: string): Promise<T> {
    const mine = outstandingOf.get(person) ?? 0;
    if (mine >= perPerson) throw new AppError('queue_full', `You already have ${mine} exports or comparisons in preparation; wait for them to finish.`);
    outstandingOf.set(person, mine + 1);
    try {
      await reserveThread();
      try {
        return await work<T>(task, name);
      } finally {
        working -= 1;
        startNext();
      }
    } finally {
      const left = (outstandingOf.get(person) ?? 1) - 1;
      if (left > 0) outstandingOf.set(person, left);
      else outstandingOf.delete(person);
    }
  }

  return {
    latex: (documentJson, person, style = { exact: true }) => run<string>({ documentJson, style }, 'latex', person),
    compare: (fromJson, toJson, person) => run<CellComparison[]>({ fromJson, toJson }, 'compareVersions', person),
    restorable: (snapshotJson, person) => run<RestorableSnapshot>(snapshotJson, 'restorable', person),
    readDataset: (task, person) => run<ReadDatasetOutcome>(task, 'readDataset', person),
    importDocument: (text, person) => run<ImportOutcome>(text, 'importDocument', person),
    datasetCsv: (pointsJson, columns, person) => run<string>({ pointsJson, columns }, 'datasetCsv', person),
    datasetPointsInRange: (task, person) => run<{ points: DatasetPoints; kept: number }>(task, 'datasetPointsInRange', person),
    async close() {
      for (const waiting of queue.splice(0)) {
        clearTimeout(waiting.timer);
        waiting.refuse(new AppError('queue_full', BUSY));
      }
      await pool.destroy();
    },
  };
}
