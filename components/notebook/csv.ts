/** RFC 4180 CSV, formula-safe (a text cell a spreadsheet would run as a formula gets a leading '): one writer for the whole product. */
export { toCsv } from '../../shared/notebook/csv';
