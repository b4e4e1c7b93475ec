// End-to-end runner: makes sure Chromium and a current web export exist, starts the real server on a
// fresh database with its mail capture, runs the browser flows against it, then stops it gracefully.
import { execFileSync, spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { freePort } from '../../scripts/freePort';

const ROOT = path.resolve(__dirname, '..', '..');
const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const SOURCE_DIRS = ['app', 'components', 'hooks', 'constants', 'shared', 'assets', 'public'];

/** The browser is a system package: CI (.ci/run) installs it; a test never installs anything itself. */
function ensureChromium() {
  if (fs.existsSync(CHROMIUM)) return;
  throw new Error(`Chromium is missing at ${CHROMIUM}: install Debian's package "chromium" (bash .ci/run does) or set CHROMIUM_PATH.`);
}

function newestMtime(dir: string): number {
  if (!fs.existsSync(dir)) return 0;
  let newest = 0;
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(full) : fs.statSync(full).mtimeMs);
  }
  return newest;
}

function ensureWebExport() {
  const index = path.join(ROOT, 'dist', 'index.html');
  const builtAt = fs.existsSync(index) ? fs.statSync(index).mtimeMs : 0;
  const changedAt = Math.max(...SOURCE_DIRS.map((dir) => newestMtime(path.join(ROOT, dir))));
  if (builtAt > changedAt) return console.log('e2e: web export is current');
  console.log('e2e: exporting the web app …');
  const started = Date.now();
  execFileSync('npm', ['run', '--silent', 'build:web'], { cwd: ROOT, stdio: 'inherit' });
  console.log(`e2e: web export took ${((Date.now() - started) / 1000).toFixed(1)} s`);
}

async function waitForHealth(url: string, server: ReturnType<typeof spawn>) {
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (server.exitCode !== null) throw new Error(`server exited early with code ${server.exitCode}`);
    try {
      const reply = await fetch(`${url}/api/health`);
      if (reply.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error('server did not become healthy within 60 s');
}

async function main() {
  ensureChromium();
  ensureWebExport();
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-e2e-'));
  const server = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
    cwd: ROOT,
    env: { ...process.env, PORT: String(port), PUBLIC_URL: baseUrl, DATABASE_PATH: path.join(dataDir, 'e2e.sqlite'), SMTP_PORT: '0', LOG_LEVEL: 'warn' },
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  let status = 1;
  try {
    await waitForHealth(baseUrl, server);
    // `npm run test:e2e -- tests/e2e/datasets.test.ts` runs only the files named
    const named = process.argv.slice(2);
    const specs = named.length ? named : fs.readdirSync(path.join(ROOT, 'tests', 'e2e')).filter((f) => f.endsWith('.test.ts')).sort().map((f) => `tests/e2e/${f}`);
    const run = spawnSync(
      process.execPath,
      ['--import', 'tsx', '--test', '--test-reporter=spec', '--test-concurrency=1', ...specs],
      { cwd: ROOT, stdio: 'inherit', env: { ...process.env, E2E_BASE_URL: baseUrl, CHROMIUM_PATH: CHROMIUM } },
    );
    status = run.status ?? 1;
  } finally {
    const exited = server.exitCode !== null ? Promise.resolve(server.exitCode) : new Promise<number | null>((resolve) => server.once('exit', (code) => resolve(code)));
    server.kill('SIGTERM');
    const exitCode = await exited;
    if (exitCode !== 0) {
      console.error(`e2e: server did not shut down cleanly (exit ${exitCode})`);
      status = status || 1;
    }
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
  process.exit(status);
}

main().catch((error) => {
  console.error(`e2e: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
