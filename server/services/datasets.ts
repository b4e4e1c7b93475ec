import type { DataSource, EntityManager } from 'typeorm';
import { AXIS_NAMES, DATASET_LIMITS, type AxisSpec, type DatasetDescription, type DatasetPoints, type DatasetView, type ExportedDataset } from '../../shared/notebook/datasets';
import type { NotebookDetail } from '../../shared/notebook/api';
import type { DatasetForJob } from '../../shared/notebook/jobs';
import type { SignedInUser } from '../auth/sessions';
import { Dataset, NotebookVersionDataset } from '../db/entities';
import { AppError } from '../http/errors';
import type { SenderLimit } from '../http/senderLimits';
import type { UploadedFile } from '../http/upload';
import { newId } from '../ids';
import type { DocumentRenderer } from '../jobs/documents';
import type { ReadDatasetOutcome } from '../jobs/documentWorker';
import type { NotebookService } from './notebooks';

/** Every column of a dataset but its points, which may be megabytes. */
const VIEW_COLUMNS = `"id", "label", "name", "source", "note", "shape", "xAxisJson", "yAxisJson", "yErrors", "xErrors", "rowCount", "rangesJson", "fileName", "contentHash", "createdAt", "createdByName"`;

type ViewRow = Omit<Dataset, 'pointsJson' | 'notebookId' | 'notebook' | 'createdById' | 'removedAt' | 'createdAt' | 'xErrors'> & { createdAt: string | Date; xErrors: number | boolean };

const isoDate = (value: string | Date) => (value instanceof Date ? value : new Date(`${value.replace(' ', 'T')}${value.endsWith('Z') ? '' : 'Z'}`)).toISOString();

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
  const rows: ViewRow[] = await manager.query(`SELECT ${VIEW_COLUMNS} FROM "datasets" WHERE "notebookId" = ? AND "removedAt" IS NULL ORDER BY "label" ASC`, [notebookId]);
  return rows.map(toView);
}

/** Content hash of each current dataset by label: what comparison cells' fingerprints include. */
export async function currentDatasetHashes(manager: EntityManager, notebookId: string): Promise<Map<string, string>> {
  const rows: { label: string; contentHash: string }[] = await manager.query(
    `SELECT "label" AS label, "contentHash" AS contentHash FROM "datasets" WHERE "notebookId" = ? AND "removedAt" IS NULL`,
    [notebookId],
  );
  return new Map(rows.map((row) => [row.label, row.contentHash]));
}

/** Stored points below this many characters are parsed where they are needed; larger ones in the document pool. */
const PARSE_INLINE_CHARS = 1_000_000;

/**
 * The current dataset a comparison cell names, with only the points inside its x-range (at most what a
 * comparison takes); null when the notebook has no such dataset.
 */
export async function datasetForJob(
  manager: EntityManager,
  /** null: only datasets small enough to read here (inside a transaction nothing waits for the pool). */
  documents: DocumentRenderer | null,
  notebookId: string,
  cell: { dataset: string; xFrom?: string; xTo?: string },
  person: string,
): Promise<DatasetForJob | null> {
  const [row]: Pick<Dataset, 'label' | 'shape' | 'xAxisJson' | 'yAxisJson' | 'pointsJson' | 'contentHash'>[] = await manager.query(
    `SELECT "label", "shape", "xAxisJson", "yAxisJson", "pointsJson", "contentHash" FROM "datasets" WHERE "notebookId" = ? AND "label" = ? AND "removedAt" IS NULL`,
    [notebookId, cell.dataset],
  );
  if (!row) return null;
  const task = { pointsJson: row.pointsJson, from: cell.xFrom, to: cell.xTo };
  const small = row.pointsJson.length < PARSE_INLINE_CHARS;
  if (!small && !documents) return null;
  const { points, kept } = small ? pointsInRange(task) : await documents!.datasetPointsInRange(task, person);
  if (kept > DATASET_LIMITS.maxComparedPoints) {
    const message = `${kept.toLocaleString('en')} data points lie in this x-range; a comparison takes at most ${DATASET_LIMITS.maxComparedPoints.toLocaleString('en')}: narrow the range`;
    throw new AppError('validation_failed', message, { xFrom: message });
  }
  return { label: row.label, shape: row.shape as DatasetForJob['shape'], xAxis: JSON.parse(row.xAxisJson) as AxisSpec, yAxis: JSON.parse(row.yAxisJson) as AxisSpec, points, contentHash: row.contentHash };
}

/** Same rule as the document worker's datasetPointsInRange, for small datasets. */
function pointsInRange({ pointsJson, from, to }: { pointsJson: string; from?: string; to?: string }): { points: DatasetPoints; kept: number } {
  const points = JSON.parse(pointsJson) as DatasetPoints;
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
  await manager.query(
    `INSERT INTO "notebook_version_datasets" ("versionId", "datasetId") SELECT ?, "id" FROM "datasets" WHERE "notebookId" = ? AND "removedAt" IS NULL`,
    [versionId, notebookId],
  );
}

/** Views of the datasets a version holds (for its snapshot). */
export async function versionDatasetViews(manager: EntityManager, versionId: string): Promise<DatasetView[]> {
  const rows: ViewRow[] = await manager.query(
    `SELECT ${VIEW_COLUMNS.split(', ').map((c) => `d.${c}`).join(', ')} FROM "datasets" d JOIN "notebook_version_datasets" v ON v."datasetId" = d."id" WHERE v."versionId" = ? ORDER BY d."label" ASC`,
    [versionId],
  );
  return rows.map(toView);
}

/** Removed datasets that no version holds any more are deleted (their points are not needed by anything). */
export async function deleteUnheldDatasets(manager: EntityManager, notebookId: string): Promise<void> {
  await manager.query(
    `DELETE FROM "datasets" WHERE "notebookId" = ? AND "removedAt" IS NOT NULL AND NOT EXISTS (SELECT 1 FROM "notebook_version_datasets" v WHERE v."datasetId" = "datasets"."id")`,
    [notebookId],
  );
}

/**
 * Makes exactly the version's datasets current (inside a restore's transaction); returns how many it holds.
 * Versions saved before datasets existed hold none, so restoring one leaves the notebook without datasets.
 */
export async function restoreVersionDatasets(manager: EntityManager, notebookId: string, versionId: string): Promise<number> {
  const now = new Date().toISOString().replace('T', ' ').replace('Z', '');
  const held = `SELECT "datasetId" FROM "notebook_version_datasets" WHERE "versionId" = ?`;
  await manager.query(`UPDATE "datasets" SET "removedAt" = ? WHERE "notebookId" = ? AND "removedAt" IS NULL AND "id" NOT IN (${held})`, [now, notebookId, versionId]);
  await manager.query(`UPDATE "datasets" SET "removedAt" = NULL WHERE "notebookId" = ? AND "id" IN (${held})`, [notebookId, versionId]);
  const [{ count }]: { count: number }[] = await manager.query(`SELECT COUNT(*) AS count FROM (${held})`, [versionId]);
  return Number(count);
}

/** The `"datasets":[…]` members of an exchange file, spliced from stored text (points never parsed here). */
export async function exportedDatasetsText(manager: EntityManager, notebookId: string): Promise<string> {
  const rows: Pick<Dataset, 'label' | 'name' | 'source' | 'note' | 'shape' | 'xAxisJson' | 'yAxisJson' | 'fileName' | 'pointsJson'>[] = await manager.query(
    `SELECT "label", "name", "source", "note", "shape", "xAxisJson", "yAxisJson", "fileName", "pointsJson" FROM "datasets" WHERE "notebookId" = ? AND "removedAt" IS NULL ORDER BY "label" ASC`,
    [notebookId],
  );
  return rows
    .map((row) => {
      const head = { label: row.label, name: row.name, source: row.source, note: row.note, shape: row.shape, fileName: row.fileName };
      return `${JSON.stringify(head).slice(0, -1)},"xAxis":${row.xAxisJson},"yAxis":${row.yAxisJson},"points":${row.pointsJson}}`;
    })
    .join(',');
}

/** A dataset checked and stored as text, ready to insert. */
interface ReadyDataset {
  description: Pick<DatasetDescription, 'label' | 'name' | 'source' | 'note' | 'shape' | 'xAxis' | 'yAxis'>;
  yErrors: DatasetView['hasYErrors'];
  xErrors: boolean;
  fileName: string | null;
  outcome: Extract<ReadDatasetOutcome, { ok: true }>;
}

async function insertDataset(manager: EntityManager, notebookId: string, author: { id: string; name: string }, ready: ReadyDataset): Promise<string> {
  const id = newId();
  const { description, outcome } = ready;
  await manager.insert(Dataset, {
    id,
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
  });
  return id;
}

function refuseTable(outcome: ReadDatasetOutcome): asserts outcome is Extract<ReadDatasetOutcome, { ok: true }> {
  if (!outcome.ok) throw new AppError('invalid_table', outcome.message, undefined, { problems: outcome.problems, problemCount: outcome.problemCount });
}

/**
 * The datasets of an imported exchange file, checked in the document pool, then inserted with the new
 * notebook (inside its creating transaction: `insert` is called there).
 */
export async function checkedImportedDatasets(documents: DocumentRenderer, datasets: ExportedDataset[], person: string): Promise<ReadyDataset[]> {
  const ready: ReadyDataset[] = [];
  for (const dataset of datasets) {
    const outcome = await documents.importedDataset({ points: dataset.points, shape: dataset.shape, xAxis: dataset.xAxis, yAxis: dataset.yAxis, label: dataset.label }, person);
    refuseTable(outcome);
    const { points } = dataset;
    const symmetric = points.yErrLow && points.yErrHigh && points.yErrLow.every((value, i) => value === points.yErrHigh![i]);
    ready.push({
      description: dataset,
      yErrors: points.yErrLow ? (symmetric ? 'symmetric' : 'asymmetric') : 'none',
      xErrors: Boolean(points.xErr),
      fileName: dataset.fileName ?? null,
      outcome,
    });
  }
  return ready;
}

export async function insertImportedDatasets(manager: EntityManager, notebookId: string, author: SignedInUser, ready: ReadyDataset[]): Promise<void> {
  for (const dataset of ready) await insertDataset(manager, notebookId, author, dataset);
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

  /** Label free and room left among the notebook's current datasets. */
  async function assertRoomFor(manager: EntityManager, notebookId: string, label: string) {
    const rows: { label: string }[] = await manager.query(`SELECT "label" AS label FROM "datasets" WHERE "notebookId" = ? AND "removedAt" IS NULL`, [notebookId]);
    if (rows.some((row) => row.label === label)) {
      throw new AppError('conflict', `A dataset labelled "${label}" is already in this notebook; choose another label or remove that dataset first.`, { label: 'Label already used' });
    }
    if (rows.length >= DATASET_LIMITS.maxPerNotebook) {
      throw new AppError('conflict', `A notebook holds at most ${DATASET_LIMITS.maxPerNotebook} datasets; remove one first.`);
    }
  }

  async function viewOf(datasetId: string): Promise<DatasetView> {
    const [row]: ViewRow[] = await dataSource.query(`SELECT ${VIEW_COLUMNS} FROM "datasets" WHERE "id" = ?`, [datasetId]);
    return toView(row);
  }

  async function add(viewer: SignedInUser, notebookId: string, description: DatasetDescription, table: TableInput): Promise<DatasetView> {
    const datasetId = await notebooks.writer.write(viewer, notebookId, {
      action: 'edit',
      prepare: async () => {
        await assertRoomFor(dataSource.manager, notebookId, description.label);
        await uploadLimit.takeOrRefuse(viewer.id);
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
        // checked again inside the transaction: another upload may have taken the label meanwhile
        await assertRoomFor(manager, notebookId, description.label);
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
    /** Before an upload's bytes are read: only an editor may send them. */
    async assertMayUpload(viewer: SignedInUser, notebookId: string): Promise<void> {
      await notebooks.requireRole(viewer, notebookId, 'edit');
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

    /** Through a share link: the notebook the link opens, and only datasets of it. */
    async sharedJson(token: string, datasetId: string): Promise<string> {
      const { notebookId } = await resolveLink(token);
      return withPointsJson(await held(notebookId, datasetId));
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
