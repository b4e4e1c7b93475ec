// npm run bench:scale — the same 40 scan jobs on the in-process pool and on the shared queue with 1 and 2
// worker processes: throughput and p50/p99 latency from hand-off to result; then the notebook-read API
// (50 clients) on SQLite and on PostgreSQL: requests/s and p99. Needs Debian's redis-server and postgresql.
// Usage: npm run bench:scale [-- --seconds 10 --clients 50]
import 'reflect-metadata';
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import autocannon from 'autocannon';
import { pino } from 'pino';
import { freePort } from '../../scripts/freePort';
import { startPostgres } from '../../scripts/services/postgres';
import { startRedis } from '../../scripts/services/redis';
import { hashPassword } from '../../server/auth/passwords';
import { openDatabase } from '../../server/db/data-source';
import { Cell, Notebook, User } from '../../server/db/entities';
import { newId } from '../../server/ids';
import type { CellInput } from '../../shared/notebook/cells';
import { createQueueRunner } from '../../server/jobs/queueRunner';
import { createWorkerPoolRunner, type JobRunner } from '../../server/jobs/runner';
import { startWorkerProcess, type WorkerProcess } from '../queue/processes';

const ROOT = path.resolve(__dirname, '..', '..');
const argument = (name: string, fallback: number) => {
  const index = process.argv.indexOf(`--${name}`);
  return index > 0 ? Number(process.argv[index + 1]) : fallback;
};
const READ_SECONDS = argument('seconds', 10);
const READ_CLIENTS = argument('clients', 50);

const JOBS = 40;
/** Threads per side: the pool's threads, each worker process's concurrency. */
const THREADS = 1;
// O(1) model in d = 3, 40 points each at 20 digits: tens to hundreds of milliseconds of engine time.
const scanJob = (n: number) => ({ job: 'scan', model: { preset: 'on', N: 1 }, d: '3', s: { from: '1.55', to: (1.8 + n / 1000).toFixed(3), points: 40 }, quantities: ['nuInv'], loops: 2, digits: 20 });

interface Row {
  setup: string;
  jobsPerSecond: number;
  p50: number;
  p99: number;
}

const quantile = (sorted: number[], q: number) => sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)];

/** All jobs handed over at once; at most `parallel` run at a time, as the run service's fair queue would allow. */
async function measure(setup: string, runner: JobRunner, parallel: number): Promise<Row> {
  const latencies: number[] = [];
  let next = 0;
  const began = performance.now();
  const lane = async () => {
    for (let n = next++; n < JOBS; n = next++) {
      const handedOver = performance.now();
      await runner.run(scanJob(n), { signal: new AbortController().signal });
      latencies.push(performance.now() - handedOver);
    }
  };
  await Promise.all(Array.from({ length: parallel }, lane));
  const seconds = (performance.now() - began) / 1000;
  latencies.sort((a, b) => a - b);
  return { setup, jobsPerSecond: JOBS / seconds, p50: quantile(latencies, 0.5), p99: quantile(latencies, 0.99) };
}

async function main() {
  const rows = await jobRows();
  const reads = [await notebookReads('SQLite file')];
  const postgres = await startPostgres();
  try {
    reads.push(await notebookReads('PostgreSQL', postgres.url));
  } finally {
    await postgres.stop();
  }
  printTable(rows);
  printReadTable(reads);
}

async function jobRows(): Promise<Row[]> {
  const rows: Row[] = [];
  const pool = createWorkerPoolRunner({ threads: THREADS });
  await measure('warm-up', pool, THREADS);
  rows.push(await measure(`in-process pool, ${THREADS} thread`, pool, THREADS));
  await pool.close();
  const widerPool = createWorkerPoolRunner({ threads: 2 * THREADS });
  await measure('warm-up', widerPool, 2 * THREADS);
  rows.push(await measure(`in-process pool, ${2 * THREADS} threads`, widerPool, 2 * THREADS));
  await widerPool.close();

  const redis = await startRedis();
  const logger = pino({ level: 'silent' });
  const runner = await createQueueRunner({ url: redis.url, timeLimitMs: 120_000, queueWaitLimitMs: 600_000, logger });
  const workers: WorkerProcess[] = [];
  try {
    for (const count of [1, 2]) {
      while (workers.length < count) workers.push(await startWorkerProcess(redis.url, { JOB_WORKER_CONCURRENCY: String(THREADS) }));
      await measure('warm-up', runner, count * THREADS);
      rows.push(await measure(`queue, ${count} worker process${count > 1 ? 'es' : ''}`, runner, count * THREADS));
    }
  } finally {
    await runner.close();
    for (const worker of workers) await worker.stop();
    await redis.stop();
  }
  return rows;
}

// ---- notebook reads: 200 notebooks × 20 cells, as in npm run bench:api ----

const NOTEBOOKS = 200;
const CELLS = 20;
const PERSON = { email: 'bench@bench.rungbook.example', password: 'bench-password-1' };

interface ReadRow {
  database: string;
  requestsPerSecond: number;
  p50: number;
  p99: number;
  failures: number;
}

function cellInputFor(index: number): CellInput {
  if (index === 0) return { kind: 'setup', model: { preset: 'on', N: 3 }, d: '3', s: '1.75', loops: 2, digits: 20 };
  if (index % 4 === 1) return { kind: 'note', text: `Invented benchmark note ${index}: $\\varepsilon = 2s - d$.` };
  if (index % 4 === 2) return { kind: 'integral', uses: 'c0', form: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1 };
  return { kind: 'exponents', uses: 'c0' };
}

/** A fresh database (SQLite file, or a new database on the PostgreSQL cluster) with the benchmark notebooks. */
async function seedNotebooks(databasePath: string, clusterUrl?: string): Promise<{ notebookIds: string[]; databaseUrl?: string }> {
  const databaseUrl = clusterUrl ? await createDatabase(clusterUrl, 'rungbook_bench') : undefined;
  const dataSource = await openDatabase(databasePath, databaseUrl);
  const userId = newId();
  await dataSource.getRepository(User).insert({ id: userId, name: 'Bench Person (invented)', email: PERSON.email, emailKey: PERSON.email, passwordHash: await hashPassword(PERSON.password), siteRole: 'member', emailVerifiedAt: new Date() });
  const notebookIds: string[] = [];
  await dataSource.transaction(async (manager) => {
    for (let n = 0; n < NOTEBOOKS; n += 1) {
      const notebookId = newId();
      notebookIds.push(notebookId);
      await manager.insert(Notebook, { id: notebookId, title: `Invented benchmark notebook ${n}`, summary: '', ownerId: userId, groupId: null });
      const cells = Array.from({ length: CELLS }, (_, c) => {
        const input = cellInputFor(c);
        return { id: newId(), notebookId, position: c, kind: input.kind, label: `c${c}`, inputJson: JSON.stringify(input), revision: 1 };
      });
      await manager.insert(Cell, cells);
    }
  });
  await dataSource.destroy();
  return { notebookIds, databaseUrl };
}

async function createDatabase(clusterUrl: string, name: string): Promise<string> {
  const { default: pg } = await import('pg');
  const admin = new pg.Client({ connectionString: clusterUrl });
  await admin.connect();
  try {
    await admin.query(`CREATE DATABASE "${name}"`);
  } finally {
    await admin.end();
  }
  const url = new URL(clusterUrl);
  url.pathname = `/${name}`;
  return url.toString();
}

/** `npm run serve` on the seeded database, read by READ_CLIENTS clients for READ_SECONDS after a 3 s warm-up. */
async function notebookReads(database: string, clusterUrl?: string): Promise<ReadRow> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-bench-scale-'));
  const databasePath = path.join(dir, 'bench.sqlite');
  const { notebookIds, databaseUrl } = await seedNotebooks(databasePath, clusterUrl);
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const server = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
    cwd: ROOT,
    env: { ...process.env, PORT: String(port), PUBLIC_URL: base, DATABASE_PATH: databasePath, ...(databaseUrl ? { DATABASE_URL: databaseUrl } : {}), SMTP_PORT: '0', LOG_LEVEL: 'warn', SEED_DEMO_DATA: 'false', SIGNIN_LIMIT_PER_IP: '1000' },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  try {
    await untilHealthy(base);
    const signIn = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'Content-Type': 'application/json', Origin: base }, body: JSON.stringify(PERSON) });
    const cookie = (signIn.headers.getSetCookie().find((c) => c.startsWith('rungbook_session=')) ?? '').split(';')[0];
    let next = 0;
    const readAll = (duration: number) => autocannon({
      url: base,
      connections: READ_CLIENTS,
      duration,
      headers: { cookie },
      requests: [{ method: 'GET', setupRequest: (request) => ({ ...request, path: `/api/notebooks/${notebookIds[next++ % notebookIds.length]}` }) }],
    });
    // warm-up (JIT, first read of every notebook) is not part of the measurement
    await readAll(3);
    const result = await readAll(READ_SECONDS);
    return { database, requestsPerSecond: result.requests.average, p50: result.latency.p50, p99: result.latency.p99, failures: result.non2xx + result.errors };
  } finally {
    server.kill('SIGTERM');
    await new Promise((resolve) => server.once('exit', resolve));
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

async function untilHealthy(base: string) {
  for (let attempt = 0; attempt < 240; attempt += 1) {
    if (await fetch(`${base}/api/health`).then((reply) => reply.ok).catch(() => false)) return;
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error(`the server at ${base} did not become healthy`);
}

function printReadTable(rows: ReadRow[]) {
  const lines = [
    '',
    `GET /api/notebooks/:id (${NOTEBOOKS} notebooks × ${CELLS} cells), ${READ_CLIENTS} clients for ${READ_SECONDS} s, load generator beside the server`,
    '| database | requests/s | p50 (ms) | p99 (ms) | non-2xx + errors |',
    '|---|---:|---:|---:|---:|',
    ...rows.map((row) => `| ${row.database} | ${row.requestsPerSecond.toFixed(0)} | ${row.p50} | ${row.p99} | ${row.failures} |`),
  ];
  process.stdout.write(lines.join('\n') + '\n');
}

function printTable(rows: Row[]) {
  const lines = [
    `${JOBS} scan jobs (O(1), d = 3, 40 points, 20 digits), ${THREADS} engine thread per worker process`,
    '| setup | jobs/s | p50 latency (ms) | p99 latency (ms) |',
    '|---|---:|---:|---:|',
    ...rows.map((row) => `| ${row.setup} | ${row.jobsPerSecond.toFixed(2)} | ${row.p50.toFixed(0)} | ${row.p99.toFixed(0)} |`),
  ];
  process.stdout.write(lines.join('\n') + '\n');
}

main().catch((error) => {
  process.stderr.write(`${error instanceof Error ? error.stack : String(error)}\n`);
  process.exit(1);
});
