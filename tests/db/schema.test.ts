import 'reflect-metadata';
import assert from 'node:assert/strict';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { after, before, describe, test } from 'node:test';
import type { DataSource, EntityMetadata, Table } from 'typeorm';
import { openDatabase } from '../../server/db/data-source';
import { migrations } from '../../server/db/migrations';
import { freshPostgresDatabase } from './postgres';

/**
 * The migrations, applied to an empty database, must build exactly what the entities describe, on SQLite
 * and on PostgreSQL alike. Two independent checks: TypeORM's schema builder finds nothing to change
 * ("schema in sync with entities"), and the tables read back from the database list the entities'
 * columns with their nullability, and their indices and unique constraints.
 */

/** What a table promises: columns with nullability, and index/unique column sets (unique or not). */
interface Shape {
  columns: string[];
  indices: string[];
}

const columnSet = (columns: string[]) => [...columns].sort().join(',');

function entityShape(metadata: EntityMetadata): Shape {
  const indices = [
    ...metadata.indices.map((index) => `${index.isUnique ? 'unique' : 'index'}(${columnSet(index.columns.map((c) => c.databaseName))})`),
    ...metadata.uniques.map((unique) => `unique(${columnSet(unique.columns.map((c) => c.databaseName))})`),
  ];
  return {
    columns: metadata.columns.map((column) => `${column.databaseName}${column.isNullable ? ' null' : ''}`).sort(),
    indices: indices.sort(),
  };
}

function tableShape(table: Table): Shape {
  const indices = [
    ...table.indices.map((index) => `${index.isUnique ? 'unique' : 'index'}(${columnSet(index.columnNames)})`),
    ...table.uniques.map((unique) => `unique(${columnSet(unique.columnNames)})`),
  ];
  return {
    columns: table.columns.map((column) => `${column.name}${column.isNullable ? ' null' : ''}`).sort(),
    indices: [...new Set(indices)].sort(),
  };
}

async function assertSchemaMatchesEntities(dataSource: DataSource) {
  const applied: { name: string }[] = await dataSource.query('SELECT "name" FROM "migrations"');
  assert.deepEqual(applied.map((row) => row.name).sort(), migrations.map((m) => m.name).sort(), 'every migration applied once');

  const pending = await dataSource.driver.createSchemaBuilder().log();
  assert.deepEqual(pending.upQueries.map((q) => q.query), [], 'TypeORM finds the schema in sync with the entities');

  const runner = dataSource.createQueryRunner();
  try {
    for (const metadata of dataSource.entityMetadatas) {
      const table = await runner.getTable(metadata.tableName);
      assert.ok(table, `table ${metadata.tableName} exists`);
      assert.deepEqual(tableShape(table), entityShape(metadata), `table ${metadata.tableName}`);
    }
  } finally {
    await runner.release();
  }
}

describe('migrations build the entities\' schema', () => {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-schema-'));
  after(() => fs.rmSync(dir, { recursive: true, force: true }));

  describe('on SQLite', () => {
    let dataSource: DataSource;
    before(async () => {
      dataSource = await openDatabase(path.join(dir, 'fresh.sqlite'));
    });
    after(() => dataSource.destroy());

    test('tables, columns, nullability and indices match the entities', () => assertSchemaMatchesEntities(dataSource));
  });

  describe('on PostgreSQL', () => {
    let dataSource: DataSource;
    before(async () => {
      dataSource = await openDatabase(path.join(dir, 'unused.sqlite'), await freshPostgresDatabase());
    });
    after(() => dataSource.destroy());

    test('the database is PostgreSQL', async () => {
      const [{ version }]: { version: string }[] = await dataSource.query('SELECT version() AS version');
      assert.match(version, /^PostgreSQL /);
    });

    test('tables, columns, nullability and indices match the entities', () => assertSchemaMatchesEntities(dataSource));

    test('moments are stored as instants (timestamp with time zone)', async () => {
      const [{ type }]: { type: string }[] = await dataSource.query(
        `SELECT data_type AS type FROM information_schema.columns WHERE table_name = 'sessions' AND column_name = 'expiresAt'`,
      );
      assert.equal(type, 'timestamp with time zone');
    });
  });
});
