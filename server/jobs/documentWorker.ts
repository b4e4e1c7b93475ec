// Runs in a worker thread: typesetting an export (every formula checked with KaTeX), comparing two
// versions (parsing and walking their results) and reading a version to restore grow with the notebook,
// long enough to hold up other people's requests if done on the request thread.
import { createHash } from 'node:crypto';
import { compareSnapshots, type VersionSnapshot } from '../../shared/notebook/comparison';
import type { CellComparison } from '../../shared/notebook/api';
import type { CellInput } from '../../shared/notebook/cells';
import { notebookDocument, toLatexDocument, type LatexExportOptions, type NotebookDocument } from '../../shared/notebook/exports';
import type { ErrorCode } from '../../shared/api/errors';
import { AppError } from '../http/errors';
import { parseInput } from '../http/validation';
import { MAX_BODY_DEPTH, nestsDeeperThan } from '../http/hardening';
import { canonicalJson } from '../../shared/notebook/dependencies';
import { DATASET_LIMITS, type ExportedDataset, type AxisSpec, type ColumnMapping, type DatasetPoints, type RowProblem } from '../../shared/notebook/datasets';
import { extractPoints, readTable, TableError } from '../../shared/notebook/datasetParsing';
import { isPlainNumber, toCsv } from '../../shared/notebook/csv';

/** What a restore needs of a snapshot: its inputs, not its outputs. */
export interface RestorableSnapshot {
  title: string;
  summary: string;
  cells: { label: string; kind: CellInput['kind']; input: CellInput }[];
}

export function compareVersions({ fromJson, toJson }: { fromJson: string; toJson: string }): CellComparison[] {
  return compareSnapshots(JSON.parse(fromJson) as VersionSnapshot, JSON.parse(toJson) as VersionSnapshot);
}

/** A dataset as the LaTeX export is sent it: `rowCount` in place of its points (the document names it and counts its points, nothing more). */
type CountedDataset = Omit<ExportedDataset, 'points'> & { rowCount: number };

export function latex({ documentJson, style }: { documentJson: string; style: LatexExportOptions }): string {
  const document = JSON.parse(documentJson) as Omit<NotebookDocument, 'datasets'> & { datasets?: (ExportedDataset | CountedDataset)[] };
  const datasets = document.datasets?.map((dataset) => {
    if ('points' in dataset) return dataset;
    const { rowCount, ...rest } = dataset;
    return { ...rest, points: { x: new Array<string>(rowCount), y: [] } };
  });
  return toLatexDocument({ ...document, datasets } as NotebookDocument, style);
}

export function restorable(snapshotJson: string): RestorableSnapshot {
  const snapshot = JSON.parse(snapshotJson) as VersionSnapshot;
  return {
    title: snapshot.title,
    summary: snapshot.summary,
    cells: snapshot.cells.map((cell) => ({ label: cell.label, kind: cell.kind, input: cell.input as CellInput })),
  };
}

/** A table read and stored as text, or why it could not be (a thrown error would lose its row problems on the way out of the thread). */
export type ReadDatasetOutcome =
  | { ok: true; pointsJson: string; rowCount: number; xRange: [string, string]; yRange: [string, string]; contentHash: string }
  | { ok: false; message: string; problems: RowProblem[]; problemCount: number };

export interface ReadDatasetTask {
  input: string | Uint8Array;
  header?: boolean;
  fileName?: string;
  mapping: ColumnMapping;
  shape: 'points' | 'boundary';
  xAxis: AxisSpec;
  yAxis: AxisSpec;
}

/** What comparison cells depend on: the points, the axes and the shape. */
export function datasetHash(pointsJson: string, description: { shape: string; xAxis: AxisSpec; yAxis: AxisSpec }): string {
  return createHash('sha256').update(canonicalJson({ shape: description.shape, xAxis: description.xAxis, yAxis: description.yAxis })).update('\n').update(pointsJson).digest('hex');
}

function stored(points: DatasetPoints, task: { shape: string; xAxis: AxisSpec; yAxis: AxisSpec }, rowCount: number, xRange: [string, string], yRange: [string, string]): ReadDatasetOutcome {
  const pointsJson = JSON.stringify(points);
  return { ok: true, pointsJson, rowCount, xRange, yRange, contentHash: datasetHash(pointsJson, task) };
}

export function readDataset(task: ReadDatasetTask): ReadDatasetOutcome {
  try {
    const table = readTable(task.input, { header: task.header, fileName: task.fileName });
    const { points, rowCount, xRange, yRange } = extractPoints(table, { mapping: task.mapping, shape: task.shape });
    return stored(points, task, rowCount, xRange, yRange);
  } catch (error) {
    if (error instanceof TableError) return { ok: false, message: error.message, problems: error.problems.slice(0, 50), problemCount: error.problemCount };
    throw error;
  }
}

/**
 * A dataset from an exchange file, checked as an upload would be: equal column lengths, numbers that
 * parse, x strictly increasing (sorted, no duplicates), error columns non-negative.
 */
export function importedDataset(task: { points: DatasetPoints; shape: string; xAxis: AxisSpec; yAxis: AxisSpec; label: string }): ReadDatasetOutcome {
  const { points } = task;
  const problems: RowProblem[] = [];
  const columns = Object.entries(points).filter((entry): entry is [string, string[]] => Array.isArray(entry[1]));
  const rows = points.x.length;
  if (rows === 0) problems.push({ line: 1, reason: 'The dataset has no points' });
  if (rows > DATASET_LIMITS.maxRows) problems.push({ line: 1, reason: `At most ${DATASET_LIMITS.maxRows} rows` });
  if (Boolean(points.yErrLow) !== Boolean(points.yErrHigh)) problems.push({ line: 1, column: points.yErrLow ? 'yErrHigh' : 'yErrLow', reason: 'Lower and upper y-errors come together' });
  for (const [name, column] of columns) if (column.length !== rows) problems.push({ line: 1, column: name, reason: `${column.length} values for ${rows} points` });
  for (let row = 0; row < rows && problems.length < 50; row += 1) {
    for (const [name, column] of columns) {
      const text = column[row];
      if (text === undefined) continue;
      if (!isPlainNumber(text) || !Number.isFinite(Number(text))) problems.push({ line: row + 1, column: name, reason: `"${text.slice(0, 20)}" is not a finite number` });
      else if (name !== 'x' && name !== 'y' && Number(text) < 0) problems.push({ line: row + 1, column: name, reason: 'An error is a non-negative distance' });
    }
    if (row > 0 && !(Number(points.x[row]) > Number(points.x[row - 1]))) problems.push({ line: row + 1, column: 'x', reason: 'x must increase from point to point (sorted, no repeats)' });
  }
  if (problems.length) return { ok: false, message: `Dataset "${task.label}" in the file is not a valid table`, problems, problemCount: problems.length };
  let low = 0;
  let high = 0;
  for (let row = 1; row < rows; row += 1) {
    if (Number(points.y[row]) < Number(points.y[low])) low = row;
    if (Number(points.y[row]) > Number(points.y[high])) high = row;
  }
  return stored(points, task, rows, [points.x[0], points.x[rows - 1]], [points.y[low], points.y[high]]);
}

/** A dataset of an imported file, checked and ready to store. */
export interface CheckedDataset {
  description: Pick<ExportedDataset, 'label' | 'name' | 'source' | 'note' | 'shape' | 'xAxis' | 'yAxis'>;
  yErrors: 'none' | 'symmetric' | 'asymmetric';
  xErrors: boolean;
  fileName: string | null;
  outcome: Extract<ReadDatasetOutcome, { ok: true }>;
}

/** An exchange file read and checked, or the error to answer with (an AppError does not survive the way out of the thread). */
export type ImportOutcome =
  | { ok: true; title: string; summary: string; cells: { label: string; input: CellInput }[]; datasets: CheckedDataset[] }
  | { ok: false; code: ErrorCode; message: string; fields?: Record<string, string>; table?: { problems: RowProblem[]; problemCount: number } };

function checkedDataset(dataset: ExportedDataset): CheckedDataset | Extract<ReadDatasetOutcome, { ok: false }> {
  const outcome = importedDataset({ points: dataset.points, shape: dataset.shape, xAxis: dataset.xAxis, yAxis: dataset.yAxis, label: dataset.label });
  if (!outcome.ok) return outcome;
  const { points } = dataset;
  const symmetric = points.yErrLow && points.yErrHigh && points.yErrLow.every((value, i) => value === points.yErrHigh![i]);
  const { label, name, source, note, shape, xAxis, yAxis } = dataset;
  return {
    description: { label, name, source, note, shape, xAxis, yAxis },
    yErrors: points.yErrLow ? (symmetric ? 'symmetric' : 'asymmetric') : 'none',
    xErrors: Boolean(points.xErr),
    fileName: dataset.fileName ?? null,
    outcome,
  };
}

/** An exchange file's text parsed, validated as the import route's body and its datasets checked as uploads are. */
export function importDocument(text: string): ImportOutcome {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    return { ok: false, code: 'malformed_json', message: 'The request body is not valid JSON.' };
  }
  // as for every other body (boundedBodyDepth): deeper nesting is refused before anything walks it
  if (nestsDeeperThan(value, MAX_BODY_DEPTH)) return { ok: false, code: 'validation_failed', message: `The request body nests more than ${MAX_BODY_DEPTH} levels deep.` };
  let document: NotebookDocument;
  try {
    document = parseInput(notebookDocument, value);
  } catch (error) {
    if (error instanceof AppError) return { ok: false, code: error.code, message: error.message, fields: error.fields };
    throw error;
  }
  const datasets: CheckedDataset[] = [];
  for (const dataset of document.datasets ?? []) {
    const checked = checkedDataset(dataset);
    if ('ok' in checked) return { ok: false, code: 'invalid_table', message: checked.message, table: { problems: checked.problems, problemCount: checked.problemCount } };
    datasets.push(checked);
  }
  // outputs are not imported: only the inputs go back to the request thread
  return { ok: true, title: document.title, summary: document.summary, cells: document.cells.map(({ label, input }) => ({ label, input })), datasets };
}

/** The stored columns as a CSV file (cells a spreadsheet would run as formulas are escaped by toCsv). */
export function datasetCsv({ pointsJson, columns }: { pointsJson: string; columns: { key: keyof DatasetPoints; title: string }[] }): string {
  const points = JSON.parse(pointsJson) as DatasetPoints;
  const present = columns.filter((column) => Array.isArray(points[column.key]));
  const rows = points.x.map((_x, row) => present.map((column) => points[column.key]![row]));
  return toCsv(present.map((column) => column.title), rows);
}

/**
 * The points a comparison takes: those with x inside [from, to] (as jobForCell keeps them), or only their
 * count when there are more than a comparison accepts — so at most that many cross back to the request thread.
 */
export function datasetPointsInRange({ pointsJson, from, to }: { pointsJson: string; from?: string; to?: string }): { points: DatasetPoints; kept: number } {
  const points = JSON.parse(pointsJson) as DatasetPoints;
  const inside = (x: string) => (from === undefined || Number(x) >= Number(from)) && (to === undefined || Number(x) <= Number(to));
  const kept = points.x.flatMap((x, i) => (inside(x) ? [i] : []));
  if (kept.length > DATASET_LIMITS.maxComparedPoints) return { points: { x: [], y: [] }, kept: kept.length };
  const pick = (column: string[] | undefined) => column && kept.map((i) => column[i]);
  const picked: DatasetPoints = { x: pick(points.x)!, y: pick(points.y)! };
  for (const name of ['yErrLow', 'yErrHigh', 'xErr'] as const) if (points[name]) picked[name] = pick(points[name]);
  return { points: picked, kept: kept.length };
}

export default latex;
