import type { DataSource, EntityManager } from 'typeorm';
import { cellInput, type CellInput } from '../../shared/notebook/cells';
import { cellStates, dependentsOf, fingerprintOf, type CellForStaleness } from '../../shared/notebook/dependencies';
import { CellJobError, jobForCell, type CellJobContext, type SetupInput } from '../../shared/notebook/jobs';
import type { CellView, NotebookDetail, NotebookSummary, RunAllReply, RunView } from '../../shared/notebook/api';
import type { SignedInUser } from '../auth/sessions';
import { can, ROLE_NEEDED, strongerRole, type NotebookAction, type NotebookRole } from '../../shared/notebook/sharing';
import { Cell, GroupMembership, JobRun, Notebook, NotebookMember, ResearchGroup, User } from '../db/entities';
import { AppError } from '../http/errors';
import { newId } from '../ids';
import { estimatedResultBytes, jobCostProblem, megabytes } from '../../shared/jobs/cost';
import { RESULT_LIMITS } from '../../shared/jobs/contract';
import { WeightedLru } from './boundedCache';
import { assertCellAccepted } from './cellChecks';
import { resultHolderId, resultsOf, type RunService } from './runs';
import type { NotebookEventBus } from './notebookEvents';
import { createNotebookWriter, type WrittenChange } from './notebookWriter';
import { currentDatasetHashes, currentDatasetViews, datasetReader, type DatasetReader } from './datasets';
import type { DocumentRenderer } from '../jobs/documents';
import { commaList, dialectOf, momentFrom, runSql, type Dialect } from '../db/sql';

export const MAX_CELLS_PER_NOTEBOOK = 200;
/** Characters of JSON the settled cell views of all notebooks may hold in memory together (results counted once per notebook). */
export const SETTLED_VIEWS_BUDGET = 64_000_000;
const SETTLED_SUMMARIES_BUDGET = 8_000_000;
/** Weight of a cell's own text in a cached view, besides its result. */
const CELL_VIEW_WEIGHT = 2_000;

/** A cell about to run, with its input already parsed. */
interface CellToRun {
  id: string;
  label: string;
  input: CellInput;
}

/** What running cells needs to know of their notebook, read once per request. */
interface NotebookAtRun {
  notebookId: string;
  setups: Map<string, SetupInput>;
  byLabel: Map<string, { label: string; input: CellInput }>;
  /** Characters of result JSON each cell's latest run holds, or will hold once it finishes (estimated). */
  resultBytes: Map<string, number>;
  /** Content hash of each current dataset by label. */
  datasetHashes: Map<string, string>;
  /** Reads the datasets comparison cells name, each parsed once for this operation. */
  readDataset: DatasetReader;
}

export interface NotebookAccess {
  notebook: Notebook;
  role: NotebookRole;
  canEdit: boolean;
}

/**
 * The grants reaching one person on notebook `n` (parameters: the person's id twice): their own grant,
 * and the grants of their groups as a comma-separated list. The one place this rule is written in SQL.
 */
const grantsColumns = (dialect: Dialect) => `(SELECT "m"."role" FROM "notebook_members" "m" WHERE "m"."notebookId" = "n"."id" AND "m"."userId" = ?) AS "personalRole",
  (SELECT ${commaList(dialect, '"m"."role"')} FROM "notebook_members" "m" JOIN "group_memberships" "g" ON "g"."groupId" = "m"."groupId"
    WHERE "m"."notebookId" = "n"."id" AND "g"."userId" = ?) AS "groupRoles"`;

/** Grant rows `m` (notebook_members) that reach the person named by the :me parameter: their own, or their groups'. */
export const GRANT_REACHES_ME = `("m"."userId" = :me OR "m"."groupId" IN (SELECT "gm"."groupId" FROM "group_memberships" "gm" WHERE "gm"."userId" = :me))`;
/** Ids of the notebooks shared with :me (not counting ownership). */
export const NOTEBOOKS_SHARED_WITH_ME = `(SELECT "m"."notebookId" FROM "notebook_members" "m" WHERE ${GRANT_REACHES_ME})`;

/** A person's current role on a notebook (null = none), inside any transaction: the rule of access(). */
export async function roleOn(manager: EntityManager, userId: string, notebookId: string): Promise<NotebookRole | null> {
  const [row]: { ownerId: string; personalRole: string | null; groupRoles: string | null }[] = await runSql(
    manager,
    `SELECT "n"."ownerId" AS "ownerId", ${grantsColumns(dialectOf(manager))} FROM "notebooks" "n" WHERE "n"."id" = ?`,
    [userId, userId, notebookId],
  );
  if (!row) return null;
  return row.ownerId === userId ? 'owner' : roleFromGrants(row.personalRole, row.groupRoles);
}

/** The strongest of a personal grant and a comma-separated list of group grants (as commaList returns them). */
export function roleFromGrants(personal: string | null | undefined, groupRoles: string | null | undefined): NotebookRole | null {
  let role = (personal as NotebookRole | null | undefined) ?? null;
  for (const groupRole of groupRoles ? groupRoles.split(',') : []) role = strongerRole(role, groupRole as NotebookRole);
  return role;
}

const ACTION_WORDS: Record<NotebookAction, string> = {
  read: 'open this notebook',
  export: 'export this notebook',
  comment: 'comment on this notebook',
  edit: 'change this notebook',
  run: 'run cells of this notebook',
  saveVersion: 'save versions of this notebook',
  restoreVersion: 'restore versions of this notebook',
  present: 'present this notebook',
  manageSharing: 'change who this notebook is shared with',
  delete: 'delete this notebook',
  transferOwnership: 'hand this notebook to someone else',
};

export function refusal(action: NotebookAction, role: NotebookRole): string {
  return `As ${role === 'editor' ? 'an' : 'a'} ${role} you cannot ${ACTION_WORDS[action]}; it needs the ${ROLE_NEEDED[action]} role.`;
}

type RowReader = (...params: unknown[]) => Promise<Record<string, string | Date | null> | undefined>;

/**
 * One hot query written by hand: on SQLite a statement prepared once on the better-sqlite3 database under
 * the data source; on PostgreSQL a plain parameterised query through the pool.
 */
function preparedRow(dataSource: DataSource, sql: string): RowReader {
  if (dialectOf(dataSource) === 'postgres') return async (...params) => (await runSql<Record<string, string | Date | null>[]>(dataSource, sql, params))[0];
  const sqlite = (dataSource.driver as unknown as { databaseConnection: { prepare(sql: string): { get(...params: unknown[]): unknown } } }).databaseConnection;
  const statement = sqlite.prepare(sql);
  return async (...params) => statement.get(...params) as Record<string, string | null> | undefined;
}

export function parseCellInput(json: string): CellInput {
  return cellInput.parse(JSON.parse(json));
}

/** The parts of a notebook summary that are the same for everyone who may see the notebook. */
type CommonSummary = Omit<NotebookSummary, 'role' | 'sharedBy' | 'canEdit'>;

/** Notebooks and their cells: who may see and edit them, and what state every cell is in. */
export function createNotebookService(dataSource: DataSource, runs: RunService, events: NotebookEventBus, documents: DocumentRenderer) {
  const notebooks = dataSource.getRepository(Notebook);
  const cells = dataSource.getRepository(Cell);
  // Cell views of notebooks with no run in flight; every write path below calls forget().
  const settledViews = new WeightedLru<string, CellView[]>(SETTLED_VIEWS_BUDGET);
  const settledSummaries = new WeightedLru<string, CommonSummary>(SETTLED_SUMMARIES_BUDGET);
  // Counts forget() calls: views read from the database while a write committed must not be cached after it.
  let forgets = 0;
  const forget = (notebookId: string) => {
    forgets += 1;
    settledViews.delete(notebookId);
    settledSummaries.delete(notebookId);
  };

  async function groupIdsOf(userId: string): Promise<string[]> {
    const rows = await dataSource.getRepository(GroupMembership).findBy({ userId });
    return rows.map((row) => row.groupId);
  }

  /**
   * A person's role on a notebook: owner, or the stronger of their own grant and the grants of their
   * groups. Site admins have no special access to notebooks: they manage accounts and read captured mail,
   * not other people's research. No role at all is answered exactly like a missing notebook (404).
   */
  // Every notebook request starts here, so it is one prepared statement rather than several ORM queries.
  const accessRow = preparedRow(
    dataSource,
    `SELECT "n"."id", "n"."title", "n"."summary", "n"."ownerId", "n"."groupId", "n"."createdAt", "n"."updatedAt", ${grantsColumns(dialectOf(dataSource))} FROM "notebooks" "n" WHERE "n"."id" = ?`,
  );

  async function access(viewer: SignedInUser, notebookId: string): Promise<NotebookAccess> {
    const row = await accessRow(viewer.id, viewer.id, notebookId);
    if (!row) throw new AppError('not_found', 'No such notebook.');
    const text = (column: string) => row[column] as string | null;
    const notebook = notebooks.create({
      id: text('id')!,
      title: text('title')!,
      summary: text('summary') ?? '',
      ownerId: text('ownerId')!,
      groupId: text('groupId'),
      createdAt: momentFrom(row.createdAt!),
      updatedAt: momentFrom(row.updatedAt!),
    });
    const role = notebook.ownerId === viewer.id ? 'owner' : roleFromGrants(text('personalRole'), text('groupRoles'));
    if (!role) throw new AppError('not_found', 'No such notebook.');
    return { notebook, role, canEdit: can(role, 'edit') };
  }

  /** The notebook, when the viewer's role allows the action: 404 without any role, 403 with too weak a role. */
  async function requireRole(viewer: SignedInUser, notebookId: string, action: NotebookAction): Promise<NotebookAccess> {
    const granted = await access(viewer, notebookId);
    if (!can(granted.role, action)) throw new AppError('forbidden', refusal(action, granted.role));
    return granted;
  }

  async function editable(viewer: SignedInUser, notebookId: string): Promise<Notebook> {
    return (await requireRole(viewer, notebookId, 'edit')).notebook;
  }

  async function assertGroupMember(viewer: SignedInUser, groupId: string | null | undefined) {
    if (!groupId) return;
    if (!(await groupIdsOf(viewer.id)).includes(groupId)) {
      throw new AppError('forbidden', 'You can share a notebook only with a group you belong to.', { groupId: 'Not one of your groups' });
    }
  }

  async function orderedCells(notebookId: string, manager: EntityManager = dataSource.manager) {
    return manager.getRepository(Cell).find({ where: { notebookId }, order: { position: 'ASC' } });
  }

  async function cellViews(notebookId: string): Promise<CellView[]> {
    const cached = settledViews.get(notebookId);
    if (cached) return cached;
    const forgetsBefore = forgets;
    const { views, weight, inFlight } = await freshCellViews(notebookId);
    // decided from the runs, not the cells' states: a run in flight can show as a broken reference;
    // and not when a write was forgotten meanwhile: these views may predate it, and nothing would drop them
    if (!inFlight && forgets === forgetsBefore) settledViews.set(notebookId, views, weight);
    return views;
  }

  async function freshCellViews(notebookId: string): Promise<{ views: CellView[]; weight: number; inFlight: boolean }> {
    const rows = await orderedCells(notebookId);
    const runIds = rows.map((row) => row.lastRunId).filter((id): id is string => Boolean(id));
    const runRows = runIds.length ? await dataSource.getRepository(JobRun).createQueryBuilder('r').where('r.id IN (:...runIds)', { runIds }).getMany() : [];
    const runsById = new Map(runRows.map((run) => [run.id, run]));
    const results = await resultsOf(dataSource, runRows);
    const weight = rows.length * CELL_VIEW_WEIGHT + [...results.values()].reduce((sum, result) => sum + result.bytes, 0);
    const parsed = rows.map((row) => ({ row, input: parseCellInput(row.inputJson), run: row.lastRunId ? runsById.get(row.lastRunId) : undefined }));
    const staleness: CellForStaleness[] = parsed.map(({ row, input, run }) => ({
      id: row.id,
      label: row.label,
      input,
      lastRunFingerprint: row.lastRunFingerprint,
      lastRunStatus: run?.status ?? null,
    }));
    const states = cellStates(staleness, await currentDatasetHashes(dataSource.manager, notebookId));
    const labelled = parsed.map(({ row, input }) => ({ label: row.label, input }));
    const views = parsed.map(({ row, input, run }) => ({
      id: row.id,
      position: row.position,
      label: row.label,
      kind: input.kind,
      input,
      revision: row.revision,
      state: states.get(row.id)!,
      dependents: dependentsOf(row.label, labelled),
      lastRun: run ? runs.view(run, results.get(resultHolderId(run)) ?? null) : null,
      updatedAt: row.updatedAt.toISOString(),
    }));
    const inFlight = runRows.some((run) => run.status === 'queued' || run.status === 'running');
    return { views, weight, inFlight };
  }

  /** For each notebook, the strongest grant reaching the viewer (personal or through a group) and who made it. */
  async function grantsReaching(viewer: SignedInUser, notebookIds: string[]): Promise<Map<string, { role: NotebookRole; personName: string | null; groupName: string | null }>> {
    const found = new Map<string, { role: NotebookRole; personName: string | null; groupName: string | null }>();
    if (!notebookIds.length) return found;
    const rows: { notebookId: string; role: NotebookRole; groupName: string | null; grantedByName: string | null }[] = await dataSource
      .getRepository(NotebookMember)
      .createQueryBuilder('m')
      .leftJoin(ResearchGroup, 'g', 'g.id = m.groupId')
      .leftJoin(User, 'u', 'u.id = m.grantedById')
      .select(['m.notebookId AS "notebookId"', 'm.role AS "role"', 'g.name AS "groupName"', 'u.name AS "grantedByName"'])
      .where('m.notebookId IN (:...notebookIds)', { notebookIds })
      .andWhere(GRANT_REACHES_ME, { me: viewer.id })
      .getRawMany();
    for (const row of rows) {
      const known = found.get(row.notebookId);
      if (!known || strongerRole(known.role, row.role) !== known.role) found.set(row.notebookId, { role: row.role, personName: row.grantedByName, groupName: row.groupName });
    }
    return found;
  }

  async function commonSummaries(rows: Notebook[]): Promise<CommonSummary[]> {
    if (!rows.length) return [];
    const owners = await dataSource.getRepository(User).createQueryBuilder('u').where('u.id IN (:...ids)', { ids: [...new Set(rows.map((r) => r.ownerId))] }).getMany();
    const groupIds = [...new Set(rows.map((r) => r.groupId).filter((id): id is string => Boolean(id)))];
    const groups = groupIds.length ? await dataSource.getRepository(ResearchGroup).createQueryBuilder('g').where('g.id IN (:...groupIds)', { groupIds }).getMany() : [];
    const counts: { notebookId: string; count: number }[] = await cells
      .createQueryBuilder('c')
      .select('c.notebookId', 'notebookId')
      .addSelect('COUNT(*)', 'count')
      .where('c.notebookId IN (:...ids)', { ids: rows.map((r) => r.id) })
      .groupBy('c.notebookId')
      .getRawMany();
    return rows.map((row) => ({
      id: row.id,
      title: row.title,
      summary: row.summary,
      ownerId: row.ownerId,
      ownerName: owners.find((o) => o.id === row.ownerId)?.name ?? '',
      groupId: row.groupId,
      groupName: groups.find((g) => g.id === row.groupId)?.name ?? null,
      cellCount: Number(counts.find((c) => c.notebookId === row.id)?.count ?? 0),
      updatedAt: row.updatedAt.toISOString(),
    }));
  }

  /** Summaries as the viewer sees them: their role and how each notebook reached them. */
  async function summaries(rows: Notebook[], viewer: SignedInUser): Promise<NotebookSummary[]> {
    const common = await commonSummaries(rows);
    const grants = await grantsReaching(viewer, rows.filter((row) => row.ownerId !== viewer.id).map((row) => row.id));
    return common.map((summary) => personalised(summary, viewer, grants.get(summary.id)));
  }

  function personalised(summary: CommonSummary, viewer: SignedInUser, grant: { role: NotebookRole; personName: string | null; groupName: string | null } | undefined): NotebookSummary {
    const role: NotebookRole = summary.ownerId === viewer.id ? 'owner' : (grant?.role ?? 'viewer');
    const sharedBy = role === 'owner' ? null : { personName: grant?.personName ?? summary.ownerName, groupName: grant?.groupName ?? null };
    return { ...summary, role, sharedBy, canEdit: can(role, 'edit') };
  }

  async function detail(viewer: SignedInUser, notebookId: string): Promise<NotebookDetail> {
    const { notebook, role } = await access(viewer, notebookId);
    let summary = settledSummaries.get(notebookId);
    if (!summary || summary.updatedAt !== notebook.updatedAt.toISOString()) {
      [summary] = await commonSummaries([notebook]);
      settledSummaries.set(notebookId, summary, 500 + summary.title.length + summary.summary.length);
    }
    const grant = role === 'owner' ? undefined : (await grantsReaching(viewer, [notebookId])).get(notebookId);
    return { ...personalised(summary, viewer, grant && { ...grant, role }), cells: await cellViews(notebookId), datasets: await currentDatasetViews(dataSource.manager, notebookId) };
  }

  /**
   * The checks of saving one cell, with its job's cost measured against the notebook's setups as they
   * would be after the save; a changed setup is also checked against every cell that uses it.
   */
  async function assertSavable(notebookId: string, cellId: string | null, newLabel: string | undefined, input: CellInput) {
    const rows = await orderedCells(notebookId);
    const label = newLabel ?? rows.find((row) => row.id === cellId)?.label ?? '';
    const others = rows.filter((row) => row.id !== cellId).map((row) => ({ label: row.label, input: parseCellInput(row.inputJson) }));
    const setups = new Map<string, SetupInput>();
    for (const other of others) if (other.input.kind === 'setup') setups.set(other.label, other.input);
    if (input.kind === 'setup') setups.set(label, input);
    assertCellAccepted(input, setups);
    if (input.kind !== 'setup') return;
    for (const dependent of others.filter((other) => 'uses' in other.input && other.input.uses === label)) {
      try {
        assertCellAccepted(dependent.input, setups);
      } catch (error) {
        if (error instanceof AppError && error.code === 'job_too_large') {
          throw new AppError('job_too_large', `With these parameters cell "${dependent.label}" would be too large to run: ${error.message}`);
        }
        throw error;
      }
    }
  }

  /** Characters of result JSON each cell's latest run holds; queued and running ones by their estimate. */
  async function resultBytesByCell(notebookId: string): Promise<Map<string, number>> {
    const rows: { cellId: string; status: string; pendingJob: string | null; bytes: number | null }[] = await runSql(
      dataSource,
      `SELECT c."id" AS "cellId", r."status" AS "status",
              CASE WHEN r."status" IN ('queued', 'running') THEN r."jobJson" END AS "pendingJob",
              length(h."resultJson") AS "bytes"
         FROM "cells" c
         JOIN "job_runs" r ON r."id" = c."lastRunId"
         LEFT JOIN "job_runs" h ON h."id" = COALESCE(r."resultRunId", r."id")
        WHERE c."notebookId" = ?`,
      [notebookId],
    );
    return new Map(rows.map((row) => [row.cellId, row.pendingJob ? estimatedResultBytes(JSON.parse(row.pendingJob)) : Number(row.bytes ?? 0)]));
  }

  async function notebookAtRun(viewer: SignedInUser, notebookId: string, cellsWithInputs: CellToRun[]): Promise<NotebookAtRun> {
    const setups = new Map<string, SetupInput>();
    for (const cell of cellsWithInputs) if (cell.input.kind === 'setup') setups.set(cell.label, cell.input);
    const byLabel = new Map(cellsWithInputs.map((cell) => [cell.label, { label: cell.label, input: cell.input }]));
    return {
      notebookId,
      setups,
      byLabel,
      resultBytes: await resultBytesByCell(notebookId),
      datasetHashes: await currentDatasetHashes(dataSource.manager, notebookId),
      readDataset: datasetReader(dataSource.manager, documents, notebookId, viewer.id),
    };
  }

  /**
   * Every cell's result travels in the notebook's reply, so a new result must keep the notebook's total
   * within its budget (each cell counted, even where several show one cached result).
   */
  async function assertResultsFit(cell: CellToRun, job: Record<string, unknown>, notebook: NotebookAtRun): Promise<number> {
    // a job over the cost limit is refused by the run service, with the inputs to reduce
    if (jobCostProblem(job)) return 0;
    const expected = await runs.expectedResultBytes(job);
    // a stored result kept from before the per-result limit would otherwise be served as a cache hit
    if (expected > RESULT_LIMITS.maxResultBytes) {
      throw new AppError(
        'job_too_large',
        `Cell "${cell.label}": its result takes ${megabytes(expected)}, over the limit of ${megabytes(RESULT_LIMITS.maxResultBytes)} per result; reduce the points, quantities or digits`,
      );
    }
    let total = expected;
    for (const [cellId, bytes] of notebook.resultBytes) if (cellId !== cell.id) total += bytes;
    if (total > RESULT_LIMITS.maxNotebookResultBytes) {
      throw new AppError(
        'job_too_large',
        `Cell "${cell.label}": with its result this notebook's results would total ${megabytes(total)} (limit ${megabytes(RESULT_LIMITS.maxNotebookResultBytes)}); shrink or delete scan cells`,
      );
    }
    return expected;
  }

  /** A cell's job queued (or answered from the cache), with what the cell will record of it. */
  interface StartedRun {
    cellId: string;
    label: string;
    run: JobRun;
    fingerprint: string;
  }

  /** Queue the cell's job within the notebook's result budget; null when the cell has nothing to run. */
  /** What a comparison cell's job needs besides setups: the cells by label and the one dataset it names (with its hash as loaded). */
  async function jobContext(cell: CellToRun, notebook: NotebookAtRun): Promise<{ context: CellJobContext; datasetHashes: Map<string, string> }> {
    if (cell.input.kind !== 'comparison') return { context: {}, datasetHashes: notebook.datasetHashes };
    const cells = new Map([...notebook.byLabel.values()].map((other) => [other.label, other.input]));
    const dataset = await notebook.readDataset(cell.input);
    if (!dataset) return { context: { cells, datasets: new Map() }, datasetHashes: notebook.datasetHashes };
    return { context: { cells, datasets: new Map([[dataset.label, dataset]]) }, datasetHashes: new Map(notebook.datasetHashes).set(dataset.label, dataset.contentHash) };
  }

  async function startCellRun(viewer: SignedInUser, cell: CellToRun, notebook: NotebookAtRun): Promise<StartedRun | null> {
    let job: Record<string, unknown> | null;
    let datasetHashes = notebook.datasetHashes;
    try {
      const context = await jobContext(cell, notebook);
      datasetHashes = context.datasetHashes;
      job = jobForCell(cell.input, notebook.setups, context.context);
    } catch (error) {
      if (error instanceof CellJobError) throw new AppError('validation_failed', `Cell "${cell.label}": ${error.message}`, { [error.field]: error.message });
      throw error;
    }
    if (!job) return null;
    const expectedBytes = await assertResultsFit(cell, job, notebook);
    const run = await submitCellJob(viewer, cell, job);
    notebook.resultBytes.set(cell.id, expectedBytes);
    return { cellId: cell.id, label: cell.label, run, fingerprint: fingerprintOf({ label: cell.label, input: cell.input }, notebook.byLabel, datasetHashes) };
  }

  async function recordRuns(manager: EntityManager, started: StartedRun[]) {
    for (const { cellId, run, fingerprint } of started) await manager.update(Cell, { id: cellId }, { lastRunId: run.id, lastRunFingerprint: fingerprint });
  }

  function runChange(started: StartedRun[]): WrittenChange | null {
    if (!started.length) return null;
    if (started.length === 1) return { kind: 'cell-run', cellId: started[0].cellId, text: `ran cell "${started[0].label}"` };
    return { kind: 'cell-run', cellId: null, text: `ran ${started.length} cells: ${started.map((s) => s.label).join(', ')}` };
  }

  async function submitCellJob(viewer: SignedInUser, row: CellToRun, job: Record<string, unknown>) {
    try {
      return await runs.submit({ job, userId: viewer.id, cellId: row.id });
    } catch (error) {
      if (error instanceof AppError && error.code === 'job_too_large') throw new AppError('job_too_large', `Cell "${row.label}": ${error.message}`, error.fields);
      throw error;
    }
  }

  async function cellNotebookId(cellId: string): Promise<string | null> {
    return (await cells.findOneBy({ id: cellId }))?.notebookId ?? null;
  }

  async function runOf(viewer: SignedInUser, runId: string): Promise<JobRun> {
    const run = await runs.find(runId);
    if (run.requestedBy === viewer.id) return run;
    // Runs of a shared notebook's cells are visible to everyone who can open the notebook (site admins included: no more).
    const notebookId = run.cellId ? await cellNotebookId(run.cellId) : null;
    if (!notebookId) throw new AppError('not_found', 'No such run.');
    try {
      await requireRole(viewer, notebookId, 'read');
    } catch (error) {
      // a run of a notebook the viewer cannot open is a run that does not exist, not a hint of the notebook
      if (error instanceof AppError && error.code === 'not_found') throw new AppError('not_found', 'No such run.');
      throw error;
    }
    return run;
  }

  const writer = createNotebookWriter(dataSource, { requireRole, forget, events });

  // Whoever looks at the notebook refreshes when a run of one of its cells ends.
  runs.onFinished(async ({ cellId }) => {
    const notebookId = cellId ? await cellNotebookId(cellId) : null;
    if (!notebookId) return;
    forget(notebookId);
    events.publish({ notebookId, kind: 'cell-run', actorId: null, actorName: null, cellId, text: 'a run finished' });
  });

  return {
    access,
    writer,
    requireRole,
    editable,
    forget,
    cellNotebookId,
    detail,
    orderedCells,

    /** Everyone who can open the notebook, with their effective role (owner first, then by name). */
    async peopleWithAccess(notebookId: string): Promise<{ id: string; name: string; email: string; role: NotebookRole }[]> {
      const rows: { id: string; name: string; email: string; role: NotebookRole }[] = await runSql(
        dataSource,
        `SELECT u."id" AS "id", u."name" AS "name", u."email" AS "email", 'owner' AS "role" FROM "notebooks" n JOIN "users" u ON u."id" = n."ownerId" WHERE n."id" = ?
         UNION ALL
         SELECT u."id", u."name", u."email", m."role" FROM "notebook_members" m JOIN "users" u ON u."id" = m."userId" WHERE m."notebookId" = ?
         UNION ALL
         SELECT u."id", u."name", u."email", m."role" FROM "notebook_members" m JOIN "group_memberships" g ON g."groupId" = m."groupId" JOIN "users" u ON u."id" = g."userId" WHERE m."notebookId" = ?`,
        [notebookId, notebookId, notebookId],
      );
      const strongest = new Map<string, { id: string; name: string; email: string; role: NotebookRole }>();
      for (const row of rows) {
        const known = strongest.get(row.id);
        if (!known || strongerRole(known.role, row.role) !== known.role) strongest.set(row.id, row);
      }
      return [...strongest.values()].sort((a, b) => (a.role === 'owner' ? -1 : b.role === 'owner' ? 1 : a.name.localeCompare(b.name)));
    },
    parseCellInput,

    async list(viewer: SignedInUser, options: { q?: string; filter?: 'all' | 'mine' | 'shared' | 'group'; groupId?: string } = {}): Promise<NotebookSummary[]> {
      const reaching = `n.id IN ${NOTEBOOKS_SHARED_WITH_ME}`;
      const throughGroup = `n.id IN (SELECT "m"."notebookId" FROM "notebook_members" "m" WHERE "m"."groupId" IN (SELECT "gm"."groupId" FROM "group_memberships" "gm" WHERE "gm"."userId" = :me)${options.groupId ? ' AND "m"."groupId" = :groupId' : ''})`;
      const where = {
        all: `(n.ownerId = :me OR ${reaching})`,
        mine: 'n.ownerId = :me',
        shared: `(n.ownerId <> :me AND ${reaching})`,
        group: throughGroup,
      }[options.filter ?? 'all'];
      const query = notebooks.createQueryBuilder('n').orderBy('n.updatedAt', 'DESC').addOrderBy('n.title', 'ASC').take(500);
      query.where(where, { me: viewer.id, groupId: options.groupId });
      // lower() on both sides: SQLite's LIKE ignores ASCII case, PostgreSQL's does not
      if (options.q) query.andWhere('(lower(n.title) LIKE lower(:q) ESCAPE \'\\\' OR lower(n.summary) LIKE lower(:q) ESCAPE \'\\\')', { q: `%${options.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` });
      return summaries(await query.getMany(), viewer);
    },

    async create(viewer: SignedInUser, input: { title: string; summary: string; groupId: string | null }) {
      await assertGroupMember(viewer, input.groupId);
      return detail(viewer, await writer.create(viewer, input));
    },

    /** Rename or describe (editors); filing under another group (owner only) moves the group's editor grant along. */
    async update(viewer: SignedInUser, notebookId: string, patch: { title?: string; summary?: string; groupId?: string | null }) {
      let moved = false;
      await writer.write(viewer, notebookId, {
        action: 'edit',
        prepare: async ({ notebook }) => {
          const moving = patch.groupId !== undefined && patch.groupId !== notebook.groupId;
          if (moving) {
            // Moving a notebook into or out of a group changes who can reach it: the owner's decision alone.
            if (notebook.ownerId !== viewer.id) {
              throw new AppError('forbidden', 'Only the notebook\'s owner can move it into or out of a group.', { groupId: 'Only the owner can change this' });
            }
            await assertGroupMember(viewer, patch.groupId);
          }
          return { moving, formerGroupId: notebook.groupId };
        },
        apply: async ({ manager }, { moving, formerGroupId }) => {
          await manager.update(Notebook, { id: notebookId }, { ...patch, updatedAt: new Date() });
          if (moving) {
            if (formerGroupId) await manager.delete(NotebookMember, { notebookId, groupId: formerGroupId });
            if (patch.groupId) {
              await manager.delete(NotebookMember, { notebookId, groupId: patch.groupId });
              await manager.insert(NotebookMember, { id: newId(), notebookId, groupId: patch.groupId, role: 'editor', grantedById: viewer.id });
            }
          }
          moved = moving;
          return { value: undefined, change: { kind: 'notebook-edited', text: notebookEditText(patch, moving) } };
        },
      });
      if (moved) events.accessChanged({ notebookId });
      return detail(viewer, notebookId);
    },

    async remove(viewer: SignedInUser, notebookId: string) {
      await requireRole(viewer, notebookId, 'delete');
      await notebooks.delete({ id: notebookId });
      forget(notebookId);
      events.accessChanged({ notebookId });
    },

    async addCell(viewer: SignedInUser, notebookId: string, input: { label: string; input: CellInput; position?: number }) {
      await writer.write(viewer, notebookId, {
        action: 'edit',
        prepare: () => assertSavable(notebookId, null, input.label, input.input),
        apply: async ({ manager }) => {
          const existing = await orderedCells(notebookId, manager);
          if (existing.length >= MAX_CELLS_PER_NOTEBOOK) throw new AppError('conflict', `A notebook holds at most ${MAX_CELLS_PER_NOTEBOOK} cells.`);
          if (existing.some((c) => c.label === input.label)) {
            throw new AppError('conflict', `A cell labelled "${input.label}" already exists in this notebook.`, { label: 'Label already used' });
          }
          const position = Math.min(input.position ?? existing.length, existing.length);
          for (const cell of existing.filter((c) => c.position >= position)) await manager.update(Cell, { id: cell.id }, { position: cell.position + 1 });
          const cellId = newId();
          await manager.insert(Cell, { id: cellId, notebookId, position, kind: input.input.kind, label: input.label, inputJson: JSON.stringify(input.input), revision: 1 });
          return { value: undefined, change: { kind: 'cell-added', cellId, text: `added cell "${input.label}"` } };
        },
      });
      return detail(viewer, notebookId);
    },

    /** Edit a cell at the revision the editor saw (409 when stale); changing a model & parameters cell keeps the state before it as a version. */
    async updateCell(viewer: SignedInUser, notebookId: string, cellId: string, patch: { label?: string; input?: CellInput; revision: number }) {
      await writer.write(viewer, notebookId, {
        action: 'edit',
        prepare: async () => {
          if (patch.input) await assertSavable(notebookId, cellId, patch.label, patch.input);
        },
        versionBefore: async (manager) => {
          // Changing a model & parameters cell re-bases every dependent: keep the state before it.
          if (patch.input?.kind !== 'setup') return null;
          const before = await manager.findOneBy(Cell, { id: cellId, notebookId });
          if (!before || before.revision !== patch.revision) return null;
          if (JSON.stringify(parseCellInput(before.inputJson)) === JSON.stringify(patch.input)) return null;
          return `Before changing "${before.label}"`;
        },
        apply: async ({ manager }) => {
          const cell = await manager.findOneBy(Cell, { id: cellId, notebookId });
          if (!cell) throw new AppError('not_found', 'No such cell.');
          if (cell.revision !== patch.revision) {
            throw new AppError('conflict', `This cell was changed elsewhere (now at revision ${cell.revision}, you edited revision ${patch.revision}). Reload it, or keep your version.`);
          }
          if (patch.label && patch.label !== cell.label) {
            const all = await orderedCells(notebookId, manager);
            if (all.some((c) => c.label === patch.label)) throw new AppError('conflict', `A cell labelled "${patch.label}" already exists.`, { label: 'Label already used' });
          }
          // Compare-and-set on the revision, so two simultaneous saves cannot both win.
          const result = await manager.update(
            Cell,
            { id: cellId, revision: patch.revision },
            {
              revision: patch.revision + 1,
              ...(patch.label ? { label: patch.label } : {}),
              ...(patch.input ? { inputJson: JSON.stringify(patch.input), kind: patch.input.kind } : {}),
            },
          );
          if (!result.affected) throw new AppError('conflict', 'This cell was changed elsewhere just now. Reload it, or keep your version.');
          const label = patch.label ?? cell.label;
          return { value: undefined, change: { kind: 'cell-edited', cellId, text: label === cell.label ? `edited cell "${label}"` : `renamed cell "${cell.label}" to "${label}"` } };
        },
      });
      return detail(viewer, notebookId);
    },

    async moveCell(viewer: SignedInUser, notebookId: string, cellId: string, position: number) {
      await writer.write(viewer, notebookId, {
        action: 'edit',
        apply: async ({ manager }) => {
          const all = await orderedCells(notebookId, manager);
          const index = all.findIndex((c) => c.id === cellId);
          if (index < 0) throw new AppError('not_found', 'No such cell.');
          const [moved] = all.splice(index, 1);
          all.splice(Math.min(position, all.length), 0, moved);
          for (const [i, cell] of all.entries()) if (cell.position !== i) await manager.update(Cell, { id: cell.id }, { position: i });
          return { value: undefined, change: { kind: 'cell-moved', cellId, text: `moved cell "${moved.label}" to place ${all.indexOf(moved) + 1}` } };
        },
      });
      return detail(viewer, notebookId);
    },

    /** Delete a cell; the notebook as it was is kept as an automatic version first. */
    async deleteCell(viewer: SignedInUser, notebookId: string, cellId: string) {
      await writer.write(viewer, notebookId, {
        action: 'edit',
        versionBefore: async (manager) => {
          const cell = await manager.findOneBy(Cell, { id: cellId, notebookId });
          return cell ? `Before deleting cell "${cell.label}"` : null;
        },
        apply: async ({ manager }) => {
          const all = await orderedCells(notebookId, manager);
          const cell = all.find((c) => c.id === cellId);
          if (!cell) throw new AppError('not_found', 'No such cell.');
          await manager.delete(Cell, { id: cellId });
          for (const [i, other] of all.filter((c) => c.id !== cellId).entries()) if (other.position !== i) await manager.update(Cell, { id: other.id }, { position: i });
          return { value: undefined, change: { kind: 'cell-deleted', cellId, text: `deleted cell "${cell.label}"` } };
        },
      });
      return detail(viewer, notebookId);
    },

    async runCell(viewer: SignedInUser, notebookId: string, cellId: string): Promise<RunView> {
      return writer.write(viewer, notebookId, {
        action: 'run',
        prepare: async () => {
          const all = (await orderedCells(notebookId)).map((row) => ({ id: row.id, label: row.label, input: parseCellInput(row.inputJson) }));
          const cell = all.find((c) => c.id === cellId);
          if (!cell) throw new AppError('not_found', 'No such cell.');
          const started = await startCellRun(viewer, cell, await notebookAtRun(viewer, notebookId, all));
          if (!started) throw new AppError('validation_failed', `A ${cell.input.kind} cell has nothing to run.`);
          return started;
        },
        apply: async ({ manager }, started) => {
          await recordRuns(manager, [started]);
          return { value: runs.view(started.run), change: runChange([started]), touch: false };
        },
      });
    },

    /**
     * Run every cell that is not up to date, in notebook order, as far as the person's queue limit allows;
     * the cells beyond it are reported as waiting (run all again once some have started).
     */
    async runAll(viewer: SignedInUser, notebookId: string): Promise<RunAllReply> {
      const outcome: { error?: unknown } = {};
      const reply = await writer.write(viewer, notebookId, {
        action: 'run',
        prepare: async () => {
          // the views carry every cell's parsed input: the notebook is read and parsed once for the whole request
          const views = await cellViews(notebookId);
          const notebook = await notebookAtRun(viewer, notebookId, views);
          const started: StartedRun[] = [];
          const waiting: string[] = [];
          for (const view of views) {
            if (!['never-run', 'out-of-date', 'failed'].includes(view.state)) continue;
            try {
              const run = await startCellRun(viewer, view, notebook);
              if (run) started.push(run);
            } catch (error) {
              // Later cells may still be answered from the cache, so keep going.
              if (error instanceof AppError && error.code === 'queue_full') {
                waiting.push(view.label);
                continue;
              }
              // the jobs already queued are still recorded on their cells before the error is answered
              outcome.error = error;
              break;
            }
          }
          return { started, waiting };
        },
        apply: async ({ manager }, { started, waiting }) => {
          await recordRuns(manager, started);
          return { value: { runs: started.map((s) => runs.view(s.run)), waiting }, change: runChange(started), touch: false };
        },
      });
      if (outcome.error) throw outcome.error;
      return reply;
    },

    /** A run, when the viewer started it or may read the notebook of its cell. */
    runOf,

    /** Cancel a queued or running job: whoever started it, or someone who may run the cells of its notebook. */
    async cancelRun(viewer: SignedInUser, runId: string) {
      const run = await runOf(viewer, runId);
      if (run.requestedBy !== viewer.id) {
        const notebookId = run.cellId ? await cellNotebookId(run.cellId) : null;
        if (!notebookId) throw new AppError('forbidden', 'Only whoever started this run can cancel it.');
        await requireRole(viewer, notebookId, 'run');
      }
      return runs.cancel(runId);
    },
  };
}

/** One line for the log of a notebook's title, summary or group change. */
function notebookEditText(patch: { title?: string; summary?: string; groupId?: string | null }, moving: boolean): string {
  if (moving) return patch.groupId ? 'filed the notebook under a group' : 'took the notebook out of its group';
  if (patch.title !== undefined) return `renamed the notebook to "${patch.title.slice(0, 200)}"`;
  return 'edited the notebook\'s description';
}

export type NotebookService = ReturnType<typeof createNotebookService>;
