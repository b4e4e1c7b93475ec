// A throwaway PostgreSQL cluster for tests and benchmarks: Debian's server binaries, a fresh data and
// socket directory, trust authentication on loopback, a free TCP port; stopped and deleted afterwards.
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { freePort } from '../freePort';

export interface RunningPostgres {
  /** postgres://postgres@127.0.0.1:<port>/postgres — the cluster's maintenance database. */
  url: string;
  stop(): Promise<void>;
  /** The same as stop(), for process exit handlers, which cannot wait for promises. */
  stopNow(): void;
}

const DEBIAN_PACKAGE_HINT = "Debian's PostgreSQL server is not installed: install the package `postgresql` (apt-get install postgresql)";

/** The bin directory of the newest installed Debian PostgreSQL (or PG_BIN_DIR), or an error naming the package. */
export function postgresBinDir(): string {
  if (process.env.PG_BIN_DIR) return process.env.PG_BIN_DIR;
  const root = '/usr/lib/postgresql';
  const versions = fs.existsSync(root) ? fs.readdirSync(root).filter((v) => fs.existsSync(path.join(root, v, 'bin', 'initdb'))) : [];
  if (!versions.length) throw new Error(`${DEBIAN_PACKAGE_HINT}; no initdb under ${root}.`);
  const newest = versions.sort((a, b) => Number(b) - Number(a))[0];
  return path.join(root, newest, 'bin');
}

/** initdb and pg_ctl refuse to run as root: as root they run as the `postgres` account the package creates. */
function asServerAccount(binary: string, args: string[]): void {
  const command = process.getuid?.() === 0 ? ['runuser', ['-u', 'postgres', '--', binary, ...args]] as const : [binary, args] as const;
  execFileSync(command[0], command[1], { stdio: ['ignore', 'pipe', 'pipe'] });
}

function handOverToServerAccount(dir: string): void {
  if (process.getuid?.() !== 0) return;
  const idOf = (flag: string) => Number(execFileSync('id', [flag, 'postgres']).toString().trim());
  fs.chownSync(dir, idOf('-u'), idOf('-g'));
}

/** Starts a fresh cluster; settings favour speed over durability (fsync off): for throwaway data only. */
export async function startPostgres(): Promise<RunningPostgres> {
  const bin = postgresBinDir();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-pg-'));
  handOverToServerAccount(dir);
  const data = path.join(dir, 'data');
  const port = await freePort();
  const serverOptions = `-p ${port} -k ${dir} -c listen_addresses=127.0.0.1 -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c shared_buffers=16MB -c max_connections=200`;
  try {
    // C collation: text sorts by code point, as SQLite's default BINARY collation does
    asServerAccount(path.join(bin, 'initdb'), ['-D', data, '-A', 'trust', '-U', 'postgres', '--no-sync', '--encoding=UTF8', '--locale=C']);
    asServerAccount(path.join(bin, 'pg_ctl'), ['-D', data, '-o', serverOptions, '-l', path.join(dir, 'server.log'), '-w', '-t', '60', 'start']);
  } catch (error) {
    const log = fs.existsSync(path.join(dir, 'server.log')) ? fs.readFileSync(path.join(dir, 'server.log'), 'utf8') : '';
    fs.rmSync(dir, { recursive: true, force: true });
    throw new Error(`PostgreSQL did not start: ${(error as Error).message}\n${log}`);
  }
  let stopped = false;
  const stopNow = () => {
    if (stopped) return;
    stopped = true;
    try {
      asServerAccount(path.join(bin, 'pg_ctl'), ['-D', data, '-m', 'immediate', '-w', 'stop']);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  };
  return { url: `postgres://postgres@127.0.0.1:${port}/postgres`, stopNow, stop: async () => stopNow() };
}
