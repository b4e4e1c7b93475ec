import type { DataSource, EntityManager } from 'typeorm';
import type { VersionSummary } from '../../shared/notebook/api';
import type { CellInput, CellKind } from '../../shared/notebook/cells';
import { canonicalJson } from '../../shared/notebook/dependencies';
import { RESULT_LIMITS } from '../../shared/jobs/contract';
import type { NotebookAction, NotebookEventKind } from '../../shared/notebook/sharing';
import type { SignedInUser } from '../auth/sessions';
import { Cell, Notebook, NotebookMember, NotebookVersion } from '../db/entities';
import { AppError } from '../http/errors';
import { newId } from '../ids';
import { recordNotebookChange, type NotebookChange, type NotebookEventBus } from './notebookEvents';
import type { NotebookAccess } from './notebooks';
import { currentDatasetViews, deleteUnheldDatasets, recordVersionDatasets } from './datasets';
import { dialectOf, runSql } from '../db/sql';

/** At most this many versions per notebook: beyond it the oldest automatic ones make room. */
export const MAX_VERSIONS_PER_NOTEBOOK = 200;

/** Every column of a version but its snapshot, which may be megabytes. */
export const SUMMARY_COLUMNS = { id: true, number: true, message: true, authorName: true, createdAt: true, automatic: true } as const;

export function toSummary(row: Pick<NotebookVersion, keyof typeof SUMMARY_COLUMNS>): VersionSummary {
  return { id: row.id, number: row.number, message: row.message, authorName: row.authorName, createdAt: row.createdAt.toISOString(), automatic: row.automatic };
}

/** A cell as stored: its input and its shown result as the JSON text they are kept in. */
export interface StoredCell {
  label: string;
  kind: string;
  inputJson: string;
  outputJson: string | null;
}

/**
 * Takes results in order while their total stays within the notebook's result budget (each cell counted,
 * even where several show one result), as running them would; returns whether this one fits.
 */
export function resultBudget() {
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
export async function storedCells(manager: EntityManager, notebookId: string): Promise<StoredCell[]> {
  const rows: { label: string; kind: string; inputJson: string; holderId: string | null; bytes: number | null }[] = await runSql(
    manager,
    `SELECT c."label" AS "label", c."kind" AS "kind", c."inputJson" AS "inputJson", h."id" AS "holderId", length(h."resultJson") AS "bytes"
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
    const holders: { id: string; resultJson: string }[] = await runSql(
      manager,
      `SELECT "id" AS "id", "resultJson" AS "resultJson" FROM "job_runs" WHERE "id" IN (${holderIds.map(() => '?').join(', ')})`,
      holderIds,
    );
    for (const holder of holders) texts.set(holder.id, holder.resultJson);
  }
  return rows.map((row, i) => ({ label: row.label, kind: row.kind, inputJson: row.inputJson, outputJson: shown[i] ? (texts.get(shown[i]!) ?? null) : null }));
}

// Stored inputs and results are JSON text already: splicing them, rather than parsing and printing them
// again, keeps work that grows with the results off the request thread.
export const cellText = (cell: StoredCell, withKind: boolean) =>
  `{"label":${JSON.stringify(cell.label)},${withKind ? `"kind":${JSON.stringify(cell.kind)},` : ''}"input":${cell.inputJson},"output":${cell.outputJson ?? 'null'}}`;

/**
 * A version snapshot's text: {"title", "summary", "cells": [{label, kind, input, output}], "datasets"?: [DatasetView]}
 * (the VersionSnapshot shape; the datasets without their points, which the version holds by id; absent when
 * the notebook has none, as in versions saved before datasets existed).
 */
function snapshotText(title: string, summary: string, cells: StoredCell[], datasets: unknown[]): string {
  const held = datasets.length ? `,"datasets":${JSON.stringify(datasets)}` : '';
  return `{"title":${JSON.stringify(title)},"summary":${JSON.stringify(summary)},"cells":[${cells.map((cell) => cellText(cell, true)).join(',')}]${held}}`;
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
  if (oldest.length) {
    await repo.delete(oldest.map((row) => row.id));
    await deleteUnheldDatasets(manager, notebookId);
  }
  if (oldest.length < excess && !automatic) {
    throw new AppError('conflict', `This notebook keeps at most ${MAX_VERSIONS_PER_NOTEBOOK} versions and all of them were saved by hand; a version cannot be deleted, so no more can be saved.`);
  }
}

/** Snapshot the notebook as it stands in this transaction and keep it as a new version. */
async function saveVersionIn(manager: EntityManager, author: SignedInUser, notebookId: string, message: string, automatic: boolean): Promise<VersionSummary> {
  const notebook = await manager.findOneByOrFail(Notebook, { id: notebookId });
  const snapshotJson = snapshotText(notebook.title, notebook.summary, await storedCells(manager, notebookId), await currentDatasetViews(manager, notebookId));
  await makeRoom(manager, notebookId, automatic);
  const repo = manager.getRepository(NotebookVersion);
  const last = await repo.findOne({ select: { number: true }, where: { notebookId }, order: { number: 'DESC' } });
  const id = newId();
  await manager.insert(NotebookVersion, { id, notebookId, number: (last?.number ?? 0) + 1, message, automatic, authorId: author.id, authorName: author.name, snapshotJson });
  await recordVersionDatasets(manager, notebookId, id);
  return toSummary(await repo.findOneOrFail({ select: SUMMARY_COLUMNS, where: { id } }));
}

/** What a write did, for the notebook's log and the live streams; null when it changed nothing. */
export interface WrittenChange {
  kind: NotebookEventKind;
  cellId?: string | null;
  /** One line for the log, e.g. `edited cell "bubble"`. */
  text: string;
}

/** The tools a write gets inside its transaction. */
export interface WriteContext {
  manager: EntityManager;
  access: NotebookAccess;
  /** Keep an automatic version of the notebook as it stands now in this transaction. */
  saveVersion(message: string, automatic?: boolean): Promise<VersionSummary>;
}

export interface NotebookWrite<Prepared, Value> {
  /** The role action the writer checks first (edit, run, saveVersion, restoreVersion). */
  action: Extract<NotebookAction, 'edit' | 'run' | 'saveVersion' | 'restoreVersion'>;
  /** Checks and work outside the transaction, after the role check: costs, sizes, queueing jobs. */
  prepare?(access: NotebookAccess): Promise<Prepared>;
  /** Message of an automatic version to keep before the write, decided inside the transaction; null for none. */
  versionBefore?(manager: EntityManager, prepared: Prepared): Promise<string | null>;
  apply(context: WriteContext, prepared: Prepared): Promise<{ value: Value; change: WrittenChange | null; touch?: boolean }>;
}

export interface WriterDeps {
  requireRole(viewer: SignedInUser, notebookId: string, action: NotebookAction): Promise<NotebookAccess>;
  forget(notebookId: string): void;
  events: NotebookEventBus;
}

/** A new notebook's first cells, as stored. */
export interface NewCell {
  label: string;
  input: CellInput;
}

/** A cell as a whole-notebook write (a restore) leaves it, in notebook order. */
export interface CellToKeep {
  label: string;
  kind: CellKind;
  input: CellInput;
}

/**
 * Makes the notebook's cells exactly `wanted`, matched by label: a cell whose label stays keeps its id
 * (comment threads and open editors name it) and moves up one revision only when its input changes, so a
 * stale save is refused and comments see "changed since" only where something changed; cells not wanted
 * are deleted, new labels inserted at revision 1. Returns the id of every wanted cell by label.
 */
export async function writeCellsByLabel(manager: EntityManager, notebookId: string, wanted: CellToKeep[]): Promise<Map<string, string>> {
  const current = new Map((await manager.findBy(Cell, { notebookId })).map((cell) => [cell.label, cell]));
  const wantedLabels = new Set(wanted.map((cell) => cell.label));
  const gone = [...current.values()].filter((cell) => !wantedLabels.has(cell.label)).map((cell) => cell.id);
  if (gone.length) await manager.delete(Cell, gone);
  const ids = new Map<string, string>();
  for (const [position, cell] of wanted.entries()) {
    const inputJson = JSON.stringify(cell.input);
    const kept = current.get(cell.label);
    if (!kept) {
      const id = newId();
      await manager.insert(Cell, { id, notebookId, position, kind: cell.kind, label: cell.label, inputJson, revision: 1 });
      ids.set(cell.label, id);
      continue;
    }
    const changed = canonicalJson(JSON.parse(kept.inputJson)) !== canonicalJson(cell.input);
    const fields = changed ? { position, kind: cell.kind, inputJson, revision: kept.revision + 1 } : { position };
    await manager.update(Cell, { id: kept.id }, fields);
    ids.set(cell.label, kept.id);
  }
  return ids;
}

/**
 * Writes to one notebook take turns, as they do on SQLite, where one transaction writes at a time: on
 * PostgreSQL the notebook's row is locked until the transaction ends (version numbers, cell positions and
 * revisions are read and then written inside it).
 */
async function lockNotebook(manager: EntityManager, notebookId: string): Promise<void> {
  if (dialectOf(manager) === 'postgres') await runSql(manager, 'SELECT "id" FROM "notebooks" WHERE "id" = ? FOR UPDATE', [notebookId]);
}

/**
 * The one writer of notebooks and their cells: checks the role, runs the caller's checks, then in one
 * transaction writes, keeps automatic versions and records the change in the notebook's log; after the
 * commit it drops cached views and tells the live streams.
 */
export function createNotebookWriter(dataSource: DataSource, deps: WriterDeps) {
  function changeOf(actor: SignedInUser, notebookId: string, written: WrittenChange): NotebookChange {
    return { notebookId, kind: written.kind, actorId: actor.id, actorName: actor.name, cellId: written.cellId ?? null, text: written.text };
  }

  async function write<Prepared, Value>(actor: SignedInUser, notebookId: string, spec: NotebookWrite<Prepared, Value>): Promise<Value> {
    const access = await deps.requireRole(actor, notebookId, spec.action);
    const prepared = (await spec.prepare?.(access)) as Prepared;
    let change: NotebookChange | null = null;
    const value = await dataSource.transaction(async (manager) => {
      await lockNotebook(manager, notebookId);
      const saveVersion = (message: string, automatic = true) => saveVersionIn(manager, actor, notebookId, message, automatic);
      const before = await spec.versionBefore?.(manager, prepared);
      if (before) await saveVersion(before);
      const result = await spec.apply({ manager, access, saveVersion }, prepared);
      if (!result.change) return result.value;
      if (result.touch !== false) await manager.update(Notebook, { id: notebookId }, { updatedAt: new Date() });
      change = changeOf(actor, notebookId, result.change);
      await recordNotebookChange(manager, change);
      return result.value;
    });
    deps.forget(notebookId);
    if (change) deps.events.publish(change);
    return value;
  }

  /** A new notebook owned by the actor, optionally filed under a group (an editor grant) and with cells; `kind` logs it. */
  async function create(
    actor: SignedInUser,
    notebook: { title: string; summary: string; groupId: string | null },
    cells: NewCell[] = [],
    kind: NotebookEventKind | null = null,
    /** More rows of the new notebook written in the same transaction (an import's datasets). */
    alsoWrite?: (manager: EntityManager, notebookId: string) => Promise<void>,
  ): Promise<string> {
    const id = newId();
    let change: NotebookChange | null = null;
    await dataSource.transaction(async (manager) => {
      await manager.insert(Notebook, { id, title: notebook.title, summary: notebook.summary, groupId: notebook.groupId, ownerId: actor.id });
      if (notebook.groupId) await manager.insert(NotebookMember, { id: newId(), notebookId: id, groupId: notebook.groupId, role: 'editor', grantedById: actor.id });
      for (const [position, cell] of cells.entries()) {
        await manager.insert(Cell, { id: newId(), notebookId: id, position, kind: cell.input.kind, label: cell.label, inputJson: JSON.stringify(cell.input), revision: 1 });
      }
      await alsoWrite?.(manager, id);
      if (!kind) return;
      change = changeOf(actor, id, { kind, text: `${kind === 'imported' ? 'imported' : 'created'} the notebook with ${cells.length} cell${cells.length === 1 ? '' : 's'}` });
      await recordNotebookChange(manager, change);
    });
    deps.forget(id);
    if (change) deps.events.publish(change);
    return id;
  }

  return { write, create };
}

export type NotebookWriter = ReturnType<typeof createNotebookWriter>;
