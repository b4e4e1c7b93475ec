import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, test } from 'node:test';
import Decimal from 'decimal.js';
import { describeTableError, extractPoints, previewOf, readTable, TableError, type ParsedTable } from '../../../shared/notebook/datasetParsing';
import { DATASET_LIMITS, type ColumnMapping } from '../../../shared/notebook/datasets';

// All tables in this file are invented test data (see tests/fixtures/datasets/README.md).

const fixture = (name: string) => new Uint8Array(readFileSync(join(__dirname, '../../fixtures/datasets', name)));

const plain: ColumnMapping = { x: 0, y: 1, yError: { kind: 'none' } };
const points = (table: ParsedTable, mapping: ColumnMapping = plain, shape: 'points' | 'boundary' = 'points') => extractPoints(table, { mapping, shape });

/** Runs `read` and returns the TableError it must throw. */
function refusal(read: () => unknown): TableError {
  try {
    read();
  } catch (error) {
    assert.ok(error instanceof TableError, `expected a TableError, got ${String(error)}`);
    return error;
  }
  assert.fail('the table was accepted');
}

/** The one problem a table has: its line, column and reason, and the sentence naming the same line and column. */
function onlyProblem(error: TableError) {
  assert.equal(error.problemCount, 1, error.message);
  assert.equal(error.problems.length, 1);
  const [problem] = error.problems;
  assert.match(error.message, new RegExp(`line ${problem.line}\\b`, 'i'));
  if (problem.column !== undefined) assert.ok(error.message.includes(`“${problem.column}”`), error.message);
  return problem;
}

describe('tables that are refused before any row is read', () => {
  test('an empty file and one with only whitespace and comments', () => {
    for (const text of ['', '   \n\n\t\r\n', '# only a comment\n\n', ',,\n , ,\n', '"",""\n']) {
      assert.match(refusal(() => readTable(text)).message, /empty/);
    }
    assert.match(refusal(() => readTable(new Uint8Array(0))).message, /empty/);
  });

  test('a header only: no data rows, naming the header line (comment lines count)', () => {
    const error = refusal(() => readTable('# invented\ns,nu\n\n'));
    assert.match(error.message, /header \(line 2\) but no data rows/);
  });

  test('binary files renamed .csv are "not a text table"', () => {
    const png = fixture('image-renamed.csv');
    const zip = fixture('archive-renamed.csv');
    // Preconditions: the fixtures start with the PNG signature (PNG spec, 89 50 4E 47 0D 0A 1A 0A) and a ZIP local header ("PK\3\4", APPNOTE).
    assert.deepEqual([...png.slice(0, 8)], [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    assert.deepEqual([...zip.slice(0, 4)], [0x50, 0x4b, 0x03, 0x04]);
    for (const bytes of [png, zip]) {
      const error = refusal(() => readTable(bytes, { fileName: 'data.csv' }));
      assert.match(error.message, /“data\.csv” is not a text table/);
    }
  });

  test('bytes that are not UTF-8 (a Latin-1 é) and text full of control characters are not a text table', () => {
    const latin1 = new Uint8Array([...Buffer.from('x,y\ncaf'), 0xe9, ...Buffer.from(',1\n')]); // 0xE9 alone is an invalid UTF-8 sequence (RFC 3629)
    assert.match(refusal(() => readTable(latin1)).message, /not a text table \(it is not UTF-8 text\)/);
    const controls = 'x,y\n' + '\u0001\u0002\u0003\u0004,1\n'.repeat(20);
    assert.match(refusal(() => readTable(controls)).message, /not a text table/);
  });

  test('files over the byte limit are refused; exactly at the limit they are read', () => {
    const table = 'x,y\n1,2\n3,4\n';
    const atLimit = Buffer.alloc(DATASET_LIMITS.maxFileBytes, '\n'.charCodeAt(0));
    atLimit.write(table, 0);
    assert.equal(readTable(new Uint8Array(atLimit)).rows.length, 2);
    const overLimit = new Uint8Array(DATASET_LIMITS.maxFileBytes + 1).fill('\n'.charCodeAt(0));
    overLimit.set(Buffer.from(table), 0);
    assert.match(refusal(() => readTable(overLimit)).message, /larger than 10 MB/);
    // Text counts in UTF-8 bytes: ten Δ (2 bytes each in UTF-8, RFC 3629) more than half the limit is over it.
    const wide = `x,y\n1,2\n#${'Δ'.repeat(DATASET_LIMITS.maxFileBytes / 2)}\n`;
    assert.ok(wide.length < DATASET_LIMITS.maxFileBytes);
    assert.match(refusal(() => readTable(wide)).message, /larger than 10 MB/);
  });

  test('more rows than the limit are refused; 200 000 rows are read', () => {
    const rows = (n: number) => Array.from({ length: n }, (_, i) => `${i},${(i * 0.5).toFixed(1)}`);
    const full = readTable(['x,y', ...rows(DATASET_LIMITS.maxRows)].join('\n'));
    assert.equal(full.rows.length, 200_000);
    assert.equal(full.lines[full.lines.length - 1], 200_001);
    assert.deepEqual(full.rows[199_999], ['199999', '99999.5']);
    assert.equal(points(full).rowCount, 200_000);
    const error = refusal(() => readTable(['x,y', ...rows(DATASET_LIMITS.maxRows + 1)].join('\n')));
    assert.match(error.message, /more than 200,000 rows/);
  });

  test('more columns than the limit are refused; 64 are read', () => {
    const table = (columns: number) => `${Array.from({ length: columns }, (_, i) => `c${i}`).join(',')}\n${Array.from({ length: columns }, (_, i) => i).join(',')}\n`;
    assert.equal(readTable(table(DATASET_LIMITS.maxColumns)).columns.length, 64);
    assert.match(refusal(() => readTable(table(DATASET_LIMITS.maxColumns + 1))).message, /65 columns; at most 64/);
  });

  test('one column only (an unknown separator): asks for one of the separators read', () => {
    const error = refusal(() => readTable('x|y\n1|2\n3|4\n'));
    assert.match(error.message, /Only one column was found/);
    assert.match(error.message, /commas, tabs, semicolons or spaces/);
  });
});

describe('rows that do not fit the table', () => {
  test('a ;-separated file whose field count differs on one line names that line', () => {
    const error = refusal(() => readTable('x;y;err\n1;2;0.1\n3;4\n5;6;0.2\n'));
    const problem = onlyProblem(error);
    assert.equal(problem.line, 3);
    assert.match(problem.reason, /2 fields where the table's rows have 3 \(separated by semicolons\)/);
  });

  test('a comma table with a longer row, after comment lines that still count', () => {
    const problem = onlyProblem(refusal(() => readTable('# invented\n# second comment\nx,y\n1,2\n3,4,5\n6,7\n')));
    assert.equal(problem.line, 5);
    assert.match(problem.reason, /3 fields where the table's rows have 2/);
  });

  test('50 problems are listed and all are counted', () => {
    const bad = Array.from({ length: 120 }, (_, i) => `${i},1,2`);
    // Most rows have 2 fields (header and 150 rows against 120), so the 120 longer rows are the odd ones.
    const error = refusal(() => readTable(['x,y', ...Array.from({ length: 150 }, (_, i) => `${i},1`), ...bad].join('\n')));
    assert.equal(error.problemCount, 120);
    assert.equal(error.problems.length, 50);
    assert.equal(error.problems[0].line, 152); // header on line 1, 150 good rows on lines 2..151
    assert.equal(error.problems[49].line, 201);
    assert.match(error.message, /^120 problems in the table; the first is on line 152/);
    assert.deepEqual(describeTableError(error), { message: error.message, problems: error.problems, problemCount: 120 });
  });

  test('a quote that is never closed', () => {
    const error = refusal(() => readTable('x,y,remark\n1,2,"ok"\n3,4,"open\n5,6,x\n'));
    assert.equal(error.problems[0].line, 3);
    assert.match(error.problems[0].reason, /quote opened here is never closed/);
  });
});

describe('cells of the mapped columns', () => {
  const table = readTable('s,nu,err,note\n1.5,0.7,0.01,fine\n1.6,abc,0.02,fine\n');

  test('a non-number names the column and quotes the cell', () => {
    const problem = onlyProblem(refusal(() => points(table)));
    assert.deepEqual(problem, { line: 3, column: 'nu', reason: '“abc” is not a number' });
  });

  test('a long non-number is quoted truncated', () => {
    const long = 'not-a-number-but-a-very-long-remark';
    const problem = onlyProblem(refusal(() => points(readTable(`x,y\n1,${long}\n`))));
    assert.equal(problem.reason, `“${long.slice(0, 24)}…” is not a number`);
  });

  test('NaN, Inf, -Infinity and empty cells', () => {
    const error = refusal(() => points(readTable('x,y\n1,NaN\n2,Inf\n3,-Infinity\n4,\n5,1\n')));
    assert.deepEqual(
      error.problems.map(({ line, column, reason }) => [line, column, reason]),
      [
        [2, 'y', '“NaN” is not a finite number'],
        [3, 'y', '“Inf” is not a finite number'],
        [4, 'y', '“-Infinity” is not a finite number'],
        [5, 'y', 'the cell is empty'],
      ],
    );
  });

  test('decimal commas: "use a point as decimal separator"', () => {
    const problem = onlyProblem(refusal(() => points(readTable('x;y\n1.5;2.5\n1.6;0,75\n'))));
    assert.deepEqual([problem.line, problem.column], [3, 'y']);
    assert.match(problem.reason, /“0,75” has a decimal comma; use a point as decimal separator/);
  });

  test('negative and zero errors: symmetric, asymmetric and x-errors', () => {
    const symmetric = onlyProblem(refusal(() => points(readTable('s,nu,err\n1.5,0.7,-0.01\n'), { ...plain, yError: { kind: 'symmetric', column: 2 } })));
    assert.deepEqual([symmetric.line, symmetric.column], [2, 'err']);
    assert.match(symmetric.reason, /“-0.01” is negative/);
    const asymmetric = onlyProblem(refusal(() => points(readTable('s,nu,lo,hi\n1.5,0.7,0.01,0.02\n1.6,0.8,0.01,0e-5\n'), { ...plain, yError: { kind: 'asymmetric', lower: 2, upper: 3 } })));
    assert.deepEqual([asymmetric.line, asymmetric.column], [3, 'hi']);
    assert.match(asymmetric.reason, /“0e-5” is zero/);
    const xError = onlyProblem(refusal(() => points(readTable('s,nu,ds\n1.5,0.7,0.000\n1.6,0.8,0.01\n'), { ...plain, xError: 2 })));
    assert.deepEqual([xError.line, xError.column], [2, 'ds']);
    assert.match(xError.reason, /zero/);
  });

  test('spreadsheet formulas in mapped columns are not numbers', () => {
    const error = refusal(() => points(readTable('x,y\n1,"=cmd|\' /C calc\'!A0"\n2,+SUM(1;2)\n3,@x\n4,-2+3\n')));
    assert.deepEqual(error.problems.map(({ line, column }) => [line, column]), [[2, 'y'], [3, 'y'], [4, 'y'], [5, 'y']]);
    assert.equal(error.problems[0].reason, '“=cmd|\' /C calc\'!A0” is not a number');
    error.problems.forEach(({ reason }) => assert.match(reason, /is not a number$/));
  });

  test('formulas in unmapped text columns are ignored and never kept', () => {
    const read = points(readTable('x,y,remark\n1,2,"=cmd|\' /C calc\'!A0"\n3,4,@SUM(A1)\n'));
    assert.deepEqual(read.points, { x: ['1', '3'], y: ['2', '4'] });
  });

  test('a mapped column the table does not have', () => {
    const error = refusal(() => points(readTable('x,y\n1,2\n'), { ...plain, yError: { kind: 'symmetric', column: 4 } }));
    assert.match(error.message, /column is number 5, but the table has 2 columns/);
  });
});

describe('x values', () => {
  test('a repeated x names both lines, comparing exact decimals (1.0 = 1 = 1e0)', () => {
    const problem = onlyProblem(refusal(() => points(readTable('x,y\n1.0,2\n0.5,3\n1e0,4\n'))));
    assert.equal(problem.line, 4);
    assert.equal(problem.column, 'x');
    assert.match(problem.reason, /x = 1e0 is already on line 2/);
  });

  test('unsorted x is sorted silently, errors and all', () => {
    const read = points(readTable(fixture('lattice-exponents.csv')), { ...plain, yError: { kind: 'symmetric', column: 2 } });
    assert.deepEqual(read.points, {
      x: ['1.50', '1.60', '1.70', '1.80'],
      y: ['1.1400', '1.2210', '1.3050', '1.3920'],
      yErrLow: ['0.0050', '0.0040', '0.0035', '2.5e-3'],
      yErrHigh: ['0.0050', '0.0040', '0.0035', '2.5e-3'],
    });
    assert.deepEqual([read.xRange, read.yRange], [['1.50', '1.80'], ['1.1400', '1.3920']]);
  });

  test('x values a double cannot tell apart are different decimals, ordered as decimal.js orders them', () => {
    const xs = ['0.10000000000000001', '0.1', '-2e-1', '-0.2000001', '1e-400', '0'];
    assert.equal(Number(xs[0]), Number(xs[1])); // the reason for exact comparison: these are one double
    const read = points(readTable(`x,y\n${xs.map((x, i) => `${x},${i}`).join('\n')}\n`));
    const expected = [...xs].sort((a, b) => new Decimal(a).comparedTo(new Decimal(b)));
    assert.deepEqual(read.points.x, expected);
  });

  test('zero written two ways is one x', () => {
    const problem = onlyProblem(refusal(() => points(readTable('x,y\n0,1\n-0.000,2\n'))));
    assert.match(problem.reason, /already on line 2/);
  });

  test('a boundary needs 8 points for the smoothing spline; 8 are enough and are sorted', () => {
    const rows = (n: number) => Array.from({ length: n }, (_, i) => `${(n - i) / 10},${i}`).join('\n');
    const error = refusal(() => points(readTable(`x,y\n${rows(7)}\n`), plain, 'boundary'));
    assert.match(error.message, /boundary curve needs at least 8 points for the smoothing spline; this table has 7/);
    const read = points(readTable(`x,y\n${rows(8)}\n`), plain, 'boundary');
    assert.deepEqual(read.points.x, ['0.1', '0.2', '0.3', '0.4', '0.5', '0.6', '0.7', '0.8']);
  });
});

describe('tables that are read', () => {
  test('CSV with a header and comment lines; the preview shows the first rows', () => {
    const table = readTable(fixture('lattice-exponents.csv'));
    assert.equal(table.delimiter, ',');
    assert.equal(table.header, true);
    assert.deepEqual(table.columns, ['s', 'nu_inv', 'nu_inv_err', 'method']);
    assert.deepEqual(table.lines, [4, 5, 6, 7]);
    assert.deepEqual(previewOf(table), { delimiter: ',', header: true, columns: table.columns, rows: table.rows, rowCount: 4 });
    const many = readTable(`x,y\n${Array.from({ length: 30 }, (_, i) => `${i},${i}`).join('\n')}`);
    assert.deepEqual(previewOf(many).rows, many.rows.slice(0, 20));
    assert.equal(previewOf(many).rowCount, 30);
  });

  test('TSV boundary curve', () => {
    const table = readTable(fixture('boundary.tsv'), { fileName: 'boundary.tsv' });
    assert.deepEqual([table.delimiter, table.header, table.columns], ['\t', true, ['Delta_phi', 'Delta_phi2_bound']]);
    const read = points(table, plain, 'boundary');
    assert.equal(read.rowCount, 9);
    assert.deepEqual(read.xRange, ['0.500', '0.540']);
  });

  test('whitespace-aligned columns without a header (spaces and tabs mixed)', () => {
    const table = readTable(fixture('spaces.dat'));
    assert.deepEqual([table.delimiter, table.header, table.columns], [' ', false, ['column 1', 'column 2', 'column 3']]);
    assert.deepEqual(table.lines, [3, 4, 5, 6]);
    const read = points(table, { ...plain, yError: { kind: 'symmetric', column: 2 } });
    assert.deepEqual(read.points.y, ['0.4500', '0.3500', '0.2500', '1.5e-1']);
    assert.deepEqual(read.points.yErrHigh, ['0.0100', '0.0120', '0.0150', '1.8E-2']);
  });

  test('asymmetric errors keep lower and upper apart', () => {
    const read = points(readTable(fixture('asymmetric.csv')), { ...plain, yError: { kind: 'asymmetric', lower: 2, upper: 3 } });
    assert.deepEqual(read.points.yErrLow, ['0.03', '0.02', '0.025']);
    assert.deepEqual(read.points.yErrHigh, ['0.05', '0.04', '0.045']);
  });

  test('exponent notation is kept as written, a leading + dropped, spaces trimmed', () => {
    const read = points(readTable('x,y\n 1.5e-3 , +2.50E+2\n+.5,1.\n'));
    assert.deepEqual(read.points, { x: ['1.5e-3', '.5'], y: ['2.50E+2', '1.'] });
    assert.deepEqual(read.yRange, ['1.', '2.50E+2']);
  });

  test('BOM and CRLF with trailing empty lines', () => {
    const bytes = fixture('bom-crlf.csv');
    assert.deepEqual([...bytes.slice(0, 3)], [0xef, 0xbb, 0xbf]); // precondition: the UTF-8 BOM (Unicode, U+FEFF)
    assert.ok(Buffer.from(bytes).includes('\r\n'));
    const table = readTable(bytes);
    assert.deepEqual(table.columns, ['x', 'y']);
    assert.deepEqual(table.rows, [['1.0e-3', '2.5E+2'], ['2.0e-3', '2.6E+2']]);
    assert.deepEqual(table.lines, [3, 4]);
    assert.deepEqual(readTable(Buffer.from(bytes).toString('utf8')).rows, table.rows); // as text the BOM is U+FEFF, dropped too
  });

  test('header guess: text over numbers is a header, numbers are data, a text column is no reason', () => {
    assert.equal(readTable('x,y\n1,2\n').header, true);
    assert.equal(readTable('1,2\n3,4\n').header, false);
    const withRemarks = readTable('1,2,MC run\n3,4,MC run\n');
    assert.equal(withRemarks.header, false);
    assert.deepEqual(withRemarks.columns, ['column 1', 'column 2', 'column 3']);
    const forced = readTable('x,y\n1,2\n', { header: false });
    assert.deepEqual([forced.rows.length, forced.lines[0]], [2, 1]);
    const error = refusal(() => points(forced));
    assert.deepEqual(
      error.problems.map(({ line, column, reason }) => [line, column, reason]),
      [
        [1, 'column 1', '“x” is not a number'],
        [1, 'column 2', '“y” is not a number'],
      ],
    );
  });

  test('a quoted field may span lines; the next row keeps its file line', () => {
    const table = readTable('x,y,remark\n1,2,"two\nlines"\n3,4,plain\n');
    assert.deepEqual(table.rows[0], ['1', '2', 'two\nlines']);
    assert.deepEqual(table.lines, [2, 4]);
  });
});
