import type { DataSource, EntityManager } from 'typeorm';
import type { VersionComparison, VersionSummary } from '../../shared/notebook/api';
import type { DocumentRenderer } from '../jobs/documents';
import type { CellInput } from '../../shared/notebook/cells';
import { fingerprintOf } from '../../shared/notebook/dependencies';
import { NOTEBOOK_FORMAT, NOTEBOOK_FORMAT_VERSION } from '../../shared/notebook/exports';
import { megabytes } from '../../shared/jobs/cost';
import { RESULT_LIMITS } from '../../shared/jobs/contract';
import { CellJobError, jobForCell, type CellJobContext, type SetupInput } from '../../shared/notebook/jobs';
import type { SignedInUser } from '../auth/sessions';
import { Cell, JobRun, Notebook, NotebookVersion } from '../db/entities';
import { AppError } from '../http/errors';
import { newId } from '../ids';
import { assertCellsAccepted } from './cellChecks';
import { MAX_CELLS_PER_NOTEBOOK, type NotebookService } from './notebooks';
import { jobHash } from './runs';
import { assertImportedDatasetsFit, currentDatasetHashes, datasetReader, deleteUnheldDatasets, exportedDatasetsText, insertImportedDatasets, restoreVersionDatasets, type DatasetReader } from './datasets';
import { cellText, resultBudget, storedCells, toSummary, writeCellsByLabel, SUMMARY_COLUMNS, type StoredCell } from './notebookWriter';
import { runSql } from '../db/sql';

export { MAX_VERSIONS_PER_NOTEBOOK } from './notebookWriter';

export { COMPARISON_LIMITS, valueDifferences } from '../../shared/notebook/comparison';

/** The exchange file's text, in the shape of toNotebookDocument (shared/notebook/exports.ts), compact. */
function documentText(title: string, summary: string, cells: StoredCell[], datasetsText: string, exportedAt: Date): string {
  const head = { format: NOTEBOOK_FORMAT, formatVersion: NOTEBOOK_FORMAT_VERSION, title, summary, exportedAt: exportedAt.toISOString() };
  return `${JSON.stringify(head).slice(0, -1)},"cells":[${cells.map((cell) => cellText(cell, false)).join(',')}],"datasets":[${datasetsText}]}`;
}

/**
 * For each cell that runs a job, the newest finished run of exactly that job (same input hash) and the
 * fingerprint that makes the cell show it as up to date: a restore brings back results whose inputs are
 * unchanged, as far as the notebook's result budget allows; `leftToRun` names the cells beyond it.
 */
type HoldingRun = Pick<JobRun, 'id' | 'inputHash' | 'engineVersion' | 'jobJson'>;

async function cachedResults(manager: EntityManager, notebookId: string, cells: { label: string; input: CellInput }[]): Promise<{ found: Map<string, { run: HoldingRun; fingerprint: string }>; leftToRun: string[] }> {
  const setups = new Map<string, SetupInput>(cells.flatMap((c) => (c.input.kind === 'setup' ? [[c.label, c.input] as const] : [])));
  const byLabel = new Map(cells.map((c) => [c.label, { label: c.label, input: c.input }]));
  const found = new Map<string, { run: HoldingRun; fingerprint: string }>();
  const leftToRun: string[] = [];
  const fits = resultBudget();
  const datasetHashes = await currentDatasetHashes(manager, notebookId);
  const inputs = new Map(cells.map((c) => [c.label, c.input]));
  const readDataset = datasetReader(manager, null, notebookId, '');
  for (const cell of cells) {
    let job: Record<string, unknown> | null;
    try {
      job = jobForCell(cell.input, setups, await comparisonContext(readDataset, cell.input, inputs));
    } catch (error) {
      if (error instanceof CellJobError) continue;
      throw error;
    }
    if (!job) continue;
    // only a run that computed the result holds it; its size is measured, its text is not read here
    const [run]: (HoldingRun & { bytes: number | null })[] = await runSql(
      manager,
      `SELECT "id" AS "id", "inputHash" AS "inputHash", "engineVersion" AS "engineVersion", "jobJson" AS "jobJson", length("resultJson") AS "bytes"
         FROM "job_runs" WHERE "inputHash" = ? AND "status" = 'done' AND "cached" = FALSE
        ORDER BY "createdAt" DESC LIMIT 1`,
      [jobHash(job)],
    );
    if (!run) continue;
    if (!fits(Number(run.bytes ?? 0))) {
      leftToRun.push(cell.label);
      continue;
    }
    found.set(cell.label, { run, fingerprint: fingerprintOf(cell, byLabel, datasetHashes) });
  }
  return { found, leftToRun };
}

/** A comparison cell's cells and dataset, when the dataset is small enough to read inside the transaction (else the cell is left to run). */
async function comparisonContext(readDataset: DatasetReader, input: CellInput, cells: Map<string, CellInput>): Promise<CellJobContext> {
  if (input.kind !== 'comparison') return {};
  try {
    const dataset = await readDataset(input);
    return { cells, datasets: new Map(dataset ? [[dataset.label, dataset]] : []) };
  } catch (error) {
    if (error instanceof AppError) return { cells };
    throw error;
  }
}

/** A cache hit for the restored cell: a row pointing at the run that holds the result, not a copy of it. */
async function recordCachedRun(manager: EntityManager, hit: HoldingRun, cellId: string, userId: string): Promise<string> {
  const id = newId();
  const now = new Date();
  await manager.insert(JobRun, {
    id,
    inputHash: hit.inputHash,
    engineVersion: hit.engineVersion,
    jobJson: hit.jobJson,
    status: 'done',
    progress: 1,
    cached: true,
    cellId,
    requestedBy: userId,
    resultRunId: hit.id,
    durationMs: 0,
    startedAt: now,
    finishedAt: now,
  });
  return id;
}

/** Versions are immutable snapshots; restoring one writes the old cells back and records a new version. */
export function createVersionService(dataSource: DataSource, notebooks: NotebookService, documents: DocumentRenderer) {
  const versions = dataSource.getRepository(NotebookVersion);

  async function notebookText(notebookId: string) {
    const notebook = await dataSource.getRepository(Notebook).findOneByOrFail({ id: notebookId });
    return { notebook, cells: await storedCells(dataSource.manager, notebookId) };
  }

  async function load(notebookId: string, versionId: string) {
    const row = await versions.findOneBy({ id: versionId, notebookId });
    if (!row) throw new AppError('not_found', 'No such version of this notebook.');
    return row;
  }

  return {
    async save(viewer: SignedInUser, notebookId: string, message: string): Promise<VersionSummary> {
      return notebooks.writer.write(viewer, notebookId, {
        action: 'saveVersion',
        apply: async ({ saveVersion }) => {
          const version = await saveVersion(message, false);
          return { value: version, change: { kind: 'version-saved', text: `saved version ${version.number}: ${message}` }, touch: false };
        },
      });
    },

    async list(viewer: SignedInUser, notebookId: string): Promise<VersionSummary[]> {
      await notebooks.requireRole(viewer, notebookId, 'read');
      return (await versions.find({ select: SUMMARY_COLUMNS, where: { notebookId }, order: { number: 'DESC' } })).map(toSummary);
    },

    /**
     * The reply `{"version": {…summary, title, summary, cells}}` as JSON text: the stored snapshot (an object
     * with exactly title, summary and cells) is spliced in, never parsed.
     */
    async getJson(viewer: SignedInUser, notebookId: string, versionId: string): Promise<string> {
      await notebooks.requireRole(viewer, notebookId, 'read');
      const row = await load(notebookId, versionId);
      return `{"version":${JSON.stringify(toSummary(row)).slice(0, -1)},${row.snapshotJson.slice(1)}}`;
    },

    async compare(viewer: SignedInUser, notebookId: string, fromId: string, toId: string): Promise<VersionComparison> {
      await notebooks.requireRole(viewer, notebookId, 'read');
      const rows = await Promise.all([fromId, toId].map((id) => versions.findOneBy({ id, notebookId })));
      const [from, to] = rows;
      if (!from || !to) throw new AppError('not_found', 'No such version of this notebook.');
      // Parsing and walking two large snapshots is work that grows with the results: a worker thread does it.
      const cells = await documents.compare(from.snapshotJson, to.snapshotJson, viewer.id);
      return { from: toSummary(from), to: toSummary(to), cells };
    },

    /** Write a version's cells back (results whose inputs are unchanged come back too); the states before and after are kept as versions. */
    async restore(viewer: SignedInUser, notebookId: string, versionId: string) {
      await notebooks.writer.write(viewer, notebookId, {
        action: 'restoreVersion',
        prepare: async () => {
          const row = await load(notebookId, versionId);
          const snapshot = await documents.restorable(row.snapshotJson, viewer.id);
          assertCellsAccepted(snapshot.cells);
          return { row, snapshot };
        },
        apply: async ({ manager, saveVersion }, { row, snapshot }) => {
          await saveVersion(`Before restoring version ${row.number}`);
          await restoreVersionDatasets(manager, notebookId, row.id);
          await deleteUnheldDatasets(manager, notebookId);
          const cellIds = await writeCellsByLabel(manager, notebookId, snapshot.cells);
          const results = await cachedResults(manager, notebookId, snapshot.cells);
          for (const cell of snapshot.cells) {
            const cellId = cellIds.get(cell.label)!;
            const result = results.found.get(cell.label);
            // the cell gets its own cached run, as a cache hit on running it would give (no engine work)
            const runId = result ? await recordCachedRun(manager, result.run, cellId, viewer.id) : null;
            await manager.update(Cell, { id: cellId }, { lastRunId: runId, lastRunFingerprint: result?.fingerprint ?? null });
          }
          await manager.update(Notebook, { id: notebookId }, { title: snapshot.title, summary: snapshot.summary, updatedAt: new Date() });
          await saveVersion(restoredMessage(row, results.leftToRun));
          return { value: undefined, change: { kind: 'restored', text: `restored version ${row.number}` } };
        },
      });
      return notebooks.detail(viewer, notebookId);
    },

    /**
     * The exchange file as JSON text (compact), and the title for its file name. For LaTeX (`pointsAs:
     * 'count'`) the datasets carry their row counts instead of their points: the document only counts them.
     */
    async exportDocument(viewer: SignedInUser, notebookId: string, pointsAs: 'points' | 'count' = 'points'): Promise<{ title: string; json: string }> {
      await notebooks.requireRole(viewer, notebookId, 'export');
      const { notebook, cells } = await notebookText(notebookId);
      return { title: notebook.title, json: documentText(notebook.title, notebook.summary, cells, await exportedDatasetsText(dataSource.manager, notebookId, pointsAs), new Date()) };
    },

    /** A notebook from an exchange file's text: parsed and checked in the document pool, never on the request thread. */
    async importDocument(viewer: SignedInUser, text: string | null) {
      if (text === null) throw new AppError('validation_failed', 'Send the notebook file as JSON (Content-Type: application/json).', { _: 'Required' });
      const document = await documents.importDocument(text, viewer.id);
      if (!document.ok) throw new AppError(document.code, document.message, document.fields, document.table);
      if (document.cells.length > MAX_CELLS_PER_NOTEBOOK) throw new AppError('conflict', `A notebook holds at most ${MAX_CELLS_PER_NOTEBOOK} cells.`);
      assertCellsAccepted(document.cells);
      assertImportedDatasetsFit(document.datasets);
      const notebookId = await notebooks.writer.create(viewer, { title: document.title, summary: document.summary, groupId: null }, document.cells, 'imported', (manager, id) =>
        insertImportedDatasets(manager, id, viewer, document.datasets),
      );
      return notebooks.detail(viewer, notebookId);
    },
  };
}

/** "Restored version N: message", noting the cells whose results did not fit the notebook's result budget. */
function restoredMessage(row: NotebookVersion, leftToRun: string[]): string {
  const base = `Restored version ${row.number}: ${row.message}`;
  if (!leftToRun.length) return base.slice(0, 500);
  const note = ` (${leftToRun.length} cell${leftToRun.length === 1 ? '' : 's'} left to run again, over the notebook's ${megabytes(RESULT_LIMITS.maxNotebookResultBytes)} of results: ${leftToRun.join(', ')})`;
  return note.length >= 400 ? `${base.slice(0, 100)}${note.slice(0, 399)}…` : `${base.slice(0, 500 - note.length)}${note}`;
}

export type VersionService = ReturnType<typeof createVersionService>;
