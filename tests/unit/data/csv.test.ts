import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import fc from 'fast-check';
import { isPlainNumber, toCsv } from '../../../shared/notebook/csv';
import { readTable } from '../../../shared/notebook/datasetParsing';

// Cells in this file are invented test data.

describe('RFC 4180 (sections 2.1–2.7)', () => {
  test('records end with CRLF, fields are separated by commas, plain fields are not quoted (2.1, 2.4)', () => {
    assert.equal(toCsv(['aaa', 'bbb', 'ccc'], [['zzz', 'yyy', 'xxx']]), 'aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n');
  });

  test('fields with commas, line breaks or quotes are quoted; quotes inside are doubled (2.6, 2.7)', () => {
    // RFC 4180 2.7 example: "aaa","b""bb","ccc" — here only the field that needs it is quoted, which 2.5 allows.
    assert.equal(toCsv(['aaa', 'b"bb', 'ccc'], []), 'aaa,"b""bb",ccc\r\n');
    // RFC 4180 2.6 example: "aaa","b CRLF bb","ccc"
    assert.equal(toCsv(['aaa', 'b\r\nbb', 'ccc'], []), 'aaa,"b\r\nbb",ccc\r\n');
    assert.equal(toCsv(['x'], [['1,5'], ['line\nbreak']]), 'x\r\n"1,5"\r\n"line\nbreak"\r\n');
  });

  test('empty fields stay empty and unquoted', () => {
    assert.equal(toCsv(['a', '', 'c'], [['', '', '']]), 'a,,c\r\n,,\r\n');
  });
});

describe('spreadsheet formula injection (OWASP "CSV Injection": prefix = + - @ TAB CR text cells with \', common practice)', () => {
  test('formula-looking text cells get a leading apostrophe', () => {
    const cases: [string, string][] = [
      ["=cmd|' /C calc'!A0", "'=cmd|' /C calc'!A0"],
      ['@SUM(A1)', "'@SUM(A1)"],
      ['-2+3+cmd|\' /C calc\'!A0', '\'-2+3+cmd|\' /C calc\'!A0'],
      ['+SUM(A1:A3)', "'+SUM(A1:A3)"],
      ['=HYPERLINK("http://example.invalid")', '"\'=HYPERLINK(""http://example.invalid"")"'],
      ['+SUM(1,2)', '"\'+SUM(1,2)"'],
      ['\t=1+1', '"\'\t=1+1"'],
      ['\r=1+1', '"\'\r=1+1"'],
    ];
    for (const [cell, written] of cases) assert.equal(toCsv(['h'], [[cell]]), `h\r\n${written}\r\n`, cell);
  });

  test('header cells are treated the same', () => {
    assert.equal(toCsv(['=x', 'y'], []), "'=x,y\r\n");
  });

  test('numbers are left alone, signs and exponents included', () => {
    for (const number of ['-0.5', '1e-3', '-1.2E+4', '+3', '-.25', '0']) {
      assert.equal(toCsv(['v'], [[number]]), `v\r\n${number}\r\n`, number);
    }
  });

  test('a cell holding ; is quoted, so a spreadsheet splitting on ; cannot start a formula inside it', () => {
    assert.equal(toCsv(['a'], [['x;=1+1']]), 'a\r\n"x;=1+1"\r\n');
  });
});

describe('isPlainNumber', () => {
  test('decimals and exponent notation; not formulas, words, commas or infinities', () => {
    for (const yes of ['0', '-0.5', '+1', '1.', '.5', '1e-3', '2.5E+10', '-7e0']) assert.equal(isPlainNumber(yes), true, yes);
    for (const no of ['', ' 1', '1 ', '1,5', '1e', 'e3', '--1', '1.2.3', 'NaN', 'Infinity', '0x10', '=1', '1_000', '.', '-']) {
      assert.equal(isPlainNumber(no), false, no);
    }
  });

  test('agrees with Number() on what is a finite number, for strings shaped like numbers (fast-check)', () => {
    const numberish = fc.stringMatching(/^[+-]?\d{0,3}(\.\d{0,3})?([eE][+-]?\d{1,2})?$/);
    fc.assert(
      fc.property(numberish, (text) => {
        // Number('') is 0 and Number('.') NaN: only texts with a digit are numbers, in both readings.
        const byNumber = /\d/.test(text.replace(/[eE].*$/, '')) && Number.isFinite(Number(text));
        assert.equal(isPlainNumber(text), byNumber, text);
      }),
    );
  });
});

describe('round trip', () => {
  test('toCsv read back by readTable gives the same cells', () => {
    const header = ['s', 'nu', 'remark, with comma', 'quote "q"', '#tag'];
    const rows = [
      ['1.5', '0.70', 'two\nlines', 'say "hi"', 'x;y'],
      ['-0.5', '1e-3', 'plain', '', 'tab\there'],
    ];
    const table = readTable(toCsv(header, rows));
    assert.deepEqual([table.delimiter, table.header], [',', true]);
    assert.deepEqual(table.columns, header);
    assert.deepEqual(table.rows, rows);
    assert.deepEqual(table.lines, [2, 4]); // the first row's quoted line break puts the second row on line 4
  });

  test('defused formulas read back with their apostrophe, as a spreadsheet would show them', () => {
    const table = readTable(toCsv(['x', 'y', 'remark'], [['1', '2', '=cmd|\' /C calc\'!A0'], ['3', '4', '+SUM(1,2)']]));
    assert.deepEqual(table.rows.map((row) => row[2]), ["'=cmd|' /C calc'!A0", "'+SUM(1,2)"]);
  });

  test('random cells without surrounding spaces survive the trip (fast-check)', () => {
    const cell = fc.string({ unit: fc.constantFrom('a', 'b', '1', '.', ',', ';', '"', '\n', ' ', 'é', 'Δ', '#'), maxLength: 8 }).map((text) => text.trim());
    const safeText = cell.filter((text) => text !== '' && !/^[=+\-@]/.test(text));
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.integer({ min: -50, max: 50 }).map(String), safeText), { minLength: 1, maxLength: 6 }), (pairs) => {
        const rows = pairs.map(([number, text]) => [number, text]);
        const table = readTable(toCsv(['n', 'text'], rows), { header: true });
        assert.deepEqual(table.rows, rows);
      }),
    );
  });
});
