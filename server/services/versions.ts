import type { DataSource, EntityManager } from 'typeorm';
import type { VersionComparison, VersionDetail, VersionSummary } from '../../shared/notebook/api';
import type { VersionSnapshot } from '../../shared/notebook/comparison';
import type { DocumentRenderer } from '../jobs/documents';
import type { CellInput } from '../../shared/notebook/cells';
import { fingerprintOf } from '../../shared/notebook/dependencies';
import { toNotebookDocument, type NotebookDocument } from '../../shared/notebook/exports';
import { CellJobError, jobForCell, type SetupInput } from '../../shared/notebook/jobs';
import type { SignedInUser } from '../auth/sessions';
import { Cell, JobRun, Notebook, NotebookVersion } from '../db/entities';
import { AppError } from '../http/errors';
import { newId } from '../ids';
import { assertCellsAccepted } from './cellChecks';
import { MAX_CELLS_PER_NOTEBOOK, type NotebookService } from './notebooks';
import { jobHash, resultHolderId, resultsOf } from './runs';

type Snapshot = VersionSnapshot;

export { COMPARISON_LIMITS, valueDifferences } from '../../shared/notebook/comparison';

function toSummary(row: NotebookVersion): VersionSummary {
  return { id: row.id, number: row.number, message: row.message, authorName: row.authorName, createdAt: row.createdAt.toISOString(), automatic: row.automatic };
}

/**
 * For each cell that runs a job, the newest finished run of exactly that job (same input hash) and the
 * fingerprint that makes the cell show it as up to date: a restore brings back results whose inputs are unchanged.
 */
async function cachedResults(manager: EntityManager, cells: { label: string; input: CellInput }[]): Promise<Map<string, { run: JobRun; fingerprint: string }>> {
  const setups = new Map<string, SetupInput>(cells.flatMap((c) => (c.input.kind === 'setup' ? [[c.label, c.input] as const] : [])));
  const byLabel = new Map(cells.map((c) => [c.label, { label: c.label, input: c.input }]));
  const found = new Map<string, { run: JobRun; fingerprint: string }>();
  for (const cell of cells) {
    let job: Record<string, unknown> | null;
    try {
      job = jobForCell(cell.input, setups);
    } catch (error) {
      if (error instanceof CellJobError) continue;
      throw error;
    }
    if (!job) continue;
    // only a run that computed the result holds it; its text is not read here
    const run = await manager.getRepository(JobRun).findOne({
      select: { id: true, inputHash: true, engineVersion: true, jobJson: true },
      where: { inputHash: jobHash(job), status: 'done', cached: false },
      order: { createdAt: 'DESC' },
    });
    if (run) found.set(cell.label, { run, fingerprint: fingerprintOf(cell, byLabel) });
  }
  return found;
}

/** A cache hit for the restored cell: a row pointing at the run that holds the result, not a copy of it. */
async function recordCachedRun(manager: EntityManager, hit: JobRun, cellId: string, userId: string): Promise<string> {
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

  async function currentSnapshot(notebookId: string): Promise<Snapshot> {
    const notebook = await dataSource.getRepository(Notebook).findOneByOrFail({ id: notebookId });
    const rows = await notebooks.orderedCells(notebookId);
    const runIds = rows.map((r) => r.lastRunId).filter((id): id is string => Boolean(id));
    const runs = runIds.length ? await dataSource.getRepository(JobRun).createQueryBuilder('r').where('r.id IN (:...runIds)', { runIds }).getMany() : [];
    const results = await resultsOf(dataSource, runs);
    return {
      title: notebook.title,
      summary: notebook.summary,
      cells: rows.map((row) => {
        const input = notebooks.parseCellInput(row.inputJson);
        const run = runs.find((r) => r.id === row.lastRunId);
        return { label: row.label, kind: input.kind, input, output: run ? (results.get(resultHolderId(run))?.value ?? null) : null };
      }),
    };
  }

  async function record(viewer: SignedInUser, notebookId: string, message: string, automatic: boolean): Promise<VersionSummary> {
    const snapshot = await currentSnapshot(notebookId);
    return dataSource.transaction(async (manager) => {
      const last = await manager.getRepository(NotebookVersion).findOne({ where: { notebookId }, order: { number: 'DESC' } });
      const row = manager.getRepository(NotebookVersion).create({
        id: newId(),
        notebookId,
        number: (last?.number ?? 0) + 1,
        message,
        automatic,
        authorId: viewer.id,
        authorName: viewer.name,
        snapshotJson: JSON.stringify(snapshot),
      });
      await manager.insert(NotebookVersion, row);
      return toSummary(await manager.getRepository(NotebookVersion).findOneByOrFail({ id: row.id }));
    });
  }

  async function load(notebookId: string, versionId: string) {
    const row = await versions.findOneBy({ id: versionId, notebookId });
    if (!row) throw new AppError('not_found', 'No such version of this notebook.');
    return { row, snapshot: JSON.parse(row.snapshotJson) as Snapshot };
  }

  return {
    async save(viewer: SignedInUser, notebookId: string, message: string, automatic = false) {
      await notebooks.editable(viewer, notebookId);
      return record(viewer, notebookId, message, automatic);
    },

    async list(viewer: SignedInUser, notebookId: string): Promise<VersionSummary[]> {
      await notebooks.access(viewer, notebookId);
      return (await versions.find({ where: { notebookId }, order: { number: 'DESC' } })).map(toSummary);
    },

    async get(viewer: SignedInUser, notebookId: string, versionId: string): Promise<VersionDetail> {
      await notebooks.access(viewer, notebookId);
      const { row, snapshot } = await load(notebookId, versionId);
      return { ...toSummary(row), title: snapshot.title, summary: snapshot.summary, cells: snapshot.cells };
    },

    async compare(viewer: SignedInUser, notebookId: string, fromId: string, toId: string): Promise<VersionComparison> {
      await notebooks.access(viewer, notebookId);
      const rows = await Promise.all([fromId, toId].map((id) => versions.findOneBy({ id, notebookId })));
      const [from, to] = rows;
      if (!from || !to) throw new AppError('not_found', 'No such version of this notebook.');
      // Parsing and walking two large snapshots is work that grows with the results: a worker thread does it.
      const cells = await documents.compare(from.snapshotJson, to.snapshotJson);
      return { from: toSummary(from), to: toSummary(to), cells };
    },

    async restore(viewer: SignedInUser, notebookId: string, versionId: string) {
      await notebooks.editable(viewer, notebookId);
      const { row, snapshot } = await load(notebookId, versionId);
      assertCellsAccepted(snapshot.cells);
      await record(viewer, notebookId, `Before restoring version ${row.number}`, true);
      await dataSource.transaction(async (manager) => {
        await manager.delete(Cell, { notebookId });
        const results = await cachedResults(manager, snapshot.cells);
        for (const [position, cell] of snapshot.cells.entries()) {
          const cellId = newId();
          const result = results.get(cell.label);
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
      });
      notebooks.forget(notebookId);
      await record(viewer, notebookId, `Restored version ${row.number}: ${row.message}`.slice(0, 500), true);
      return notebooks.detail(viewer, notebookId);
    },

    async exportDocument(viewer: SignedInUser, notebookId: string): Promise<NotebookDocument> {
      await notebooks.access(viewer, notebookId);
      const snapshot = await currentSnapshot(notebookId);
      return toNotebookDocument(snapshot.title, snapshot.summary, snapshot.cells, new Date());
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

export type VersionService = ReturnType<typeof createVersionService>;
