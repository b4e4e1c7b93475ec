import Papa from 'papaparse';
import { isPlainNumber } from './csv';
import { DATASET_LIMITS, type DatasetDescription, type DatasetPoints, type RowProblem, type TablePreview } from './datasets';

/**
 * Reading uploaded and pasted tables: the app runs it for an instant preview, the server for the parse
 * that is stored. Everything is all-or-nothing: a table with any problem is refused as a whole, with
 * the problems listed by their line in the file.
 */

type Delimiter = TablePreview['delimiter'];

export type ParsedTable = {
  delimiter: Delimiter;
  header: boolean;
  columns: string[];
  rows: string[][];
  /** 1-based file line of each row. */
  lines: number[];
};

const MAX_LISTED_PROBLEMS = 50;
const PREVIEW_ROWS = 20;
const QUOTED_CELL_CHARS = 24;
/** Stored numbers are text of at most this length (the exchange file's limit). */
const MAX_NUMBER_CHARS = 60;
/** Lines read to choose the delimiter and guess the header. */
const SAMPLE_LINES = 200;
/** Share of control characters beyond which the content is taken for a binary file. */
const MAX_CONTROL_SHARE = 0.01;
/** Order of preference when several delimiters split every line alike: ; before , because decimal commas live in ;-separated files. */
const DELIMITERS: Delimiter[] = ['\t', ';', ',', ' '];
const DELIMITER_NAMES: Record<Delimiter, string> = { '\t': 'tabs', ';': 'semicolons', ',': 'commas', ' ': 'spaces' };

export class TableError extends Error {
  readonly problems: RowProblem[];
  readonly problemCount: number;

  constructor(message: string, problems: RowProblem[] = [], problemCount = problems.length) {
    super(message);
    this.name = 'TableError';
    this.problems = problems;
    this.problemCount = problemCount;
  }
}

export function describeTableError(e: TableError): { message: string; problems: RowProblem[]; problemCount: number } {
  return { message: e.message, problems: e.problems, problemCount: e.problemCount };
}

/** Collects row problems: the first 50 are kept, all are counted. */
class Problems {
  readonly listed: RowProblem[] = [];
  count = 0;

  add(problem: RowProblem): void {
    this.count += 1;
    if (this.listed.length < MAX_LISTED_PROBLEMS) this.listed.push(problem);
  }

  throwIfAny(): void {
    if (this.count === 0) return;
    throw new TableError(problemsSentence(this.listed[0], this.count), this.listed, this.count);
  }
}

function problemsSentence(first: RowProblem, count: number): string {
  const where = `line ${first.line}${first.column !== undefined ? `, column “${first.column}”` : ''}`;
  if (count === 1) return `${capitalised(where)}: ${first.reason}.`;
  return `${count.toLocaleString('en')} problems in the table; the first is on ${where}: ${first.reason}.`;
}

function capitalised(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

function quoted(cell: string): string {
  return `“${cell.length > QUOTED_CELL_CHARS ? `${cell.slice(0, QUOTED_CELL_CHARS)}…` : cell}”`;
}

const megabytes = (bytes: number) => `${bytes / (1024 * 1024)} MB`;

// ---- from bytes or text to checked text ----

function notText(fileName: string | undefined, why: string): TableError {
  return new TableError(`${fileName ? `“${fileName}”` : 'This'} is not a text table (${why}); upload a CSV or TSV file.`);
}

function tooLarge(): TableError {
  return new TableError(`The file is larger than ${megabytes(DATASET_LIMITS.maxFileBytes)}; split it or keep only the rows you need.`);
}

function utf8Length(text: string): number {
  if (text.length * 3 <= DATASET_LIMITS.maxFileBytes) return text.length; // cannot be over the limit: the exact count is not needed
  return new TextEncoder().encode(text).length;
}

function isControl(code: number): boolean {
  return (code < 32 && code !== 9 && code !== 10 && code !== 12 && code !== 13) || code === 127;
}

function refuseBinaryText(text: string, fileName: string | undefined): void {
  if (text.includes('\u0000')) throw notText(fileName, 'it contains NUL bytes');
  const sample = Math.min(text.length, 65_536);
  let controls = 0;
  for (let i = 0; i < sample; i += 1) if (isControl(text.charCodeAt(i))) controls += 1;
  if (sample > 0 && controls / sample > MAX_CONTROL_SHARE) throw notText(fileName, 'it is full of control characters');
}

function textOf(input: string | Uint8Array, fileName: string | undefined): string {
  if (typeof input === 'string') {
    if (input.length > DATASET_LIMITS.maxFileBytes || utf8Length(input) > DATASET_LIMITS.maxFileBytes) throw tooLarge();
    refuseBinaryText(input, fileName);
    return input;
  }
  if (input.byteLength > DATASET_LIMITS.maxFileBytes) throw tooLarge();
  if (input.indexOf(0) !== -1) throw notText(fileName, 'it contains NUL bytes');
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(input);
  } catch {
    throw notText(fileName, 'it is not UTF-8 text');
  }
  refuseBinaryText(text, fileName);
  return text;
}

// ---- splitting into records ----

type TableRecord = { fields: string[]; line: number };

function isBlank(fields: string[]): boolean {
  return fields.every((field) => field.trim() === '');
}

/** Non-blank lines that are not `#` comments, with their 1-based numbers. */
function contentLines(text: string, limit: number): { text: string; line: number }[] {
  const found: { text: string; line: number }[] = [];
  let start = 0;
  for (let line = 1; start <= text.length && found.length < limit; line += 1) {
    const end = text.indexOf('\n', start);
    const content = text.slice(start, end === -1 ? text.length : end);
    if (content.trim() !== '' && !content.trimStart().startsWith('#')) found.push({ text: content, line });
    if (end === -1) break;
    start = end + 1;
  }
  return found;
}

function whitespaceFields(line: string): string[] {
  return line.trim().split(/[ \t]+/);
}

function sampleFieldCounts(sample: string[], delimiter: Delimiter): number[] {
  if (delimiter === ' ') return sample.map((line) => whitespaceFields(line).length);
  return Papa.parse<string[]>(sample.join('\n'), { delimiter, skipEmptyLines: true }).data.map((row) => row.length);
}

function mostCommon(counts: number[]): { count: number; lines: number } {
  const tally = new Map<number, number>();
  for (const count of counts) tally.set(count, (tally.get(count) ?? 0) + 1);
  let best = { count: counts[0] ?? 0, lines: 0 };
  for (const [count, lines] of tally) if (lines > best.lines) best = { count, lines };
  return best;
}

/** The delimiter and the field count most lines have. */
function chooseDelimiter(sample: string[]): { delimiter: Delimiter; fieldCount: number } {
  const candidates = DELIMITERS.map((delimiter) => {
    const counts = sampleFieldCounts(sample, delimiter);
    return { delimiter, counts, common: mostCommon(counts) };
  });
  const uniform = candidates.find(({ counts }) => counts.length > 0 && counts[0] > 1 && counts.every((count) => count === counts[0]));
  if (uniform) return { delimiter: uniform.delimiter, fieldCount: uniform.counts[0] };
  const split = candidates.filter(({ common }) => common.count > 1);
  if (split.length === 0) {
    throw new TableError('Only one column was found; a dataset needs an x and a y column, separated by commas, tabs, semicolons or spaces.');
  }
  const best = split.reduce((a, b) => (b.common.lines > a.common.lines ? b : a));
  return { delimiter: best.delimiter, fieldCount: best.common.count };
}

/** Where a record starting at `start` really begins: papaparse skips `#` comment lines without reporting them. */
function pastCommentLines(text: string, start: number): number {
  let at = start;
  while (text.startsWith('#', at)) {
    const end = text.indexOf('\n', at);
    if (end === -1) return text.length;
    at = end + 1;
  }
  return at;
}

/** Records of a delimited text with the file line each starts on; quoted fields may span lines. */
function delimitedRecords(text: string, delimiter: Exclude<Delimiter, ' '>, maxRecords: number, problems: Problems): TableRecord[] {
  const records: TableRecord[] = [];
  let cursor = 0;
  let counted = 0;
  let line = 1;
  Papa.parse<string[]>(text, {
    delimiter,
    comments: '#',
    skipEmptyLines: false,
    step: (result, parser) => {
      const start = pastCommentLines(text, cursor);
      for (let i = counted; i < start; i += 1) if (text.charCodeAt(i) === 10) line += 1;
      counted = start;
      cursor = result.meta.cursor;
      for (const error of result.errors) {
        problems.add({ line, reason: error.code === 'MissingQuotes' ? 'a quote opened here is never closed' : 'a quoted field is not closed properly' });
      }
      const indentedComment = /^[ \t]+#/.test(result.data[0] ?? '');
      if (!isBlank(result.data) && !indentedComment) records.push({ fields: result.data, line });
      if (records.length > maxRecords) parser.abort();
    },
  });
  return records;
}

/** Records of a text without quotes: one line each (much faster than the general parser for big numeric tables). */
function lineRecords(text: string, delimiter: Delimiter, maxRecords: number): TableRecord[] {
  const split = delimiter === ' ' ? whitespaceFields : (line: string) => line.split(delimiter);
  const records: TableRecord[] = [];
  for (const { text: content, line } of contentLines(text, maxRecords + 1)) {
    const fields = split(content);
    if (!isBlank(fields)) records.push({ fields, line });
  }
  return records;
}

// ---- the header ----

function isNumberCell(cell: string | undefined): boolean {
  return cell !== undefined && isPlainNumber(cell.trim());
}

/** A first row is a header when it has a non-number in a column whose next rows are mostly numbers (or, without such columns, any non-number). */
function looksLikeHeader(first: string[], next: string[][]): boolean {
  const numericColumns = first
    .map((_, column) => column)
    .filter((column) => next.length > 0 && next.filter((row) => isNumberCell(row[column])).length * 2 > next.length);
  const judged = numericColumns.length > 0 ? numericColumns : first.map((_, column) => column);
  return judged.some((column) => !isNumberCell(first[column]));
}

// ---- reading a table ----

/** Reads a CSV, TSV, ;- or whitespace-separated table; throws TableError with line-numbered problems. */
export function readTable(input: string | Uint8Array, options: { header?: boolean; fileName?: string } = {}): ParsedTable {
  const text = textOf(input, options.fileName).replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
  const sample = contentLines(text, SAMPLE_LINES).map(({ text: content }) => content);
  if (sample.length === 0) throw new TableError('The table is empty: there is no row to read.');
  const { delimiter, fieldCount } = chooseDelimiter(sample);
  if (fieldCount > DATASET_LIMITS.maxColumns) {
    throw new TableError(`The table has ${fieldCount} columns; at most ${DATASET_LIMITS.maxColumns} are read. Keep only the columns you need.`);
  }
  const problems = new Problems();
  const maxRecords = DATASET_LIMITS.maxRows + 1;
  const records = delimiter === ' ' || !text.includes('"') ? lineRecords(text, delimiter, maxRecords) : delimitedRecords(text, delimiter, maxRecords, problems);
  problems.throwIfAny();
  if (records.length === 0) throw new TableError('The table is empty: there is no row to read.');

  const header = options.header ?? looksLikeHeader(records[0].fields, records.slice(1, 6).map(({ fields }) => fields));
  const data = header ? records.slice(1) : records;
  if (data.length > DATASET_LIMITS.maxRows) {
    throw new TableError(`The table has more than ${DATASET_LIMITS.maxRows.toLocaleString('en')} rows; keep only the rows you need.`);
  }
  if (data.length === 0) throw new TableError(`The table has a header (line ${records[0].line}) but no data rows.`);

  for (const { fields, line } of records) {
    if (fields.length !== fieldCount) {
      problems.add({ line, reason: `${fields.length} ${fields.length === 1 ? 'field' : 'fields'} where the table's rows have ${fieldCount} (separated by ${DELIMITER_NAMES[delimiter]})` });
    }
  }
  problems.throwIfAny();

  const columnNames = header ? records[0].fields.map((name, i) => name.trim() || `column ${i + 1}`) : records[0].fields.map((_, i) => `column ${i + 1}`);
  return {
    delimiter,
    header,
    columns: columnNames,
    rows: data.map(({ fields }) => fields.map((field) => field.trim())),
    lines: data.map(({ line }) => line),
  };
}

export function previewOf(table: ParsedTable): TablePreview {
  return { delimiter: table.delimiter, header: table.header, columns: table.columns, rows: table.rows.slice(0, PREVIEW_ROWS), rowCount: table.rows.length };
}

// ---- numbers ----

type Cell = { value: string } | { reason: string };

function numberCell(raw: string): Cell {
  const cell = raw.trim();
  if (cell === '') return { reason: 'the cell is empty' };
  if (/^[+-]?(?:nan|inf|infinity)$/i.test(cell)) return { reason: `${quoted(cell)} is not a finite number` };
  if (/^[+-]?\d*,\d+(?:[eE][+-]?\d+)?$/.test(cell)) return { reason: `${quoted(cell)} has a decimal comma; use a point as decimal separator` };
  if (!isPlainNumber(cell)) return { reason: `${quoted(cell)} is not a number` };
  if (cell.length > MAX_NUMBER_CHARS) return { reason: `${quoted(cell)} has more than ${MAX_NUMBER_CHARS} characters` };
  if (!Number.isFinite(Number(cell))) return { reason: `${quoted(cell)} is too large` };
  return { value: cell.startsWith('+') ? cell.slice(1) : cell };
}

/** An exact decimal: value = sign × 0.digits × 10^exponent, digits without leading or trailing zeros. */
type DecimalKey = { sign: -1 | 0 | 1; exponent: number; digits: string };

function decimalKey(text: string): DecimalKey {
  const match = /^([+-]?)(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?$/.exec(text);
  if (!match) throw new Error(`not a plain number: ${text}`);
  const all = match[2] + (match[3] ?? '');
  const lead = all.search(/[1-9]/);
  if (lead === -1) return { sign: 0, exponent: 0, digits: '' };
  return {
    sign: match[1] === '-' ? -1 : 1,
    exponent: match[2].length + Number(match[4] ?? 0) - lead,
    digits: all.slice(lead).replace(/0+$/, ''),
  };
}

function compareDecimals(a: DecimalKey, b: DecimalKey): number {
  if (a.sign !== b.sign) return a.sign - b.sign;
  if (a.sign === 0) return 0;
  const magnitude = a.exponent !== b.exponent ? a.exponent - b.exponent : a.digits < b.digits ? -1 : a.digits > b.digits ? 1 : 0;
  return a.sign * Math.sign(magnitude);
}

// ---- points ----

type Mapping = Pick<DatasetDescription, 'mapping' | 'shape'>;
type Role = 'x' | 'y' | 'yErrLow' | 'yErrHigh' | 'xErr';

const ROLE_NAMES: Record<Role, string> = { x: 'x', y: 'y', yErrLow: 'lower y-error', yErrHigh: 'upper y-error', xErr: 'x-error' };

function mappedColumns({ mapping }: Mapping): Partial<Record<Role, number>> {
  const errors = mapping.yError ?? { kind: 'none' as const };
  return {
    x: mapping.x,
    y: mapping.y,
    ...(errors.kind === 'symmetric' ? { yErrLow: errors.column, yErrHigh: errors.column } : {}),
    ...(errors.kind === 'asymmetric' ? { yErrLow: errors.lower, yErrHigh: errors.upper } : {}),
    ...(mapping.xError !== undefined ? { xErr: mapping.xError } : {}),
  };
}

function errorProblem(value: string): string | null {
  const key = decimalKey(value);
  if (key.sign === 0) return `the error ${quoted(value)} is zero; give positive errors or map no error column`;
  if (key.sign < 0) return `the error ${quoted(value)} is negative; errors are positive distances from the value`;
  return null;
}

/** The mapped columns as exact decimal text, every cell checked once (a column may serve two roles: symmetric errors). */
function readColumns(table: ParsedTable, columns: Partial<Record<Role, number>>): Partial<Record<Role, string[]>> {
  const problems = new Problems();
  const roles = Object.keys(columns) as Role[];
  const distinct = [...new Set(roles.map((role) => columns[role]!))];
  const isErrorColumn = (column: number) => roles.some((role) => columns[role] === column && role !== 'x' && role !== 'y');
  const values = new Map(distinct.map((column) => [column, new Array<string>(table.rows.length)]));
  table.rows.forEach((row, r) => {
    for (const column of distinct) {
      const cell = numberCell(row[column] ?? '');
      const reason = 'reason' in cell ? cell.reason : isErrorColumn(column) ? errorProblem(cell.value) : null;
      if (reason) problems.add({ line: table.lines[r], column: table.columns[column], reason });
      else values.get(column)![r] = (cell as { value: string }).value;
    }
  });
  problems.throwIfAny();
  return Object.fromEntries(roles.map((role) => [role, role === 'yErrHigh' && columns.yErrLow === columns.yErrHigh ? [...values.get(columns[role]!)!] : values.get(columns[role]!)!]));
}

function checkColumnsExist(table: ParsedTable, columns: Partial<Record<Role, number>>): void {
  for (const [role, column] of Object.entries(columns) as [Role, number][]) {
    if (column >= table.columns.length) {
      throw new TableError(`The ${ROLE_NAMES[role]} column is number ${column + 1}, but the table has ${table.columns.length} columns.`);
    }
  }
}

function extremes(values: string[]): [string, string] {
  let low = values[0];
  let high = values[0];
  let lowKey = decimalKey(low);
  let highKey = lowKey;
  for (const value of values) {
    const key = decimalKey(value);
    if (compareDecimals(key, lowKey) < 0) [low, lowKey] = [value, key];
    if (compareDecimals(key, highKey) > 0) [high, highKey] = [value, key];
  }
  return [low, high];
}

/** Row order sorted by x (file order among equals); equal x values are refused, naming both lines. */
function orderByX(table: ParsedTable, x: string[], xColumn: number): number[] {
  const keys = x.map(decimalKey);
  const order = x.map((_, i) => i).sort((a, b) => compareDecimals(keys[a], keys[b]) || a - b);
  const problems = new Problems();
  for (let k = 1; k < order.length; k += 1) {
    const [earlier, later] = [order[k - 1], order[k]];
    if (compareDecimals(keys[earlier], keys[later]) === 0) {
      problems.add({ line: table.lines[later], column: table.columns[xColumn], reason: `x = ${x[later]} is already on line ${table.lines[earlier]}; each x may appear once` });
    }
  }
  problems.throwIfAny();
  return order;
}

/** The dataset's points from a read table and its column mapping; throws TableError listing every bad cell. */
export function extractPoints(
  table: ParsedTable,
  description: Mapping,
): { points: DatasetPoints; rowCount: number; xRange: [string, string]; yRange: [string, string] } {
  const columns = mappedColumns(description);
  checkColumnsExist(table, columns);
  const read = readColumns(table, columns);
  const order = orderByX(table, read.x!, description.mapping.x);
  if (description.shape === 'boundary' && order.length < DATASET_LIMITS.minKinkPoints) {
    throw new TableError(`A boundary curve needs at least ${DATASET_LIMITS.minKinkPoints} points for the smoothing spline; this table has ${order.length}.`);
  }
  const sorted = (values: string[] | undefined) => (values ? order.map((i) => values[i]) : undefined);
  const points: DatasetPoints = { x: sorted(read.x)!, y: sorted(read.y)! };
  if (read.yErrLow) points.yErrLow = sorted(read.yErrLow);
  if (read.yErrHigh) points.yErrHigh = sorted(read.yErrHigh);
  if (read.xErr) points.xErr = sorted(read.xErr);
  return { points, rowCount: order.length, xRange: [points.x[0], points.x[points.x.length - 1]], yRange: extremes(points.y) };
}
