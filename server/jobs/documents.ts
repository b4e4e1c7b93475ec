import path from 'node:path';
import { Piscina } from 'piscina';
import type { CellComparison } from '../../shared/notebook/api';
import type { NotebookDocument } from '../../shared/notebook/exports';

/** Document work off the request thread (exports, version comparisons): one small pool, separate from the engine's job queue. */
export interface DocumentRenderer {
  latex(document: NotebookDocument): Promise<string>;
  compare(fromJson: string, toJson: string): Promise<CellComparison[]>;
  close(): Promise<void>;
}

const RENDER_TIME_LIMIT_MS = 60_000;


export function createDocumentRenderer(): DocumentRenderer {
  const pool = new Piscina({
    filename: path.join(__dirname, 'documentWorker.ts'),
    // One thread is started (and its modules loaded) at boot, so the first comparison does not pay for it.
    minThreads: 1,
    maxThreads: 2,
    idleTimeout: 30_000,
  });
  return {
    latex: (document) => pool.run(document, { signal: AbortSignal.timeout(RENDER_TIME_LIMIT_MS) }) as Promise<string>,
    compare: (fromJson, toJson) => pool.run({ fromJson, toJson }, { name: 'compareVersions', signal: AbortSignal.timeout(RENDER_TIME_LIMIT_MS) }) as Promise<CellComparison[]>,
    close: () => pool.destroy(),
  };
}
