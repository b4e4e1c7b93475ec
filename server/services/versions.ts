import type { DataSource, EntityManager } from 'typeorm';
import type { VersionComparison, VersionSummary } from '../../shared/notebook/api';
import type { DocumentRenderer } from '../jobs/documents';
import type { CellInput } from '../../shared/notebook/cells';
import { fingerprintOf } from '../../shared/notebook/dependencies';
import { NOTEBOOK_FORMAT, NOTEBOOK_FORMAT_VERSION, type NotebookDocument } from '../../shared/notebook/exports';
import { megabytes } from '../../shared/jobs/cost';
import { RESULT_LIMITS } from '../../shared/jobs/limits';
import { CellJobError, jobForCell, type SetupInput } from '../../shared/notebook/jobs';
import type { SignedInUser } from '../auth/sessions';
import { Cell, JobRun, Notebook, NotebookVersion } from '../db/entities';
import { AppError } from '../http/errors';
import { newId } from '../ids';
import { assertCellsAccepted } from './cellChecks';
import { MAX_CELLS_PER_NOTEBOOK, type NotebookService } from './notebooks';
import { jobHash } from './runs';

/** At most this many versions per notebook: beyond it the oldest automatic ones make room. */
export const MAX_VERSIONS_PER_NOTEBOOK = 200;

export { COMPARISON_LIMITS, valueDifferences } from '../../shared/notebook/comparison';

/** Every column of a version but its snapshot, which may be megabytes. */
const SUMMARY_COLUMNS = { id: true, number: true, message: true, authorName: true, createdAt: true, automatic: true } as const;

function toSummary(row: Pick<NotebookVersion, keyof typeof SUMMARY_COLUMNS>): VersionSummary {
  return { id: row.id, number: row.number, message: row.message, authorName: row.authorName, createdAt: row.createdAt.toISOString(), automatic: row.automatic };
}

/** A cell as stored: its input and its shown result as the JSON text they are kept in. */
interface StoredCell {
  label: string;
  kind: string;
  inputJson: string;
  outputJson: string | null;
}

/**
 * Takes results in order while their total stays within the notebook's result budget (each cell counted,
 * even where several show one result), as running them would; returns whether this one fits.
 */
function resultBudget() {
  let total = 0;
  return (bytes: number): boolean => {
    if (bytes > RESULT_LIMITS.maxResultBytes || total + bytes > RESULT_LIMITS.maxNotebookResultBytes) return false;
    total += bytes;
    return true;
  };
}

/**
 * The notebook's cells with the JSON text of their inputs and results, read without parsing any of it; a
 * result beyond the notebook's result budget is left out (null), so the text stays bounded.
 */
async function storedCells(dataSource: DataSource, notebookId: string): Promise<StoredCell[]> {
  const rows: { label: string; kind: string; inputJson: string; holderId: string | null; bytes: number | null }[] = await dataSource.query(
    `SELECT c."label" AS label, c."kind" AS kind, c."inputJson" AS inputJson, h."id" AS holderId, length(h."resultJson") AS bytes
       FROM "cells" c
       LEFT JOIN "job_runs" r ON r."id" = c."lastRunId"
       LEFT JOIN "job_runs" h ON h."id" = COALESCE(r."resultRunId", r."id")
      WHERE c."notebookId" = ?
      ORDER BY c."position" ASC`,
    [notebookId],
  );
  const fits = resultBudget();
  const shown = rows.map((row) => (row.holderId && row.bytes && fits(Number(row.bytes)) ? row.holderId : null));
  const holderIds = [...new Set(shown.filter((id): id is string => id !== null))];
  const texts = new Map<string, string>();
  if (holderIds.length) {
    const holders: { id: string; resultJson: string }[] = await dataSource.query(
      `SELECT "id" AS id, "resultJson" AS resultJson FROM "job_runs" WHERE "id" IN (${holderIds.map(() => '?').join(', ')})`,
      holderIds,
    );
    for (const holder of holders) texts.set(holder.id, holder.resultJson);
  }
  return rows.map((row, i) => ({ label: row.label, kind: row.kind, inputJson: row.inputJson, outputJson: shown[i] ? (texts.get(shown[i]!) ?? null) : null }));
}

// Stored inputs and results are JSON text already: splicing them, rather than parsing and printing them
// again, keeps work that grows with the results off the request thread.
const cellText = (cell: StoredCell, withKind: boolean) =>
  `{"label":${JSON.stringify(cell.label)},${withKind ? `"kind":${JSON.stringify(cell.kind)},` : ''}"input":${cell.inputJson},"output":${cell.outputJson ?? 'null'}}`;

/** A version snapshot's text: {"title", "summary", "cells": [{label, kind, input, output}]} (the VersionSnapshot shape). */
function snapshotText(title: string, summary: string, cells: StoredCell[]): string {
  return `{"title":${JSON.stringify(title)},"summary":${JSON.stringify(summary)},"cells":[${cells.map((cell) => cellText(cell, true)).join(',')}]}`;
}

/** The exchange file's text, in the shape of toNotebookDocument (shared/notebook/exports.ts), compact. */
function documentText(title: string, summary: string, cells: StoredCell[], exportedAt: Date): string {
  const head = { format: NOTEBOOK_FORMAT, formatVersion: NOTEBOOK_FORMAT_VERSION, title, summary, exportedAt: exportedAt.toISOString() };
  return `${JSON.stringify(head).slice(0, -1)},"cells":[${cells.map((cell) => cellText(cell, false)).join(',')}]}`;
}

/**
 * For each cell that runs a job, the newest finished run of exactly that job (same input hash) and the
 * fingerprint that makes the cell show it as up to date: a restore brings back results whose inputs are
 * unchanged, as far as the notebook's result budget allows; `leftToRun` names the cells beyond it.
 */
type HoldingRun = Pick<JobRun, 'id' | 'inputHash' | 'engineVersion' | 'jobJson'>;

async function cachedResults(manager: EntityManager, cells: { label: string; input: CellInput }[]): Promise<{ found: Map<string, { run: HoldingRun; fingerprint: string }>; leftToRun: string[] }> {
  const setups = new Map<string, SetupInput>(cells.flatMap((c) => (c.input.kind === 'setup' ? [[c.label, c.input] as const] : [])));
  const byLabel = new Map(cells.map((c) => [c.label, { label: c.label, input: c.input }]));
  const found = new Map<string, { run: HoldingRun; fingerprint: string }>();
  const leftToRun: string[] = [];
  const fits = resultBudget();
  for (const cell of cells) {
    let job: Record<string, unknown> | null;
    try {
      job = jobForCell(cell.input, setups);
    } catch (error) {
      if (error instanceof CellJobError) continue;
      throw error;
    }
    if (!job) continue;
    // only a run that computed the result holds it; its size is measured, its text is not read here
    const [run]: (HoldingRun & { bytes: number | null })[] = await manager.query(
      `SELECT "id" AS id, "inputHash" AS inputHash, "engineVersion" AS engineVersion, "jobJson" AS jobJson, length("resultJson") AS bytes
         FROM "job_runs" WHERE "inputHash" = ? AND "status" = 'done' AND "cached" = 0
        ORDER BY "createdAt" DESC LIMIT 1`,
      [jobHash(job)],
    );
    if (!run) continue;
    if (!fits(Number(run.bytes ?? 0))) {
      leftToRun.push(cell.label);
      continue;
    }
    found.set(cell.label, { run, fingerprint: fingerprintOf(cell, byLabel) });
  }
  return { found, leftToRun };
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
    return { notebook, cells: await storedCells(dataSource, notebookId) };
  }

  /**
   * Keeps the notebook within MAX_VERSIONS_PER_NOTEBOOK before one more is written: the oldest automatic
   * versions go first; versions saved by hand are never deleted, so a save by hand beyond the limit is
   * refused (an automatic one is still written, and is the first to go at the next save).
   */
  async function makeRoom(manager: EntityManager, notebookId: string, automatic: boolean) {
    const repo = manager.getRepository(NotebookVersion);
    const excess = (await repo.countBy({ notebookId })) - MAX_VERSIONS_PER_NOTEBOOK + 1;
    if (excess <= 0) return;
    const oldest = await repo.find({ select: { id: true }, where: { notebookId, automatic: true }, order: { number: 'ASC' }, take: excess });
    if (oldest.length) await repo.delete(oldest.map((row) => row.id));
    if (oldest.length < excess && !automatic) {
      throw new AppError('conflict', `This notebook keeps at most ${MAX_VERSIONS_PER_NOTEBOOK} versions and all of them were saved by hand; a version cannot be deleted, so no more can be saved.`);
    }
  }

  async function record(viewer: SignedInUser, notebookId: string, message: string, automatic: boolean): Promise<VersionSummary> {
    const { notebook, cells } = await notebookText(notebookId);
    const snapshotJson = snapshotText(notebook.title, notebook.summary, cells);
    return dataSource.transaction(async (manager) => {
      await makeRoom(manager, notebookId, automatic);
      const repo = manager.getRepository(NotebookVersion);
      const last = await repo.findOne({ select: { number: true }, where: { notebookId }, order: { number: 'DESC' } });
      const id = newId();
      await manager.insert(NotebookVersion, { id, notebookId, number: (last?.number ?? 0) + 1, message, automatic, authorId: viewer.id, authorName: viewer.name, snapshotJson });
      return toSummary(await repo.findOneOrFail({ select: SUMMARY_COLUMNS, where: { id } }));
    });
  }

  async function load(notebookId: string, versionId: string) {
    const row = await versions.findOneBy({ id: versionId, notebookId });
    if (!row) throw new AppError('not_found', 'No such version of this notebook.');
    return row;
  }

  return {
    async save(viewer: SignedInUser, notebookId: string, message: string, automatic = false) {
      await notebooks.editable(viewer, notebookId);
      return record(viewer, notebookId, message, automatic);
    },

    async list(viewer: SignedInUser, notebookId: string): Promise<VersionSummary[]> {
      await notebooks.access(viewer, notebookId);
      return (await versions.find({ select: SUMMARY_COLUMNS, where: { notebookId }, order: { number: 'DESC' } })).map(toSummary);
    },

    /**
     * The reply `{"version": {…summary, title, summary, cells}}` as JSON text: the stored snapshot (an object
     * with exactly title, summary and cells) is spliced in, never parsed.
     */
    async getJson(viewer: SignedInUser, notebookId: string, versionId: string): Promise<string> {
      await notebooks.access(viewer, notebookId);
      const row = await load(notebookId, versionId);
      return `{"version":${JSON.stringify(toSummary(row)).slice(0, -1)},${row.snapshotJson.slice(1)}}`;
    },

    async compare(viewer: SignedInUser, notebookId: string, fromId: string, toId: string): Promise<VersionComparison> {
      await notebooks.access(viewer, notebookId);
      const rows = await Promise.all([fromId, toId].map((id) => versions.findOneBy({ id, notebookId })));
      const [from, to] = rows;
      if (!from || !to) throw new AppError('not_found', 'No such version of this notebook.');
      // Parsing and walking two large snapshots is work that grows with the results: a worker thread does it.
      const cells = await documents.compare(from.snapshotJson, to.snapshotJson, viewer.id);
      return { from: toSummary(from), to: toSummary(to), cells };
    },

    async restore(viewer: SignedInUser, notebookId: string, versionId: string) {
      await notebooks.editable(viewer, notebookId);
      const row = await load(notebookId, versionId);
      const snapshot = await documents.restorable(row.snapshotJson, viewer.id);
      assertCellsAccepted(snapshot.cells);
      await record(viewer, notebookId, `Before restoring version ${row.number}`, true);
      const leftToRun = await dataSource.transaction(async (manager) => {
        await manager.delete(Cell, { notebookId });
        const results = await cachedResults(manager, snapshot.cells);
        for (const [position, cell] of snapshot.cells.entries()) {
          const cellId = newId();
          const result = results.found.get(cell.label);
          // the cell gets its own cached run, as a cache hit on running it would give (no engine work)
          const runId = result ? await recordCachedRun(manager, result.run, cellId, viewer.id) : null;
          await manager.insert(Cell, {
            id: cellId,
            notebookId,
            position,
            kind: cell.kind,
            label: cell.label,
            inputJson: JSON.stringify(cell.input),
            revision: 1,
            lastRunId: runId,
            lastRunFingerprint: result?.fingerprint ?? null,
          });
        }
        await manager.update(Notebook, { id: notebookId }, { title: snapshot.title, summary: snapshot.summary, updatedAt: new Date() });
        return results.leftToRun;
      });
      notebooks.forget(notebookId);
      await record(viewer, notebookId, restoredMessage(row, leftToRun), true);
      return notebooks.detail(viewer, notebookId);
    },

    /** The exchange file as JSON text (compact), and the title for its file name. */
    async exportDocument(viewer: SignedInUser, notebookId: string): Promise<{ title: string; json: string }> {
      await notebooks.access(viewer, notebookId);
      const { notebook, cells } = await notebookText(notebookId);
      return { title: notebook.title, json: documentText(notebook.title, notebook.summary, cells, new Date()) };
    },

    async importDocument(viewer: SignedInUser, document: NotebookDocument) {
      if (document.cells.length > MAX_CELLS_PER_NOTEBOOK) throw new AppError('conflict', `A notebook holds at most ${MAX_CELLS_PER_NOTEBOOK} cells.`);
      assertCellsAccepted(document.cells);
      const created = await notebooks.create(viewer, { title: document.title, summary: document.summary, groupId: null });
      await dataSource.transaction(async (manager) => {
        for (const [position, cell] of document.cells.entries()) {
          await manager.insert(Cell, { id: newId(), notebookId: created.id, position, kind: cell.input.kind, label: cell.label, inputJson: JSON.stringify(cell.input), revision: 1 });
        }
      });
      notebooks.forget(created.id);
      return notebooks.detail(viewer, created.id);
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
