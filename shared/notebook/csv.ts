/**
 * Writing tables as CSV (RFC 4180) that are safe to open in a spreadsheet: a text cell a spreadsheet
 * would take for a formula gets a leading apostrophe, numbers stay as they are.
 */

const PLAIN_NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** A decimal number as a person writes it: optional sign, digits with at most one point, optional exponent. */
export function isPlainNumber(text: string): boolean {
  return PLAIN_NUMBER.test(text);
}

/** First characters that make a spreadsheet read a cell as a formula (or a formula's continuation). */
const FORMULA_START = new Set(['=', '+', '-', '@', '\t', '\r']);

/** Quoted: RFC 4180's comma, quote and line breaks; also ; and tab (other separators spreadsheets use) and a leading # (a comment line when read back). */
const NEEDS_QUOTES = /[",;\t\r\n]|^#/;

function defuseFormula(cell: string): string {
  return cell.length > 0 && FORMULA_START.has(cell[0]) && !isPlainNumber(cell) ? `'${cell}` : cell;
}

function csvField(cell: string): string {
  const safe = defuseFormula(cell);
  return NEEDS_QUOTES.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** RFC 4180 CSV; a text cell that starts with = + - @ TAB or CR and is not a plain number gets a leading ' (spreadsheet formula injection). */
export function toCsv(header: string[], rows: string[][]): string {
  return [header, ...rows].map((row) => row.map(csvField).join(',') + '\r\n').join('');
}
