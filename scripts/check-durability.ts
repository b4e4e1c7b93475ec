// Crash-safety check (npm run check:durability): writers create notebooks and cells through the API in
// a loop, the server is killed with SIGKILL mid-stream, the SQLite file is checked with
// PRAGMA integrity_check, the server restarts on it, and every write the API acknowledged must be there.
// Prints figures; exits non-zero on any lost write or integrity problem.
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { freePort } from './freePort';

const ROOT = path.resolve(__dirname, '..');
const ROUNDS = Number(process.env.DURABILITY_ROUNDS ?? 5);
const WRITERS = Number(process.env.DURABILITY_WRITERS ?? 4);
const DEMO_LEAD = { email: 'lead@demo.rungbook.example', password: 'demo-lead-pass' };

async function startServer(port: number, databasePath: string, webRoot: string): Promise<{ child: ChildProcess; startMs: number }> {
  const started = Date.now();
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
    cwd: ROOT,
    env: { ...process.env, NODE_ENV: 'development', PORT: String(port), PUBLIC_URL: `http://localhost:${port}`, DATABASE_PATH: databasePath, WEB_ROOT: webRoot, SMTP_PORT: '0', MAIL_FAKE: 'true', SEED_DEMO_DATA: 'true', LOG_LEVEL: 'warn' },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  for (const deadline = Date.now() + 60_000; Date.now() < deadline; ) {
    if (child.exitCode !== null) throw new Error(`server exited with code ${child.exitCode}`);
    const healthy = await fetch(`http://127.0.0.1:${port}/api/health`).then((r) => r.ok, () => false);
    if (healthy) return { child, startMs: Date.now() - started };
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  throw new Error('server did not become healthy within 60 s');
}

async function signIn(port: number): Promise<string> {
  const reply = await fetch(`http://127.0.0.1:${port}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: `http://localhost:${port}` },
    body: JSON.stringify(DEMO_LEAD),
  });
  if (!reply.ok) throw new Error(`sign-in failed: ${reply.status} ${await reply.text()}`);
  const cookie = reply.headers.getSetCookie().find((c) => c.startsWith('rungbook_session='));
  if (!cookie) throw new Error('no session cookie');
  return cookie.split(';')[0];
}

interface Acknowledged {
  notebooks: Set<string>;
  cells: Set<string>;
}

/** One writer: a notebook, then cells into it, until the server stops answering. */
async function writer(port: number, cookie: string, acknowledged: Acknowledged, stop: { now: boolean }, counts: { inFlightAtKill: number }) {
  const post = (url: string, body: unknown) =>
    fetch(`http://127.0.0.1:${port}/api${url}`, { method: 'POST', headers: { 'content-type': 'application/json', origin: `http://localhost:${port}`, cookie }, body: JSON.stringify(body) });
  try {
    while (!stop.now) {
      const created = await post('/notebooks', { title: `Durability check ${Date.now()}`, summary: 'invented' });
      if (created.status !== 201) break;
      const notebookId = (await created.json()).notebook.id as string;
      acknowledged.notebooks.add(notebookId);
      for (let i = 0; i < 20 && !stop.now; i += 1) {
        const label = `n${i}`;
        const reply = await post(`/notebooks/${notebookId}/cells`, { label, input: { kind: 'note', text: `Invented note ${i}` } });
        if (reply.status !== 201) break;
        acknowledged.cells.add(`${notebookId}/${label}`);
      }
    }
  } catch {
    if (stop.now) counts.inFlightAtKill += 1; // the connection died with the server: not acknowledged
  }
}

function verify(databasePath: string, acknowledged: Acknowledged) {
  const db = new Database(databasePath);
  try {
    const integrity = (db.pragma('integrity_check') as { integrity_check: string }[]).map((row) => row.integrity_check).join('; ');
    const notebooks = new Set((db.prepare('SELECT id FROM notebooks').all() as { id: string }[]).map((row) => row.id));
    const cells = new Set((db.prepare('SELECT notebookId, label FROM cells').all() as { notebookId: string; label: string }[]).map((row) => `${row.notebookId}/${row.label}`));
    const lostNotebooks = [...acknowledged.notebooks].filter((id) => !notebooks.has(id)).length;
    const lostCells = [...acknowledged.cells].filter((key) => !cells.has(key)).length;
    return { integrity, lostNotebooks, lostCells };
  } finally {
    db.close();
  }
}

async function main() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-durability-'));
  const databasePath = path.join(dir, 'durability.sqlite');
  const webRoot = path.join(dir, 'web');
  fs.mkdirSync(webRoot);
  const acknowledged: Acknowledged = { notebooks: new Set(), cells: new Set() };
  let failures = 0;
  console.log(`durability: ${ROUNDS} rounds, ${WRITERS} concurrent writers, SIGKILL after 1.5–3.5 s of writing`);
  console.log('round | acknowledged notebooks | acknowledged cells | cut mid-request | lost | integrity_check | restart (ms)');
  try {
    for (let round = 1; round <= ROUNDS; round += 1) {
      const port = await freePort();
      const { child, startMs } = await startServer(port, databasePath, webRoot);
      const cookie = await signIn(port);
      const stop = { now: false };
      const counts = { inFlightAtKill: 0 };
      const before = { notebooks: acknowledged.notebooks.size, cells: acknowledged.cells.size };
      const writers = Array.from({ length: WRITERS }, () => writer(port, cookie, acknowledged, stop, counts));
      await new Promise((resolve) => setTimeout(resolve, 1500 + Math.random() * 2000));
      stop.now = true;
      child.kill('SIGKILL');
      await new Promise((resolve) => child.once('exit', resolve));
      await Promise.all(writers);
      const { integrity, lostNotebooks, lostCells } = verify(databasePath, acknowledged);
      const lost = lostNotebooks + lostCells;
      if (lost || integrity !== 'ok') failures += 1;
      console.log(
        `${String(round).padStart(5)} | ${String(acknowledged.notebooks.size - before.notebooks).padStart(22)} | ${String(acknowledged.cells.size - before.cells).padStart(18)} | ${String(counts.inFlightAtKill).padStart(15)} | ${String(lost).padStart(4)} | ${integrity.padEnd(15)} | ${startMs}`,
      );
    }
    const port = await freePort();
    const { child } = await startServer(port, databasePath, webRoot);
    const final = verify(databasePath, acknowledged);
    child.kill('SIGTERM');
    await new Promise((resolve) => child.once('exit', resolve));
    console.log(`total: ${acknowledged.notebooks.size} notebooks and ${acknowledged.cells.size} cells acknowledged; after the last restart ${final.lostNotebooks + final.lostCells} missing, integrity ${final.integrity}`);
    if (final.lostNotebooks + final.lostCells || final.integrity !== 'ok') failures += 1;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
  if (failures) {
    console.error(`durability: FAILED in ${failures} check(s)`);
    process.exit(1);
  }
  console.log('durability: every acknowledged write survived SIGKILL; the database passed integrity_check every time');
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
