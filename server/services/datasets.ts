import type { DataSource, EntityManager } from 'typeorm';
import { AXIS_NAMES, DATASET_LIMITS, type AxisSpec, type DatasetDescription, type DatasetPoints, type DatasetView } from '../../shared/notebook/datasets';
import type { NotebookDetail } from '../../shared/notebook/api';
import type { DatasetForJob } from '../../shared/notebook/jobs';
import type { SignedInUser } from '../auth/sessions';
import { Dataset, NotebookVersionDataset } from '../db/entities';
import { AppError } from '../http/errors';
import type { SenderLimit } from '../http/senderLimits';
import type { UploadedFile } from '../http/upload';
import { newId } from '../ids';
import type { DocumentRenderer } from '../jobs/documents';
import type { CheckedDataset, ReadDatasetOutcome } from '../jobs/documentWorker';
import { megabytes } from '../../shared/jobs/cost';
import type { NotebookService } from './notebooks';
import { countFrom, dialectOf, momentFrom, momentParameter, runSql } from '../db/sql';

/** Every column of a dataset but its points, which may be megabytes. */
const VIEW_COLUMNS = `"id", "label", "name", "source", "note", "shape", "xAxisJson", "yAxisJson", "yErrors", "xErrors", "rowCount", "rangesJson", "fileName", "contentHash", "createdAt", "createdByName"`;

type ViewRow = Omit<Dataset, 'pointsJson' | 'notebookId' | 'notebook' | 'createdById' | 'removedAt' | 'createdAt' | 'xErrors'> & { createdAt: string | Date; xErrors: number | boolean };

const isoDate = (value: string | Date) => momentFrom(value).toISOString();

function toView(row: ViewRow): DatasetView {
  const ranges = JSON.parse(row.rangesJson) as { x: [string, string]; y: [string, string] };
  return {
    id: row.id,
    label: row.label,
    name: row.name,
    source: row.source,
    note: row.note,
    shape: row.shape as DatasetView['shape'],
    xAxis: JSON.parse(row.xAxisJson) as AxisSpec,
    yAxis: JSON.parse(row.yAxisJson) as AxisSpec,
    hasYErrors: row.yErrors as DatasetView['hasYErrors'],
    hasXErrors: Boolean(row.xErrors),
    rowCount: row.rowCount,
    xRange: ranges.x,
    yRange: ranges.y,
    fileName: row.fileName,
    contentHash: row.contentHash,
    createdAt: isoDate(row.createdAt),
    createdByName: row.createdByName,
  };
}

/** The datasets currently in the notebook, without their points, by label. */
export async function currentDatasetViews(manager: EntityManager, notebookId: string): Promise<DatasetView[]> {
  const rows: ViewRow[] = await runSql(manager, `SELECT ${VIEW_COLUMNS} FROM "datasets" WHERE "notebookId" = ? AND "removedAt" IS NULL ORDER BY "label" ASC`, [notebookId]);
  return rows.map(toView);
}

/** Content hash of each current dataset by label: what comparison cells' fingerprints include. */
export async function currentDatasetHashes(manager: EntityManager, notebookId: string): Promise<Map<string, string>> {
  const rows: { label: string; contentHash: string }[] = await runSql(manager,
    `SELECT "label" AS "label", "contentHash" AS "contentHash" FROM "datasets" WHERE "notebookId" = ? AND "removedAt" IS NULL`,
    [notebookId],
  );
  return new Map(rows.map((row) => [row.label, row.contentHash]));
}

/** Stored points below this many characters are parsed where they are needed (a few ms); larger ones in the document pool. */
const PARSE_INLINE_CHARS = 100_000;

type JobDatasetRow = Pick<Dataset, 'label' | 'shape' | 'xAxisJson' | 'yAxisJson' | 'pointsJson' | 'contentHash'>;

/** Reads the datasets comparison cells name; one reader serves one operation (a run, run-all, a restore). */
export type DatasetReader = (cell: { dataset: string; xFrom?: string; xTo?: string }) => Promise<DatasetForJob | null>;

/**
 * A reader for one operation: each dataset's points are parsed once (small ones here, kept by label and
 * content hash), and each x-range of a large one is cut once in the document pool.
 * `documents` null: only datasets small enough to read here (inside a transaction nothing waits for the pool).
 */
export function datasetReader(manager: EntityManager, documents: DocumentRenderer | null, notebookId: string, person: string): DatasetReader {
  const parsed = new Map<string, DatasetPoints>();
  const cut = new Map<string, { points: DatasetPoints; kept: number }>();
  return async (cell) => {
    const [row]: JobDatasetRow[] = await runSql(manager,
      `SELECT "label", "shape", "xAxisJson", "yAxisJson", "pointsJson", "contentHash" FROM "datasets" WHERE "notebookId" = ? AND "label" = ? AND "removedAt" IS NULL`,
      [notebookId, cell.dataset],
    );
    if (!row) return null;
    const small = row.pointsJson.length < PARSE_INLINE_CHARS;
    if (!small && !documents) return null;
    const key = `${row.label}\n${row.contentHash}`;
    let inRange: { points: DatasetPoints; kept: number };
    if (small) {
      if (!parsed.has(key)) parsed.set(key, JSON.parse(row.pointsJson) as DatasetPoints);
      inRange = pointsInRange(parsed.get(key)!, cell.xFrom, cell.xTo);
    } else {
      const rangeKey = `${key}\n${cell.xFrom ?? ''}\n${cell.xTo ?? ''}`;
      if (!cut.has(rangeKey)) cut.set(rangeKey, await documents!.datasetPointsInRange({ pointsJson: row.pointsJson, from: cell.xFrom, to: cell.xTo }, person));
      inRange = cut.get(rangeKey)!;
    }
    return jobDataset(row, inRange);
  };
}

function jobDataset(row: JobDatasetRow, { points, kept }: { points: DatasetPoints; kept: number }): DatasetForJob {
  if (kept > DATASET_LIMITS.maxComparedPoints) {
    const message = `${kept.toLocaleString('en')} data points lie in this x-range; a comparison takes at most ${DATASET_LIMITS.maxComparedPoints.toLocaleString('en')}: narrow the range`;
    throw new AppError('validation_failed', message, { xFrom: message });
  }
  return { label: row.label, shape: row.shape as DatasetForJob['shape'], xAxis: JSON.parse(row.xAxisJson) as AxisSpec, yAxis: JSON.parse(row.yAxisJson) as AxisSpec, points, contentHash: row.contentHash };
}

/** Same rule as the document worker's datasetPointsInRange, for small datasets. */
function pointsInRange(points: DatasetPoints, from?: string, to?: string): { points: DatasetPoints; kept: number } {
  const inside = (x: string) => (from === undefined || Number(x) >= Number(from)) && (to === undefined || Number(x) <= Number(to));
  const kept = points.x.flatMap((x, i) => (inside(x) ? [i] : []));
  if (kept.length > DATASET_LIMITS.maxComparedPoints) return { points: { x: [], y: [] }, kept: kept.length };
  const pick = (column: string[]) => kept.map((i) => column[i]);
  const picked: DatasetPoints = { x: pick(points.x), y: pick(points.y) };
  for (const name of ['yErrLow', 'yErrHigh', 'xErr'] as const) if (points[name]) picked[name] = pick(points[name]!);
  return { points: picked, kept: kept.length };
}

/** Record which datasets a new version holds: the notebook's current ones. */
export async function recordVersionDatasets(manager: EntityManager, notebookId: string, versionId: string): Promise<void> {
  await runSql(manager,
    `INSERT INTO "notebook_version_datasets" ("versionId", "datasetId") SELECT ?, "id" FROM "datasets" WHERE "notebookId" = ? AND "removedAt" IS NULL`,
    [versionId, notebookId],
  );
}

/** Views of the datasets a version holds (for its snapshot). */
export async function versionDatasetViews(manager: EntityManager, versionId: string): Promise<DatasetView[]> {
  const rows: ViewRow[] = await runSql(manager,
    `SELECT ${VIEW_COLUMNS.split(', ').map((c) => `d.${c}`).join(', ')} FROM "datasets" d JOIN "notebook_version_datasets" v ON v."datasetId" = d."id" WHERE v."versionId" = ? ORDER BY d."label" ASC`,
    [versionId],
  );
  return rows.map(toView);
}

/** Removed datasets that no version holds any more are deleted (their points are not needed by anything). */
export async function deleteUnheldDatasets(manager: EntityManager, notebookId: string): Promise<void> {
  await runSql(manager,
    `DELETE FROM "datasets" WHERE "notebookId" = ? AND "removedAt" IS NOT NULL AND NOT EXISTS (SELECT 1 FROM "notebook_version_datasets" v WHERE v."datasetId" = "datasets"."id")`,
    [notebookId],
  );
}

/**
 * Makes exactly the version's datasets current (inside a restore's transaction); returns how many it holds.
 * Versions saved before datasets existed hold none, so restoring one leaves the notebook without datasets.
 */
export async function restoreVersionDatasets(manager: EntityManager, notebookId: string, versionId: string): Promise<number> {
  const now = momentParameter(dialectOf(manager), new Date());
  const held = `SELECT "datasetId" FROM "notebook_version_datasets" WHERE "versionId" = ?`;
  await runSql(manager, `UPDATE "datasets" SET "removedAt" = ? WHERE "notebookId" = ? AND "removedAt" IS NULL AND "id" NOT IN (${held})`, [now, notebookId, versionId]);
  await runSql(manager, `UPDATE "datasets" SET "removedAt" = NULL WHERE "notebookId" = ? AND "id" IN (${held})`, [notebookId, versionId]);
  const [{ count }]: { count: number | string }[] = await runSql(manager, `SELECT COUNT(*) AS "count" FROM (${held}) AS "held"`, [versionId]);
  return countFrom(count);
}

/**
 * The `"datasets":[…]` members of an exchange file, spliced from stored text (points never parsed here);
 * with `pointsAs: 'count'` each carries `rowCount` instead of its points (what the LaTeX export needs).
 */
export async function exportedDatasetsText(manager: EntityManager, notebookId: string, pointsAs: 'points' | 'count' = 'points'): Promise<string> {
  const pointsColumn = pointsAs === 'points' ? '"pointsJson"' : 'NULL AS "pointsJson"';
  const rows: (Pick<Dataset, 'label' | 'name' | 'source' | 'note' | 'shape' | 'xAxisJson' | 'yAxisJson' | 'fileName' | 'rowCount'> & { pointsJson: string | null })[] = await runSql(manager,
    `SELECT "label", "name", "source", "note", "shape", "xAxisJson", "yAxisJson", "fileName", "rowCount", ${pointsColumn} FROM "datasets" WHERE "notebookId" = ? AND "removedAt" IS NULL ORDER BY "label" ASC`,
    [notebookId],
  );
  return rows
    .map((row) => {
      const head = { label: row.label, name: row.name, source: row.source, note: row.note, shape: row.shape, fileName: row.fileName };
      const points = row.pointsJson === null ? `"rowCount":${Number(row.rowCount)}` : `"points":${row.pointsJson}`;
      return `${JSON.stringify(head).slice(0, -1)},"xAxis":${row.xAxisJson},"yAxis":${row.yAxisJson},${points}}`;
    })
    .join(',');
}

/** A dataset checked and stored as text, ready to insert. */
type ReadyDataset = CheckedDataset;

function datasetRow(notebookId: string, author: { id: string; name: string }, ready: ReadyDataset) {
  const { description, outcome } = ready;
  return {
    id: newId(),
    notebookId,
    label: description.label,
    name: description.name,
    source: description.source,
    note: description.note,
    shape: description.shape,
    xAxisJson: JSON.stringify(description.xAxis),
    yAxisJson: JSON.stringify(description.yAxis),
    yErrors: ready.yErrors,
    xErrors: ready.xErrors,
    rowCount: outcome.rowCount,
    rangesJson: JSON.stringify({ x: outcome.xRange, y: outcome.yRange }),
    fileName: ready.fileName,
    pointsJson: outcome.pointsJson,
    contentHash: outcome.contentHash,
    createdById: author.id,
    createdByName: author.name.slice(0, 120),
    removedAt: null,
  };
}

async function insertDataset(manager: EntityManager, notebookId: string, author: { id: string; name: string }, ready: ReadyDataset): Promise<string> {
  const row = datasetRow(notebookId, author, ready);
  await manager.insert(Dataset, row);
  return row.id;
}

function refuseTable(outcome: ReadDatasetOutcome): asserts outcome is Extract<ReadDatasetOutcome, { ok: true }> {
  if (!outcome.ok) throw new AppError('invalid_table', outcome.message, undefined, { problems: outcome.problems, problemCount: outcome.problemCount });
}

/** The imported datasets must fit a notebook as uploads do (their total points, DATASET_LIMITS.maxNotebookBytes). */
export function assertImportedDatasetsFit(ready: ReadyDataset[]): void {
  const bytes = ready.reduce((sum, dataset) => sum + dataset.outcome.pointsJson.length, 0);
  if (bytes > DATASET_LIMITS.maxNotebookBytes) {
    throw new AppError('conflict', `The datasets of this file hold ${megabytes(bytes)} of points; a notebook holds at most ${megabytes(DATASET_LIMITS.maxNotebookBytes)}.`);
  }
}

export async function insertImportedDatasets(manager: EntityManager, notebookId: string, author: SignedInUser, ready: ReadyDataset[]): Promise<void> {
  if (ready.length) await manager.insert(Dataset, ready.map((dataset) => datasetRow(notebookId, author, dataset)));
}

export interface DatasetServiceDeps {
  dataSource: DataSource;
  notebooks: NotebookService;
  documents: DocumentRenderer;
  /** Uploads and pasted tables one person may store per hour. */
  uploadLimit: SenderLimit;
  /** The notebook a share link opens (the same 404 for every bad link). */
  resolveLink(token: string): Promise<{ notebookId: string }>;
}

/** A table given with an upload or pasted: the file, or the text. */
export type TableInput = { file: UploadedFile } | { text: string };

const axisName = (axis: AxisSpec) => (axis.kind === 'other' ? axis.label ?? 'other' : AXIS_NAMES[axis.kind]);
const plural = (n: number, word: string) => `${n.toLocaleString('en')} ${word}${n === 1 ? '' : 's'}`;

/** Datasets of notebooks: stored once read, immutable, removed from the notebook rather than changed. */
export function createDatasetService({ dataSource, notebooks, documents, uploadLimit, resolveLink }: DatasetServiceDeps) {
  const datasets = dataSource.getRepository(Dataset);

  /** Label free and room left among the notebook's current datasets (and its stored ones) for `bytes` more points. */
  async function assertRoomFor(manager: EntityManager, notebookId: string, label: string, bytes = 0) {
    const rows: { label: string }[] = await runSql(manager, `SELECT "label" AS "label" FROM "datasets" WHERE "notebookId" = ? AND "removedAt" IS NULL`, [notebookId]);
    if (rows.some((row) => row.label === label)) {
      throw new AppError('conflict', `A dataset labelled "${label}" is already in this notebook; choose another label or remove that dataset first.`, { label: 'Label already used' });
    }
    if (rows.length >= DATASET_LIMITS.maxPerNotebook) {
      throw new AppError('conflict', `A notebook holds at most ${DATASET_LIMITS.maxPerNotebook} datasets; remove one first.`);
    }
    await assertBytesFit(manager, notebookId, bytes);
  }

  async function assertBytesFit(manager: EntityManager, notebookId: string, bytes: number) {
    const [{ current, stored }]: { current: number | null; stored: number | null }[] = await runSql(manager,
      `SELECT SUM(CASE WHEN "removedAt" IS NULL THEN length("pointsJson") ELSE 0 END) AS "current", SUM(length("pointsJson")) AS "stored" FROM "datasets" WHERE "notebookId" = ?`,
      [notebookId],
    );
    const currentBytes = Number(current ?? 0) + bytes;
    const storedBytes = Number(stored ?? 0) + bytes;
    if (currentBytes > DATASET_LIMITS.maxNotebookBytes || (bytes === 0 && currentBytes >= DATASET_LIMITS.maxNotebookBytes)) {
      throw new AppError(
        'conflict',
        `The datasets of a notebook hold at most ${megabytes(DATASET_LIMITS.maxNotebookBytes)} of points (so that its exchange file imports again); ${bytes ? `with this one they would hold ${megabytes(currentBytes)}` : 'this notebook is full'}: remove a dataset or keep fewer points.`,
      );
    }
    if (storedBytes > DATASET_LIMITS.maxStoredNotebookBytes || (bytes === 0 && storedBytes >= DATASET_LIMITS.maxStoredNotebookBytes)) {
      throw new AppError(
        'conflict',
        `This notebook keeps earlier datasets for its versions: ${bytes ? `with this one it would store ${megabytes(storedBytes)}` : `it stores ${megabytes(storedBytes)}`} of points, at most ${megabytes(DATASET_LIMITS.maxStoredNotebookBytes)}. Export it and import the file as a new notebook (only its current datasets travel), and add the dataset there.`,
      );
    }
  }

  async function viewOf(datasetId: string): Promise<DatasetView> {
    const [row]: ViewRow[] = await runSql(dataSource, `SELECT ${VIEW_COLUMNS} FROM "datasets" WHERE "id" = ?`, [datasetId]);
    return toView(row);
  }

  async function add(viewer: SignedInUser, notebookId: string, description: DatasetDescription, table: TableInput): Promise<DatasetView> {
    const datasetId = await notebooks.writer.write(viewer, notebookId, {
      action: 'edit',
      prepare: async () => {
        await assertRoomFor(dataSource.manager, notebookId, description.label);
        // an upload took its quota before its bytes were read (assertMayUpload)
        if (!('file' in table)) await uploadLimit.takeOrRefuse(viewer.id);
        const fileName = 'file' in table ? table.file.originalname.slice(0, 200) : null;
        const outcome = await documents.readDataset(
          {
            input: 'file' in table ? new Uint8Array(table.file.buffer.buffer, table.file.buffer.byteOffset, table.file.buffer.byteLength) : table.text,
            header: description.header,
            fileName: fileName ?? undefined,
            mapping: description.mapping,
            shape: description.shape,
            xAxis: description.xAxis,
            yAxis: description.yAxis,
          },
          viewer.id,
        );
        refuseTable(outcome);
        return { outcome, fileName };
      },
      apply: async ({ manager }, { outcome, fileName }) => {
        // checked again inside the transaction: another upload may have taken the label (or the room) meanwhile
        await assertRoomFor(manager, notebookId, description.label, outcome.pointsJson.length);
        const ready: ReadyDataset = { description, yErrors: description.mapping.yError.kind, xErrors: description.mapping.xError !== undefined, fileName, outcome };
        const id = await insertDataset(manager, notebookId, viewer, ready);
        return { value: id, change: { kind: 'dataset-added', text: `added dataset "${description.label}" (${plural(outcome.rowCount, 'point')})` } };
      },
    });
    return viewOf(datasetId);
  }

  /** A dataset of the notebook: a current one, or one a version still holds (version views show it). */
  async function readable(viewer: SignedInUser, notebookId: string, datasetId: string, action: 'read' | 'export') {
    await notebooks.requireRole(viewer, notebookId, action);
    return held(notebookId, datasetId);
  }

  async function held(notebookId: string, datasetId: string): Promise<Dataset> {
    const row = await datasets.findOneBy({ id: datasetId, notebookId });
    if (!row) throw new AppError('not_found', 'No such dataset in this notebook.');
    return row;
  }

  /** `{"dataset": {…view, "points": …}}` with the stored points spliced in, never parsed. */
  function withPointsJson(row: Dataset): string {
    const view = toView({ ...row, createdAt: row.createdAt });
    return `{"dataset":${JSON.stringify(view).slice(0, -1)},"points":${row.pointsJson}}}`;
  }

  async function csvOf(row: Dataset, person: string): Promise<{ fileName: string; csv: string }> {
    const xAxis = JSON.parse(row.xAxisJson) as AxisSpec;
    const yAxis = JSON.parse(row.yAxisJson) as AxisSpec;
    const x = axisName(xAxis);
    const y = axisName(yAxis);
    const columns: { key: keyof DatasetPoints; title: string }[] = [{ key: 'x', title: x }, { key: 'y', title: y }];
    if (row.yErrors === 'symmetric') columns.push({ key: 'yErrLow', title: `${y} error` });
    if (row.yErrors === 'asymmetric') columns.push({ key: 'yErrLow', title: `${y} lower error` }, { key: 'yErrHigh', title: `${y} upper error` });
    if (row.xErrors) columns.push({ key: 'xErr', title: `${x} error` });
    const csv = await documents.datasetCsv(row.pointsJson, columns, person);
    return { fileName: `${row.label}.csv`, csv };
  }

  return {
    /** Before an upload's bytes are read: only an editor may send them, within the hourly quota (taken here, whatever becomes of the file). */
    async assertMayUpload(viewer: SignedInUser, notebookId: string): Promise<void> {
      await notebooks.requireRole(viewer, notebookId, 'edit');
      await uploadLimit.takeOrRefuse(viewer.id);
    },

    upload: (viewer: SignedInUser, notebookId: string, description: DatasetDescription, file: UploadedFile | null) => {
      if (!file) throw new AppError('validation_failed', 'Attach the table in the form field "file".', { file: 'Attach a file' });
      if (file.size === 0) throw new AppError('invalid_table', 'The file is empty.', undefined, { problems: [{ line: 1, reason: 'The file is empty' }], problemCount: 1 });
      return add(viewer, notebookId, description, { file });
    },

    paste: (viewer: SignedInUser, notebookId: string, pasted: DatasetDescription & { text: string }) => {
      const { text, ...description } = pasted;
      return add(viewer, notebookId, description, { text });
    },

    async list(viewer: SignedInUser, notebookId: string): Promise<DatasetView[]> {
      await notebooks.requireRole(viewer, notebookId, 'read');
      return currentDatasetViews(dataSource.manager, notebookId);
    },

    async getJson(viewer: SignedInUser, notebookId: string, datasetId: string): Promise<string> {
      return withPointsJson(await readable(viewer, notebookId, datasetId, 'read'));
    },

    /** Through a share link: the notebook the link opens, and only its current datasets (not those only its versions hold). */
    async sharedJson(token: string, datasetId: string): Promise<string> {
      const { notebookId } = await resolveLink(token);
      const row = await held(notebookId, datasetId);
      if (row.removedAt) throw new AppError('not_found', 'No such dataset in this notebook.');
      return withPointsJson(row);
    },

    async csv(viewer: SignedInUser, notebookId: string, datasetId: string): Promise<{ fileName: string; csv: string }> {
      return csvOf(await readable(viewer, notebookId, datasetId, 'export'), viewer.id);
    },

    /** Take the dataset out of the notebook; the notebook as it was is kept as an automatic version first. */
    async remove(viewer: SignedInUser, notebookId: string, datasetId: string): Promise<NotebookDetail> {
      await notebooks.writer.write(viewer, notebookId, {
        action: 'edit',
        versionBefore: async (manager) => {
          const row = await manager.findOneBy(Dataset, { id: datasetId, notebookId });
          return row && !row.removedAt ? `Before removing dataset "${row.label}"` : null;
        },
        apply: async ({ manager }) => {
          const row = await manager.findOneBy(Dataset, { id: datasetId, notebookId });
          if (!row || row.removedAt) throw new AppError('not_found', 'No such dataset in this notebook.');
          await manager.update(Dataset, { id: datasetId }, { removedAt: new Date() });
          await deleteUnheldDatasets(manager, notebookId);
          return { value: undefined, change: { kind: 'dataset-removed', text: `removed dataset "${row.label}" (${plural(row.rowCount, 'point')})` } };
        },
      });
      return notebooks.detail(viewer, notebookId);
    },
  };
}

export type DatasetService = ReturnType<typeof createDatasetService>;
