import 'reflect-metadata';
import { loadConfig } from '../config';
import { openDatabase } from '../db/data-source';

/** Apply pending migrations to DATABASE_PATH and list what ran. */
async function migrate() {
  const { databasePath } = loadConfig();
  const dataSource = await openDatabase(databasePath);
  const applied = await dataSource.query('SELECT name FROM migrations ORDER BY id');
  process.stdout.write(`${databasePath}: ${applied.length} migration(s) applied\n`);
  for (const row of applied) process.stdout.write(`  ${row.name}\n`);
  await dataSource.destroy();
}

migrate().catch((error) => {
  process.stderr.write(`Migration failed: ${error instanceof Error ? error.message : String(error)}\n`);
  process.exit(1);
});
