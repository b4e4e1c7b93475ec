import type { DataSource, EntityManager, QueryRunner } from 'typeorm';

/**
 * Hand-written SQL that runs on both databases. Write it with `?` placeholders, every identifier in
 * double quotes ("notebookId": PostgreSQL folds unquoted names to lower case), TRUE/FALSE for booleans,
 * and read results through the converters below (PostgreSQL returns counts as text, moments as Dates).
 */
export type Dialect = 'sqlite' | 'postgres';

type Connected = DataSource | EntityManager | QueryRunner;

function dataSourceOf(on: Connected): DataSource {
  return 'connection' in on ? on.connection : on;
}

export function dialectOf(on: Connected): Dialect {
  return dataSourceOf(on).options.type === 'postgres' ? 'postgres' : 'sqlite';
}

/** `?` placeholders as PostgreSQL's `$1, $2, …`; SQL text unchanged for SQLite. No `?` may appear in literals. */
export function placeholdersFor(dialect: Dialect, sql: string): string {
  if (dialect === 'sqlite') return sql;
  let n = 0;
  return sql.replace(/\?/g, () => `$${++n}`);
}

/** Runs hand-written SQL (see above) on either database. */
export function runSql<T = unknown>(on: Connected, sql: string, params: unknown[] = []): Promise<T> {
  return on.query(placeholdersFor(dialectOf(on), sql), params);
}

/** The values of `expression` over a group, comma-separated (SQLite group_concat, PostgreSQL string_agg). */
export function commaList(dialect: Dialect, expression: string): string {
  return dialect === 'postgres' ? `string_agg(${expression}, ',')` : `group_concat(${expression})`;
}

/** A moment as read by raw SQL: SQLite datetime text in UTC (as TypeORM and datetime('now') write it), or a PostgreSQL Date. */
export function momentFrom(value: string | Date): Date {
  if (value instanceof Date) return value;
  return new Date(`${value.replace(' ', 'T')}${value.endsWith('Z') ? '' : 'Z'}`);
}

/** A moment as a query parameter compared with stored ones: SQLite compares datetime text, PostgreSQL timestamps. */
export function momentParameter(dialect: Dialect, date: Date): string | Date {
  return dialect === 'postgres' ? date : date.toISOString().replace('T', ' ').replace('Z', '');
}

/** A write refused by a unique index or constraint: SQLite's message, or PostgreSQL's SQLSTATE 23505 (unique_violation). */
export function isUniqueViolation(error: unknown): boolean {
  const code = (error as { driverError?: { code?: unknown } } | null)?.driverError?.code;
  return code === '23505' || String(error).includes('UNIQUE');
}

/**
 * A tiebreak for rows with equal timestamps, in insertion order: SQLite's rowid. PostgreSQL has no row
 * number; its timestamps are exact to the microsecond, so only rows written by one transaction tie, and
 * their physical position (ctid) follows the order they were written in.
 */
export function insertionOrder(dialect: Dialect, alias: string): string {
  return `${alias}.${dialect === 'postgres' ? 'ctid' : 'rowid'}`;
}

/** COUNT(*) and SUM as a number (PostgreSQL's bigint arrives as text). */
export function countFrom(value: string | number | null | undefined): number {
  return Number(value ?? 0);
}
