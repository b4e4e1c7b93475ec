import { diffLines } from 'diff';
import type { DataSource } from 'typeorm';
import type { CellComparison, TextChange, VersionComparison, VersionDetail, VersionSummary } from '../../shared/notebook/api';
import type { VersionCellSnapshot } from '../../shared/notebook/api';
import { toNotebookDocument, type NotebookDocument } from '../../shared/notebook/exports';
import type { SignedInUser } from '../auth/sessions';
import { Cell, JobRun, Notebook, NotebookVersion } from '../db/entities';
import { AppError } from '../http/errors';
import { newId } from '../ids';
import type { NotebookService } from './notebooks';

interface Snapshot {
  title: string;
  summary: string;
  cells: VersionCellSnapshot[];
}

function toSummary(row: NotebookVersion): VersionSummary {
  return { id: row.id, number: row.number, message: row.message, authorName: row.authorName, createdAt: row.createdAt.toISOString(), automatic: row.automatic };
}

const pretty = (value: unknown) => (value === null || value === undefined ? '' : `${JSON.stringify(value, null, 2)}\n`);
const changes = (before: unknown, after: unknown): TextChange[] =>
  diffLines(pretty(before), pretty(after)).map((part) => ({ value: part.value, ...(part.added ? { added: true } : {}), ...(part.removed ? { removed: true } : {}) }));

/** Versions are immutable snapshots; restoring one writes the old cells back and records a new version. */
export function createVersionService(dataSource: DataSource, notebooks: NotebookService) {
  const versions = dataSource.getRepository(NotebookVersion);

  async function currentSnapshot(notebookId: string): Promise<Snapshot> {
    const notebook = await dataSource.getRepository(Notebook).findOneByOrFail({ id: notebookId });
    const rows = await notebooks.orderedCells(notebookId);
    const runIds = rows.map((r) => r.lastRunId).filter((id): id is string => Boolean(id));
    const runs = runIds.length ? await dataSource.getRepository(JobRun).createQueryBuilder('r').where('r.id IN (:...runIds)', { runIds }).getMany() : [];
    return {
      title: notebook.title,
      summary: notebook.summary,
      cells: rows.map((row) => {
        const input = notebooks.parseCellInput(row.inputJson);
        const run = runs.find((r) => r.id === row.lastRunId);
        return { label: row.label, kind: input.kind, input, output: run?.resultJson ? JSON.parse(run.resultJson) : null };
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
      const from = await load(notebookId, fromId);
      const to = await load(notebookId, toId);
      const labels = [...new Set([...from.snapshot.cells.map((c) => c.label), ...to.snapshot.cells.map((c) => c.label)])];
      const cells: CellComparison[] = labels.map((label) => {
        const before = from.snapshot.cells.find((c) => c.label === label);
        const after = to.snapshot.cells.find((c) => c.label === label);
        const input = changes(before?.input, after?.input);
        const output = changes(before?.output, after?.output);
        const change = !before ? 'added' : !after ? 'removed' : [...input, ...output].some((p) => p.added || p.removed) ? 'changed' : 'unchanged';
        return { label, change, input, output };
      });
      return { from: toSummary(from.row), to: toSummary(to.row), cells };
    },

    async restore(viewer: SignedInUser, notebookId: string, versionId: string) {
      await notebooks.editable(viewer, notebookId);
      const { row, snapshot } = await load(notebookId, versionId);
      await record(viewer, notebookId, `Before restoring version ${row.number}`, true);
      await dataSource.transaction(async (manager) => {
        await manager.delete(Cell, { notebookId });
        for (const [position, cell] of snapshot.cells.entries()) {
          await manager.insert(Cell, { id: newId(), notebookId, position, kind: cell.kind, label: cell.label, inputJson: JSON.stringify(cell.input), revision: 1 });
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
