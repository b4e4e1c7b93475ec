import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { postgresFromSqlite } from '../../server/db/migrations/portable';
import { countFrom, isUniqueViolation, momentFrom, momentParameter, placeholdersFor } from '../../server/db/sql';

// Expected texts are written by hand from the PostgreSQL 15 manual (CREATE TABLE, datatype-datetime,
// datatype-numeric "serial types") and the SQLite manual (lang_createtable, datatype3).
describe('hand-written SQL on both databases', () => {
  test('? placeholders are numbered for PostgreSQL and left alone for SQLite', () => {
    const sql = 'UPDATE "users" SET "email" = ?, "emailKey" = ? WHERE "id" = ?';
    assert.equal(placeholdersFor('postgres', sql), 'UPDATE "users" SET "email" = $1, "emailKey" = $2 WHERE "id" = $3');
    assert.equal(placeholdersFor('sqlite', sql), sql);
  });

  test('a migration statement in SQLite words becomes its PostgreSQL equivalent', () => {
    const sqlite =
      `CREATE TABLE "t" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "role" varchar(10) NOT NULL DEFAULT ('member'), "note" text NOT NULL DEFAULT (''), ` +
      `"progress" real NOT NULL DEFAULT (0), "revision" integer NOT NULL DEFAULT (1), "cached" boolean NOT NULL DEFAULT (0), "shown" boolean NOT NULL DEFAULT (1), ` +
      `"createdAt" datetime NOT NULL DEFAULT (datetime('now')), "usedAt" datetime)`;
    const postgres =
      `CREATE TABLE "t" ("id" SERIAL PRIMARY KEY NOT NULL, "role" varchar(10) NOT NULL DEFAULT 'member', "note" text NOT NULL DEFAULT '', ` +
      `"progress" real NOT NULL DEFAULT 0, "revision" integer NOT NULL DEFAULT 1, "cached" boolean NOT NULL DEFAULT false, "shown" boolean NOT NULL DEFAULT true, ` +
      `"createdAt" timestamp with time zone NOT NULL DEFAULT now(), "usedAt" timestamp with time zone)`;
    assert.equal(postgresFromSqlite(sqlite), postgres);
    assert.equal(postgresFromSqlite(`UPDATE "users" SET "emailVerifiedAt" = datetime('now') WHERE "id" = ?`), `UPDATE "users" SET "emailVerifiedAt" = now() WHERE "id" = $1`);
  });

  test('moments read back from either database are the same instant', () => {
    // SQLite keeps UTC text as TypeORM writes it; PostgreSQL's driver hands over a Date
    const instant = new Date(Date.UTC(2026, 0, 2, 3, 4, 5, 678));
    assert.equal(momentFrom('2026-01-02 03:04:05.678').toISOString(), instant.toISOString());
    assert.equal(momentFrom('2026-01-02 03:04:05').toISOString(), '2026-01-02T03:04:05.000Z');
    assert.equal(momentFrom(instant), instant);
    assert.equal(momentParameter('sqlite', instant), '2026-01-02 03:04:05.678');
    assert.equal(momentParameter('postgres', instant), instant);
  });

  test('counts arrive as numbers whichever way the driver sends them', () => {
    // PostgreSQL's COUNT(*) is bigint, which node-postgres hands over as text
    assert.equal(countFrom('12'), 12);
    assert.equal(countFrom(12), 12);
    assert.equal(countFrom(null), 0);
  });

  test('unique violations are recognised from both drivers', () => {
    // SQLite: "UNIQUE constraint failed: table.column"; PostgreSQL: SQLSTATE 23505 unique_violation (PostgreSQL 15 manual, appendix A)
    assert.ok(isUniqueViolation(new Error('SqliteError: UNIQUE constraint failed: users.emailKey')));
    assert.ok(isUniqueViolation(Object.assign(new Error('duplicate key value violates unique constraint "UQ_x"'), { driverError: { code: '23505' } })));
    assert.ok(!isUniqueViolation(Object.assign(new Error('null value in column "name"'), { driverError: { code: '23502' } })));
  });
});
