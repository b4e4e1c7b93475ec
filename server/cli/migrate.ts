import 'reflect-metadata';
import { loadConfig } from '../config';
import { openDatabase } from '../db/data-source';

/** Apply pending migrations to DATABASE_URL (or, when unset, the SQLite file DATABASE_PATH) and list what ran. */
async function migrate() {
  const { databasePath, databaseUrl } = loadConfig();
  const dataSource = await openDatabase(databasePath, databaseUrl);
  const applied = await dataSource.query('SELECT name FROM migrations ORDER BY id');
  process.stdout.write(`${databaseUrl ? redactedPassword(databaseUrl) : databasePath}: ${applied.length} migration(s) applied\n`);
  for (const row of applied) process.stdout.write(`  ${row.name}\n`);
  await dataSource.destroy();
}

/** The database address without its password, fit for a terminal or a log. */
function redactedPassword(url: string): string {
  const parsed = new URL(url);
  if (parsed.password) parsed.password = '***';
  return parsed.toString();
}

migrate().catch((error) => {
  process.stderr.write(`Migration failed: ${error instanceof Error ? error.message : String(error)}\n`);
  process.exit(1);
});
