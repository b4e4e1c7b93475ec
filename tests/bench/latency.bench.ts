// Where the end-to-end time of one uncached two-loop exponents cell goes (O(1), d = 3, s = 1.75, 20 digits;
// the digits change per repetition so nothing is cached). Each piece is timed on its own, then the whole
// through a real server on the in-process pool, waiting for "done" the two ways the app does: the live
// event of the notebook, or GET /api/runs/:id every 700 ms. Prints medians; asserts nothing.
// Usage: npx tsx tests/bench/latency.bench.ts [-- --reps 11]
import 'reflect-metadata';
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import { pino } from 'pino';
import { hashPassword } from '../../server/auth/passwords';
import { openDatabase } from '../../server/db/data-source';
import { Cell, Notebook, User } from '../../server/db/entities';
import { newId } from '../../server/ids';
import { createWorkerPoolRunner, type JobRunner } from '../../server/jobs/runner';
import { createRunService } from '../../server/services/runs';
import { runJob } from '../../shared/jobs';
import type { CellInput } from '../../shared/notebook/cells';
import { freePort } from '../../scripts/freePort';

const ROOT = path.resolve(__dirname, '..', '..');
const argument = (name: string, fallback: number) => {
  const index = process.argv.indexOf(`--${name}`);
  return index > 0 ? Number(process.argv[index + 1]) : fallback;
};
const REPS = argument('reps', 11);
const PERSON = { email: 'latency@bench.rungbook.example', password: 'bench-password-1' };
/** The app's run query polls this often (hooks/api/notebooks.ts). */
const APP_POLL_MS = 700;
/** Long enough for the pool's threads to load the engine after the server answers (about 1.5 s each). */
const IDLE_AFTER_BOOT_MS = 5000;

/** The benchmark cell's setup; `digits` tells the repetitions apart, `s` the ways of waiting. */
const setupInput = (digits: number, s: string): CellInput => ({ kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s, loops: 2, digits });
const exponentsJob = (digits: number, s: string) => ({ job: 'exponents', model: { preset: 'on', N: 1 }, loops: 2, digits, d: '3', s });

const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
};
const timed = async <T>(work: () => T | Promise<T>): Promise<{ ms: number; value: T }> => {
  const started = performance.now();
  const value = await work();
  return { ms: performance.now() - started, value };
};
const repeat = async <T>(times: number, work: (index: number) => Promise<T> | T): Promise<T[]> => {
  const values: T[] = [];
  for (let index = 0; index < times; index += 1) values.push(await work(index));
  return values;
};
const digitsOf = (index: number) => 20 + index;

// ---- the engine alone ------------------------------------------------------------------------------------

/** Engine time of each repetition's job in this process, after one unrelated job has warmed the engine up. */
function engineTimes(s: string): number[] {
  runJob(exponentsJob(19, '1.7'));
  return Array.from({ length: REPS }, (_, index) => {
    const started = performance.now();
    runJob(exponentsJob(digitsOf(index), s));
    return performance.now() - started;
  });
}

// ---- a worker thread -------------------------------------------------------------------------------------

/** A bare thread: start-up, then loading the engine modules, then a cold and a warm job (tsx as in the server). */
const PROBE = `
const { parentPort } = require('node:worker_threads');
const started = performance.now();
const { runJob } = require(${JSON.stringify(path.join(ROOT, 'shared', 'jobs', 'index.ts'))});
const loaded = performance.now();
const job = (digits) => ({ job: 'exponents', model: { preset: 'on', N: 1 }, loops: 2, digits, d: '3', s: '1.75' });
runJob(job(20));
const cold = performance.now();
runJob(job(21));
const warm = performance.now();
parentPort.postMessage({ load: loaded - started, cold: cold - loaded, warm: warm - cold });
`;

async function bareThread(dir: string): Promise<{ online: number; load: number; cold: number; warm: number }> {
  // a file, not eval code: tsx compiles files only
  const probe = path.join(dir, 'probe.cjs');
  fs.writeFileSync(probe, PROBE);
  const created = performance.now();
  const worker = new Worker(probe);
  const online = new Promise<number>((resolve) => worker.once('online', () => resolve(performance.now() - created)));
  const report = new Promise<{ load: number; cold: number; warm: number }>((resolve, reject) => {
    worker.once('message', resolve);
    worker.once('error', reject);
  });
  const result = { online: await online, ...(await report) };
  await worker.terminate();
  return result;
}

/** One job through the pool: when the worker said "started", and when the result was back here. */
async function poolRun(runner: JobRunner, job: unknown) {
  const called = performance.now();
  let started = Number.NaN;
  await runner.run(job, { signal: new AbortController().signal, onStarted: () => (started = performance.now()) });
  return { toStarted: started - called, total: performance.now() - called };
}

/** A fresh pool's first job (as after boot), then later jobs on the same pool. */
async function poolTimes(engine: number[]) {
  const created = performance.now();
  const runner = createWorkerPoolRunner({ threads: 1 });
  await runner.ready?.();
  const boot = performance.now() - created;
  try {
    const first = await poolRun(runner, exponentsJob(20, '1.71'));
    const later = await repeat(REPS, async (index) => {
      const { toStarted, total } = await poolRun(runner, exponentsJob(digitsOf(index), '1.75'));
      return { toStarted, overhead: total - engine[index] };
    });
    return { boot, first, toStarted: median(later.map((x) => x.toStarted)), overhead: median(later.map((x) => x.overhead)) };
  } finally {
    await runner.close();
  }
}

// ---- serialisation and the run's database writes ------------------------------------------------------------

function serialisationTimes() {
  const job = exponentsJob(20, '1.75');
  const result = runJob(job);
  const text = JSON.stringify(result);
  const microseconds = (work: () => unknown) => {
    const rounds = 200;
    const started = performance.now();
    for (let i = 0; i < rounds; i += 1) work();
    return ((performance.now() - started) / rounds) * 1000;
  };
  return {
    bytes: text.length,
    cloneJob: microseconds(() => structuredClone(job)),
    cloneResult: microseconds(() => structuredClone(result)),
    stringify: microseconds(() => JSON.stringify(result)),
    parse: microseconds(() => JSON.parse(text)),
  };
}

/** submit → settle through the run service on a SQLite file, with a runner that answers at once: the bookkeeping alone. */
async function databaseTimes(dir: string) {
  const dataSource = await openDatabase(path.join(dir, 'runs.sqlite'));
  const result = runJob(exponentsJob(20, '1.75'));
  const instant: JobRunner = { run: async (_job, hooks) => (hooks.onStarted?.(), result), close: async () => {} };
  const runs = createRunService(dataSource, instant, pino({ level: 'silent' }), { threads: 2, timeLimitMs: 60_000, perUserQueued: 8, perUserRunning: 2, queueWaitLimitMs: 60_000 });
  try {
    return median(await repeat(REPS, async (index) => (await timed(async () => runs.settle((await runs.submit({ job: exponentsJob(digitsOf(index), '1.6'), userId: 'u' })).id, 10_000))).ms));
  } finally {
    await runs.close();
    await dataSource.destroy();
  }
}

// ---- through the API -----------------------------------------------------------------------------------------

interface SeededCell {
  notebookId: string;
  cellId: string;
}

/** One notebook per repetition and way of waiting: a setup cell and the exponents cell that uses it. */
async function seed(databasePath: string, ways: string[]): Promise<Map<string, SeededCell[]>> {
  const dataSource = await openDatabase(databasePath);
  const userId = newId();
  await dataSource.getRepository(User).insert({ id: userId, name: 'Latency Bench (invented)', email: PERSON.email, emailKey: PERSON.email, passwordHash: await hashPassword(PERSON.password), siteRole: 'member', emailVerifiedAt: new Date() });
  const byWay = new Map<string, SeededCell[]>();
  for (const [w, way] of ways.entries()) {
    const cells: SeededCell[] = [];
    for (let index = 0; index < REPS; index += 1) {
      const notebookId = newId();
      const cellId = newId();
      await dataSource.getRepository(Notebook).insert({ id: notebookId, title: `Latency ${way} ${index}`, summary: '', ownerId: userId, groupId: null });
      const rows: [string, CellInput][] = [[newId(), setupInput(digitsOf(index), wayS(w))], [cellId, { kind: 'exponents', uses: 'c0' }]];
      await dataSource.getRepository(Cell).insert(rows.map(([id, input], position) => ({ id, notebookId, position, kind: input.kind, label: `c${position}`, inputJson: JSON.stringify(input), revision: 1 })));
      cells.push({ notebookId, cellId });
    }
    byWay.set(way, cells);
  }
  await dataSource.destroy();
  return byWay;
}
/** Each way of waiting runs its own jobs (its own s), so none is answered from another's cache. */
const wayS = (w: number) => ['1.75', '1.74', '1.76'][w];

async function startServer(databasePath: string): Promise<{ base: string; server: ChildProcess; bootMs: number }> {
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const started = performance.now();
  const server = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
    cwd: ROOT,
    env: { ...process.env, PORT: String(port), PUBLIC_URL: base, DATABASE_PATH: databasePath, SMTP_PORT: '0', LOG_LEVEL: 'warn', SEED_DEMO_DATA: 'false', SIGNIN_LIMIT_PER_IP: '1000' },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  for (let i = 0; i < 600; i += 1) {
    if (await fetch(`${base}/api/health`).then((r) => r.ok).catch(() => false)) break;
    await new Promise((r) => setTimeout(r, 50));
  }
  return { base, server, bootMs: performance.now() - started };
}

/** Resolves at the first "changed" event telling that a run of `cellId` finished (the server's own event: no actor). */
async function runFinishedEvent(url: string, headers: Record<string, string>, cellId: string) {
  const abort = new AbortController();
  const response = await fetch(url, { headers, signal: abort.signal });
  const reader = response.body!.getReader();
  const decoder = new TextDecoder();
  let buffer = '';
  const finished = (async () => {
    for (;;) {
      const { value, done } = await reader.read();
      if (done) throw new Error('the live stream ended');
      buffer += decoder.decode(value, { stream: true });
      for (let end = buffer.indexOf('\n\n'); end >= 0; end = buffer.indexOf('\n\n')) {
        const frame = buffer.slice(0, end);
        buffer = buffer.slice(end + 2);
        const data = frame.split('\n').find((line) => line.startsWith('data: '));
        const event = data ? JSON.parse(data.slice(6)) : null;
        if (event?.type === 'changed' && event.kind === 'cell-run' && event.cellId === cellId && event.actorId === null) return;
      }
    }
  })();
  return { finished, close: () => abort.abort() };
}

interface RunReply {
  id: string;
  status: string;
  durationMs: number | null;
  cached: boolean;
}

const isOpen = (run: RunReply) => run.status === 'queued' || run.status === 'running';

async function apiTimes(base: string, cookie: string, byWay: Map<string, SeededCell[]>, engine: Map<string, number[]>) {
  const headers = { 'Content-Type': 'application/json', Origin: base, cookie };
  const post = async ({ notebookId, cellId }: SeededCell) => (await (await fetch(`${base}/api/notebooks/${notebookId}/cells/${cellId}/run`, { method: 'POST', headers })).json()).run as RunReply;
  const getRun = async (id: string) => (await (await fetch(`${base}/api/runs/${id}`, { headers })).json()).run as RunReply;
  const poll = async (run: RunReply, everyMs: number) => {
    while (isOpen(run)) {
      await new Promise((r) => setTimeout(r, everyMs));
      run = await getRun(run.id);
    }
    return run;
  };
  const ways: Record<string, (cell: SeededCell) => Promise<{ post: number; run: RunReply }>> = {
    live: async (cell) => {
      const live = await runFinishedEvent(`${base}/api/notebooks/${cell.notebookId}/events`, headers, cell.cellId);
      const started = performance.now();
      const run = await post(cell);
      const postMs = performance.now() - started;
      await live.finished;
      live.close();
      // as the app does on the event: refetch the notebook, whose cell shows its last run
      const { notebook } = await (await fetch(`${base}/api/notebooks/${cell.notebookId}`, { headers })).json();
      const shown = notebook.cells.find((c: { id: string }) => c.id === cell.cellId).lastRun as RunReply;
      if (shown.id !== run.id) throw new Error(`the notebook shows run ${shown.id}, not ${run.id}`);
      return { post: postMs, run: shown };
    },
    poll700: async (cell) => {
      const started = performance.now();
      const run = await post(cell);
      return { post: performance.now() - started, run: await poll(run, APP_POLL_MS) };
    },
    poll5: async (cell) => {
      const started = performance.now();
      const run = await post(cell);
      return { post: performance.now() - started, run: await poll(run, 5) };
    },
  };
  const rows: { way: string; endToEnd: number; overhead: number; post: number; serverRun: number }[] = [];
  for (const [way, cells] of byWay) {
    const samples = await repeat(REPS, async (index) => {
      const { ms, value } = await timed(() => ways[way](cells[index]));
      if (value.run.status !== 'done' || value.run.cached) throw new Error(`run ${value.run.id}: ${value.run.status}, cached ${value.run.cached}`);
      return { ms, post: value.post, serverRun: value.run.durationMs ?? Number.NaN, overhead: ms - engine.get(way)![index] };
    });
    rows.push({ way, endToEnd: median(samples.map((x) => x.ms)), overhead: median(samples.map((x) => x.overhead)), post: median(samples.map((x) => x.post)), serverRun: median(samples.map((x) => x.serverRun)) });
  }
  return rows;
}

async function signIn(base: string) {
  const response = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'Content-Type': 'application/json', Origin: base }, body: JSON.stringify(PERSON) });
  return (response.headers.getSetCookie().find((c) => c.startsWith('rungbook_session=')) ?? '').split(';')[0];
}

/**
 * The first uncached run on a fresh server, `idleMs` after it answers its health check: at once is what a
 * fresh deploy sees; after a pause, the pool's threads have started and only the first job's own cost is left.
 */
async function firstRunAfterBoot(dir: string, idleMs: number) {
  const databasePath = path.join(dir, `first-${idleMs}.sqlite`);
  const byWay = await seed(databasePath, ['first']);
  const { base, server } = await startServer(databasePath);
  try {
    const cookie = await signIn(base);
    await new Promise((r) => setTimeout(r, idleMs));
    const headers = { 'Content-Type': 'application/json', Origin: base, cookie };
    const { notebookId, cellId } = byWay.get('first')![0];
    const started = performance.now();
    let run = (await (await fetch(`${base}/api/notebooks/${notebookId}/cells/${cellId}/run`, { method: 'POST', headers })).json()).run as RunReply;
    while (isOpen(run)) {
      await new Promise((r) => setTimeout(r, 5));
      run = (await (await fetch(`${base}/api/runs/${run.id}`, { headers })).json()).run;
    }
    return { ms: performance.now() - started, serverRun: run.durationMs ?? Number.NaN };
  } finally {
    await stopServer(server);
  }
}

async function stopServer(server: ChildProcess) {
  const exited = new Promise((r) => server.once('exit', r));
  server.kill('SIGTERM');
  await exited;
}

const ms = (value: number) => `${value.toFixed(1)} ms`;

async function main() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-latency-'));
  try {
    const engine = new Map(['live', 'poll700', 'poll5'].map((way, w) => [way, engineTimes(wayS(w))]));
    const thread = await bareThread(dir);
    const pool = await poolTimes(engine.get('live')!);
    const serial = serialisationTimes();
    const bookkeeping = await databaseTimes(dir);
    const first = await firstRunAfterBoot(dir, 0);
    const firstAfterPause = await firstRunAfterBoot(dir, IDLE_AFTER_BOOT_MS);

    const databasePath = path.join(dir, 'api.sqlite');
    const byWay = await seed(databasePath, ['live', 'poll700', 'poll5']);
    const { base, server, bootMs } = await startServer(databasePath);
    let api;
    try {
      api = await apiTimes(base, await signIn(base), byWay, engine);
    } finally {
      await stopServer(server);
    }

    const warmEngine = median(engine.get('live')!);
    console.log('');
    console.log(`Uncached two-loop exponents cell, O(1), d = 3, s = 1.75 (1.74, 1.76 for the polling rows), digits 20…${digitsOf(REPS - 1)}: medians of ${REPS} runs.`);
    console.log('');
    console.log('| piece | median |');
    console.log('| --- | --- |');
    console.log(`| engine, runJob in this process (warm) | ${ms(warmEngine)} |`);
    console.log(`| new worker thread: start until online | ${ms(thread.online)} |`);
    console.log(`| new worker thread: loading the engine modules | ${ms(thread.load)} |`);
    console.log(`| new worker thread: first job (cold engine) / next job (warm) | ${ms(thread.cold)} / ${ms(thread.warm)} |`);
    console.log(`| pool: created until ready() (every thread's engine loaded and warm) | ${ms(pool.boot)} |`);
    console.log(`| pool: first job after creation (and after ready() where it exists), until "started" / until the result is back | ${ms(pool.first.toStarted)} / ${ms(pool.first.total)} |`);
    console.log(`| pool, kept alive: job until "started" | ${ms(pool.toStarted)} |`);
    console.log(`| pool, kept alive: job round trip minus engine time | ${ms(pool.overhead)} |`);
    console.log(`| serialisation: clone job / clone result / JSON.stringify / JSON.parse (${serial.bytes} characters) | ${serial.cloneJob.toFixed(0)} / ${serial.cloneResult.toFixed(0)} / ${serial.stringify.toFixed(0)} / ${serial.parse.toFixed(0)} µs |`);
    console.log(`| run bookkeeping in SQLite: submit until settled, instant runner | ${ms(bookkeeping)} |`);
    console.log(`| server boot until health answers | ${ms(bootMs)} |`);
    console.log(`| first run at once after health, end to end (5 ms polling) / server-recorded run | ${ms(first.ms)} / ${ms(first.serverRun)} |`);
    console.log(`| first run ${IDLE_AFTER_BOOT_MS / 1000} s after health, end to end (5 ms polling) / server-recorded run | ${ms(firstAfterPause.ms)} / ${ms(firstAfterPause.serverRun)} |`);
    for (const row of api!) {
      console.log(`| API, ${describeWay(row.way)}: end to end | ${ms(row.endToEnd)} (POST reply ${ms(row.post)}, server-recorded run ${ms(row.serverRun)}) |`);
      console.log(`| API, ${describeWay(row.way)}: end to end minus engine time (target ≤ 50 ms) | ${ms(row.overhead)} |`);
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

const describeWay = (way: string) => ({ live: 'live event of the notebook, then GET the notebook (the app)', poll700: `GET /api/runs/:id every ${APP_POLL_MS} ms (the app's run query)`, poll5: 'GET /api/runs/:id every 5 ms' })[way];

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
