// API benchmark: a real server on a temporary database with 200 notebooks × 20 cells, 50 concurrent
// readers for 20 s (autocannon), then one cached and one uncached cell run timed end to end.
// Prints figures; asserts nothing. Usage: npm run bench:api [-- --seconds 20 --clients 50]
import 'reflect-metadata';
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import autocannon from 'autocannon';
import { hashPassword } from '../../server/auth/passwords';
import { openDatabase } from '../../server/db/data-source';
import { Cell, Notebook, User } from '../../server/db/entities';
import { newId } from '../../server/ids';
import { runJob } from '../../shared/jobs';
import type { CellInput } from '../../shared/notebook/cells';
import { jobForCell, type SetupInput } from '../../shared/notebook/jobs';
import { freePort } from '../../scripts/freePort';

const ROOT = path.resolve(__dirname, '..', '..');
const argument = (name: string, fallback: number) => {
  const index = process.argv.indexOf(`--${name}`);
  return index > 0 ? Number(process.argv[index + 1]) : fallback;
};
const SECONDS = argument('seconds', 20);
const CLIENTS = argument('clients', 50);
const NOTEBOOKS = 200;
const CELLS = 20;
const PERSON = { email: 'bench@bench.rungbook.example', password: 'bench-password-1' };

function cellInputFor(index: number): CellInput {
  if (index === 0) return { kind: 'setup', model: { preset: 'on', N: 3 }, d: '3', s: '1.75', loops: 2, digits: 20 };
  if (index % 4 === 1) return { kind: 'note', text: `Invented benchmark note ${index}: $\\varepsilon = 2s - d$.` };
  if (index % 4 === 2) return { kind: 'integral', uses: 'c0', form: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1 };
  return { kind: 'exponents', uses: 'c0' };
}

/**
 * The uncached cell's engine time in this process on a warm engine (after a different job): what the run
 * would cost with nothing around it.
 */
function engineTimeOfUncachedCell(): number {
  const job = jobForCell(cellInputFor(3), new Map([['c0', cellInputFor(0) as SetupInput]]))!;
  runJob({ ...job, s: '1.7', digits: 16 });
  const started = performance.now();
  runJob(job);
  return performance.now() - started;
}

async function seed(databasePath: string): Promise<string[]> {
  const dataSource = await openDatabase(databasePath);
  const userId = newId();
  await dataSource.getRepository(User).insert({ id: userId, name: 'Bench Person (invented)', email: PERSON.email, emailKey: PERSON.email, passwordHash: await hashPassword(PERSON.password), siteRole: 'member', emailVerifiedAt: new Date() });
  const ids: string[] = [];
  await dataSource.transaction(async (manager) => {
    for (let n = 0; n < NOTEBOOKS; n += 1) {
      const notebookId = newId();
      ids.push(notebookId);
      await manager.insert(Notebook, { id: notebookId, title: `Invented benchmark notebook ${n}`, summary: '', ownerId: userId, groupId: null });
      const rows = Array.from({ length: CELLS }, (_, c) => {
        const input = cellInputFor(c);
        return { id: newId(), notebookId, position: c, kind: input.kind, label: `c${c}`, inputJson: JSON.stringify(input), revision: 1 };
      });
      await manager.insert(Cell, rows);
    }
  });
  await dataSource.destroy();
  return ids;
}

async function main() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-bench-'));
  const databasePath = path.join(dir, 'bench.sqlite');
  const seedStart = Date.now();
  const notebookIds = await seed(databasePath);
  console.log(`seeded ${NOTEBOOKS} notebooks × ${CELLS} cells in ${Date.now() - seedStart} ms`);

  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const server = spawn(process.execPath, [...(process.env.BENCH_CPU_PROF ? ['--cpu-prof', '--cpu-prof-dir', process.env.BENCH_CPU_PROF] : []), '--import', 'tsx', 'server/main.ts'], {
    cwd: ROOT,
    env: { ...process.env, PORT: String(port), PUBLIC_URL: base, DATABASE_PATH: databasePath, SMTP_PORT: '0', LOG_LEVEL: 'warn', SEED_DEMO_DATA: 'false', SIGNIN_LIMIT_PER_IP: '1000' },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  try {
    for (let i = 0; i < 240; i += 1) {
      if (await fetch(`${base}/api/health`).then((r) => r.ok).catch(() => false)) break;
      await new Promise((r) => setTimeout(r, 250));
    }
    const signIn = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'Content-Type': 'application/json', Origin: base }, body: JSON.stringify(PERSON) });
    const cookie = (signIn.headers.getSetCookie().find((c) => c.startsWith('rungbook_session=')) ?? '').split(';')[0];

    let next = 0;
    // Warm-up (JIT, first reads of every notebook, worker boot) is not part of the measurement.
    await autocannon({
      url: base,
      connections: CLIENTS,
      duration: 3,
      headers: { cookie },
      requests: [{ method: 'GET', setupRequest: (request) => ({ ...request, path: `/api/notebooks/${notebookIds[next++ % notebookIds.length]}` }) }],
    });
    const result = await autocannon({
      url: base,
      connections: CLIENTS,
      duration: SECONDS,
      headers: { cookie },
      requests: [{ method: 'GET', setupRequest: (request) => ({ ...request, path: `/api/notebooks/${notebookIds[next++ % notebookIds.length]}` }) }],
    });

    const headers = { 'Content-Type': 'application/json', Origin: base, cookie };
    const detail = await (await fetch(`${base}/api/notebooks/${notebookIds[0]}`, { headers })).json();
    const timeRun = async (cellLabel: string) => {
      const cell = detail.notebook.cells.find((c: { label: string }) => c.label === cellLabel);
      const started = performance.now();
      let run = (await (await fetch(`${base}/api/notebooks/${notebookIds[0]}/cells/${cell.id}/run`, { method: 'POST', headers })).json()).run;
      while (run.status === 'queued' || run.status === 'running') {
        await new Promise((r) => setTimeout(r, 5));
        run = (await (await fetch(`${base}/api/runs/${run.id}`, { headers })).json()).run;
      }
      return { ms: performance.now() - started, run };
    };
    const uncached = await timeRun('c3');
    const cached = await timeRun('c7');
    const engineMs = engineTimeOfUncachedCell();

    console.log('');
    console.log(`| measure | value |`);
    console.log(`| --- | --- |`);
    console.log(`| GET /api/notebooks/:id, ${CLIENTS} clients, ${SECONDS} s | ${result.requests.average.toFixed(0)} req/s (${result.requests.total} requests, ${result.non2xx} non-2xx, ${result.errors} errors) |`);
    console.log(`| latency p50 / p99 / max | ${result.latency.p50} ms / ${result.latency.p99} ms / ${result.latency.max} ms (target p99 < 50 ms) |`);
    console.log(`| uncached two-loop exponents cell, end to end | ${uncached.ms.toFixed(0)} ms (status ${uncached.run.status}${uncached.run.error ? `: ${uncached.run.error.message}` : ''}) |`);
    console.log(`| its engine time alone (runJob in the bench process, warm) / end to end minus engine time | ${engineMs.toFixed(0)} ms / ${(uncached.ms - engineMs).toFixed(0)} ms (target ≤ 50 ms; per-piece figures: tests/bench/latency.bench.ts) |`);
    console.log(`| cached run of an identical cell | ${cached.ms.toFixed(1)} ms (cached: ${cached.run.cached}) |`);
    console.log(`| bench process memory (RSS) | ${(process.memoryUsage().rss / 2 ** 20).toFixed(0)} MiB |`);
  } finally {
    server.kill('SIGTERM');
    await new Promise((r) => server.once('exit', r));
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
