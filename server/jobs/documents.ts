import path from 'node:path';
import { Piscina } from 'piscina';
import type { CellComparison } from '../../shared/notebook/api';
import type { NotebookDocument } from '../../shared/notebook/exports';
import { AppError } from '../http/errors';

/** Document work off the request thread (exports, version comparisons): one small pool, separate from the engine's job queue. */
export interface DocumentRenderer {
  latex(document: NotebookDocument): Promise<string>;
  compare(fromJson: string, toJson: string): Promise<CellComparison[]>;
  close(): Promise<void>;
}

const RENDER_TIME_LIMIT_MS = 60_000;

export interface DocumentPoolOptions {
  threads?: number;
  /** Documents waiting for a thread; more are refused with queue_full (429). */
  maxQueue?: number;
}

/** DOCUMENT_QUEUE_LIMIT: documents that may wait for a thread (default 16). */
export function documentPoolOptionsFrom(env: Record<string, string | undefined> = process.env): DocumentPoolOptions {
  const limit = Number.parseInt(env.DOCUMENT_QUEUE_LIMIT ?? '', 10);
  return Number.isInteger(limit) && limit >= 0 ? { maxQueue: limit } : {};
}

export function createDocumentRenderer(options: DocumentPoolOptions = documentPoolOptionsFrom()): DocumentRenderer {
  const threads = options.threads ?? 2;
  const maxQueue = options.maxQueue ?? 16;
  const pool = new Piscina({
    filename: path.join(__dirname, 'documentWorker.ts'),
    // One thread is started (and its modules loaded) at boot, so the first comparison does not pay for it.
    minThreads: 1,
    maxThreads: threads,
    idleTimeout: 30_000,
  });
  // Counted here rather than with piscina's maxQueue: piscina keeps tasks that carry an abort signal
  // (our time limit) in a separate queue that its maxQueue does not bound.
  let outstanding = 0;
  async function run<T>(task: unknown, name?: string): Promise<T> {
    if (outstanding >= threads + maxQueue) throw new AppError('queue_full', 'The server is busy preparing other exports; try again in a moment.');
    outstanding += 1;
    try {
      return (await pool.run(task, { name, signal: AbortSignal.timeout(RENDER_TIME_LIMIT_MS) })) as T;
    } finally {
      outstanding -= 1;
    }
  }
  return {
    latex: (document) => run<string>(document),
    compare: (fromJson, toJson) => run<CellComparison[]>({ fromJson, toJson }, 'compareVersions'),
    close: () => pool.destroy(),
  };
}
