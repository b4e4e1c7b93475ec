import type { QueryRunner } from 'typeorm';
import { dialectOf, placeholdersFor } from '../sql';

/**
 * The migrations are written in SQLite's words, as they first ran on SQLite (the schema they build there
 * must not change: existing databases were built by them). On PostgreSQL these idioms are translated:
 *   datetime (type)                    → timestamp with time zone (an instant, as the entities map it)
 *   datetime('now')                    → now()
 *   integer PRIMARY KEY AUTOINCREMENT  → SERIAL PRIMARY KEY
 *   boolean … DEFAULT (0) / (1)        → DEFAULT false / true
 *   DEFAULT (literal)                  → DEFAULT literal
 *   ? placeholders                     → $1, $2, …
 */
export function postgresFromSqlite(sql: string): string {
  return placeholdersFor('postgres', sql)
    .replace(/\(datetime\('now'\)\)/g, 'now()')
    .replace(/datetime\('now'\)/g, 'now()')
    .replace(/\bdatetime\b/g, 'timestamp with time zone')
    .replace(/\binteger PRIMARY KEY AUTOINCREMENT\b/g, 'SERIAL PRIMARY KEY')
    .replace(/(\bboolean NOT NULL DEFAULT )\(([01])\)/g, (_, head: string, bit: string) => `${head}${bit === '1' ? 'true' : 'false'}`)
    .replace(/DEFAULT \(('[^']*'|-?\d+(?:\.\d+)?)\)/g, 'DEFAULT $1');
}

/** Runs one migration statement on whichever database the migration is applied to. */
export function migrate<T = unknown>(queryRunner: QueryRunner, sqliteSql: string, params?: unknown[]): Promise<T> {
  return queryRunner.query(dialectOf(queryRunner) === 'postgres' ? postgresFromSqlite(sqliteSql) : sqliteSql, params);
}
