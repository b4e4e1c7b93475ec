import { diffLines } from 'diff';
import type { DataSource, EntityManager } from 'typeorm';
import type { CellComparison, TextChange, ValueChange, ValueDifferences, VersionComparison, VersionDetail, VersionSummary } from '../../shared/notebook/api';
import type { VersionCellSnapshot } from '../../shared/notebook/api';
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
import { jobHash } from './runs';

interface Snapshot {
  title: string;
  summary: string;
  cells: VersionCellSnapshot[];
}

function toSummary(row: NotebookVersion): VersionSummary {
  return { id: row.id, number: row.number, message: row.message, authorName: row.authorName, createdAt: row.createdAt.toISOString(), automatic: row.automatic };
}

/** Limits that keep a comparison cheap whatever the size of the results being compared. */
export const COMPARISON_LIMITS = {
  /** A part (input or result) is diffed line by line only when both sides print to at most this many characters. */
  maxTextDiffChars: 20_000,
  /** Values visited by the structural walk of one part. */
  maxNodesPerPart: 50_000,
  /** Values visited over the whole comparison. */
  maxNodesPerComparison: 400_000,
  /** Changed values listed per part (the rest are counted). */
  maxListedChanges: 20,
  /** Characters of a listed before/after value. */
  maxValueChars: 120,
} as const;

/** Yield to the event loop, so requests waiting behind a long comparison are served in between. */
const nextTurn = () => new Promise<void>((resolve) => setImmediate(resolve));

const compactSize = (value: unknown) => (value === null || value === undefined ? 0 : JSON.stringify(value).length);
const pretty = (value: unknown) => (value === null || value === undefined ? '' : `${JSON.stringify(value, null, 2)}\n`);

function textChanges(before: unknown, after: unknown): TextChange[] {
  return diffLines(pretty(before), pretty(after)).map((part) => ({ value: part.value, ...(part.added ? { added: true } : {}), ...(part.removed ? { removed: true } : {}) }));
}

function shortText(value: unknown): string | null {
  if (value === undefined || value === null) return null;
  const text = typeof value === 'string' ? value : JSON.stringify(value);
  return text.length > COMPARISON_LIMITS.maxValueChars ? `${text.slice(0, COMPARISON_LIMITS.maxValueChars - 1)}…` : text;
}

const isContainer = (v: unknown): v is Record<string, unknown> | unknown[] => typeof v === 'object' && v !== null;

/** Values walked between two turns of the event loop. */
const NODES_PER_TURN = 4000;

/**
 * The values that differ between two JSON values, walking both side by side. The walk visits at most
 * `budget.nodes` values, so its cost is bounded whatever the size of the inputs, and it yields to the
 * event loop every few thousand values, so other requests are served meanwhile.
 */
export async function valueDifferences(before: unknown, after: unknown, budget: { nodes: number }): Promise<ValueDifferences> {
  const listed: ValueChange[] = [];
  let changed = 0;
  let nodes = Math.min(budget.nodes, COMPARISON_LIMITS.maxNodesPerPart);
  const startNodes = nodes;
  // the path is kept as segments and printed only for the few changes that are listed
  const segments: (string | number)[] = [];
  const pathText = () => segments.map((s, i) => (typeof s === 'number' ? `[${s}]` : i === 0 ? s : `.${s}`)).join('') || '(whole value)';
  const note = (b: unknown, a: unknown) => {
    changed++;
    if (listed.length < COMPARISON_LIMITS.maxListedChanges) listed.push({ path: pathText(), before: shortText(b), after: shortText(a) });
  };
  function* child(segment: string | number, b: unknown, a: unknown): Generator<void> {
    segments.push(segment);
    yield* walk(b, a);
    segments.pop();
  }
  function* walk(b: unknown, a: unknown): Generator<void> {
    if (nodes <= 0) return;
    nodes--;
    if (nodes % NODES_PER_TURN === 0) yield;
    if (Array.isArray(b) && Array.isArray(a)) {
      if (b.length !== a.length) {
        segments.push('length');
        note(b.length, a.length);
        segments.pop();
      }
      for (let i = 0; i < Math.max(b.length, a.length) && nodes > 0; i++) yield* child(i, b[i], a[i]);
      return;
    }
    if (isContainer(b) && isContainer(a) && !Array.isArray(b) && !Array.isArray(a)) {
      for (const key of Object.keys(b)) if (nodes > 0) yield* child(key, b[key], Object.hasOwn(a, key) ? a[key] : undefined);
      for (const key of Object.keys(a)) if (nodes > 0 && !Object.hasOwn(b, key)) yield* child(key, undefined, a[key]);
      return;
    }
    if (b === a || (b ?? null) === (a ?? null)) return;
    // a value that changed shape, appeared or vanished counts once, not leaf by leaf
    note(b, a);
  }
  const steps = walk(before, after);
  while (!steps.next().done) await nextTurn();
  budget.nodes -= startNodes - nodes;
  const sizeBefore = compactSize(before);
  await nextTurn();
  return { changed, listed, more: changed - listed.length, complete: nodes > 0, sizeBefore, sizeAfter: compactSize(after) };
}

/** Line diff of one part when both sides are small enough to print, otherwise only its value differences. */
async function comparePart(before: unknown, after: unknown, budget: { nodes: number }) {
  const values = await valueDifferences(before, after, budget);
  const same = values.complete ? values.changed === 0 : JSON.stringify(before ?? null) === JSON.stringify(after ?? null);
  if (same) return { text: [] as TextChange[], summarised: false, values, same };
  // pretty text is never shorter than compact JSON, so the compact size decides most cases without printing
  const small = values.sizeBefore <= COMPARISON_LIMITS.maxTextDiffChars && values.sizeAfter <= COMPARISON_LIMITS.maxTextDiffChars;
  const before_ = small ? pretty(before) : '';
  const after_ = small ? pretty(after) : '';
  if (!small || before_.length > COMPARISON_LIMITS.maxTextDiffChars || after_.length > COMPARISON_LIMITS.maxTextDiffChars) return { text: [] as TextChange[], summarised: true, values, same };
  return { text: textChanges(before, after), summarised: false, values, same };
}

/** One cell of a comparison: which parts changed, with line diffs below the size cap and value summaries always. */
export async function compareCell(label: string, before: VersionCellSnapshot | undefined, after: VersionCellSnapshot | undefined, budget: { nodes: number }): Promise<CellComparison> {
  const input = await comparePart(before?.input, after?.input, budget);
  const output = await comparePart(before?.output, after?.output, budget);
  const change = !before ? 'added' : !after ? 'removed' : input.same && output.same ? 'unchanged' : 'changed';
  return {
    label,
    change,
    input: input.text,
    output: output.text,
    inputSummarised: input.summarised,
    outputSummarised: output.summarised,
    inputValues: input.values,
    outputValues: output.values,
  };
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
    const run = await manager.getRepository(JobRun).findOne({ where: { inputHash: jobHash(job), status: 'done' }, order: { createdAt: 'DESC' } });
    if (run) found.set(cell.label, { run, fingerprint: fingerprintOf(cell, byLabel) });
  }
  return found;
}

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
    resultJson: hit.resultJson,
    durationMs: 0,
    startedAt: now,
    finishedAt: now,
  });
  return id;
}

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
      await nextTurn();
      const to = await load(notebookId, toId);
      await nextTurn();
      const labels = [...new Set([...from.snapshot.cells.map((c) => c.label), ...to.snapshot.cells.map((c) => c.label)])];
      const beforeByLabel = new Map(from.snapshot.cells.map((c) => [c.label, c]));
      const afterByLabel = new Map(to.snapshot.cells.map((c) => [c.label, c]));
      const budget = { nodes: COMPARISON_LIMITS.maxNodesPerComparison };
      const cells: CellComparison[] = [];
      for (const label of labels) {
        cells.push(await compareCell(label, beforeByLabel.get(label), afterByLabel.get(label), budget));
      }
      return { from: toSummary(from.row), to: toSummary(to.row), cells };
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
