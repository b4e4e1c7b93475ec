import pg from 'pg';
import { startPostgres, type RunningPostgres } from '../../scripts/services/postgres';

/** One throwaway PostgreSQL cluster per test process, started on first use and stopped when the process exits. */
let cluster: Promise<RunningPostgres> | undefined;
let databasesMade = 0;

function sharedCluster(): Promise<RunningPostgres> {
  if (!cluster) {
    cluster = startPostgres();
    cluster.then((running) => process.once('exit', () => running.stopNow())).catch(() => undefined);
  }
  return cluster;
}

/** The URL of a new, empty database on this process's cluster. */
export async function freshPostgresDatabase(): Promise<string> {
  const { url } = await sharedCluster();
  databasesMade += 1;
  const name = `rungbook_test_${process.pid}_${databasesMade}`;
  const admin = new pg.Client({ connectionString: url });
  await admin.connect();
  try {
    await admin.query(`CREATE DATABASE "${name}"`);
  } finally {
    await admin.end();
  }
  const database = new URL(url);
  database.pathname = `/${name}`;
  return database.toString();
}

/** RUNGBOOK_TEST_DATABASE=postgres: the API tests run on PostgreSQL instead of SQLite files. */
export function testsUsePostgres(): boolean {
  return process.env.RUNGBOOK_TEST_DATABASE === 'postgres';
}
