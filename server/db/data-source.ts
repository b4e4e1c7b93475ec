import 'reflect-metadata';
import fs from 'node:fs';
import path from 'node:path';
import { DataSource } from 'typeorm';
import { entities } from './entities';
import { migrations } from './migrations';

/** The SQLite database: WAL journal, foreign keys on, schema owned by migrations only. */
export function createDataSource(databasePath: string): DataSource {
  if (databasePath !== ':memory:') fs.mkdirSync(path.dirname(path.resolve(databasePath)), { recursive: true });
  return new DataSource({
    type: 'better-sqlite3',
    database: databasePath,
    entities,
    migrations,
    migrationsRun: false,
    synchronize: false,
    enableWAL: true,
    prepareDatabase: (db: { pragma: (sql: string) => unknown }) => {
      db.pragma('foreign_keys = ON');
      db.pragma('busy_timeout = 5000');
    },
  });
}

export async function openDatabase(databasePath: string): Promise<DataSource> {
  const dataSource = createDataSource(databasePath);
  await dataSource.initialize();
  await dataSource.runMigrations({ transaction: 'each' });
  return dataSource;
}
