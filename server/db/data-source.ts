import 'reflect-metadata';
import fs from 'node:fs';
import path from 'node:path';
import { DataSource } from 'typeorm';
import { entities } from './entities';
import { migrations } from './migrations';

/**
 * The database: a PostgreSQL server when `databaseUrl` (DATABASE_URL=postgres://…) is given, otherwise the
 * SQLite file at `databasePath`. Same entities and migrations on both; schema owned by migrations only.
 */
export function createDataSource(databasePath: string, databaseUrl?: string): DataSource {
  return databaseUrl ? createPostgresDataSource(databaseUrl) : createSqliteDataSource(databasePath);
}

/** WAL journal, foreign keys on. */
function createSqliteDataSource(databasePath: string): DataSource {
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

function createPostgresDataSource(url: string): DataSource {
  const dataSource = new DataSource({ type: 'postgres', url, entities, migrations, migrationsRun: false, synchronize: false });
  storeDatetimeAsTimestamptz(dataSource);
  return dataSource;
}

/**
 * The entities declare moments as `datetime` (SQLite's name; PostgreSQL has no such type). On PostgreSQL
 * that type is `timestamp with time zone`, which the migrations create: an instant, whatever the
 * server's or the session's time zone. TypeORM's PostgreSQL driver already reads and writes `datetime`
 * columns as Dates; only the type name it compares and creates needs mapping.
 */
function storeDatetimeAsTimestamptz(dataSource: DataSource): void {
  const driver = dataSource.driver;
  const normalizeType = driver.normalizeType.bind(driver);
  driver.normalizeType = (column) => (column.type === 'datetime' ? 'timestamp with time zone' : normalizeType(column));
}

export async function openDatabase(databasePath: string, databaseUrl?: string): Promise<DataSource> {
  const dataSource = createDataSource(databasePath, databaseUrl);
  await dataSource.initialize();
  await dataSource.runMigrations({ transaction: 'each' });
  return dataSource;
}
