import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import type { Socket } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { freePort } from '../freePort';

export interface RunningRedis {
  /** redis://127.0.0.1:<port> */
  url: string;
  stop(): Promise<void>;
  /** Kills the server at once, for process exit handlers, which cannot wait for promises. */
  stopNow(): void;
  /** Lets this process exit while the server still runs (an exit handler then calls stopNow). */
  unref(): void;
}

const REDIS_BINARY = 'redis-server';

function assertInstalled() {
  const probe = spawnSync(REDIS_BINARY, ['--version'], { encoding: 'utf8' });
  if (probe.error || probe.status !== 0) {
    throw new Error(`${REDIS_BINARY} was not found on PATH: install Debian's redis-server package (apt-get install redis-server) to run the Redis-backed tests and benchmarks.`);
  }
}

/** A throw-away redis-server on a free loopback port, without persistence, in a temporary directory. */
export async function startRedis(): Promise<RunningRedis> {
  assertInstalled();
  const port = await freePort();
  const dir = mkdtempSync(path.join(os.tmpdir(), 'rungbook-redis-'));
  const child = spawn(REDIS_BINARY, ['--port', String(port), '--bind', '127.0.0.1', '--save', '', '--appendonly', 'no', '--dir', dir], { stdio: ['ignore', 'pipe', 'pipe'] });
  let output = '';
  await new Promise<void>((resolve, reject) => {
    const onData = (chunk: Buffer) => {
      output += chunk.toString();
      if (output.includes('Ready to accept connections')) resolve();
    };
    child.stdout.on('data', onData);
    child.stderr.on('data', onData);
    child.once('exit', (code) => reject(new Error(`redis-server exited with code ${code} before it was ready:\n${output}`)));
  });
  return {
    url: `redis://127.0.0.1:${port}`,
    unref() {
      child.unref();
      // the output pipes are sockets: unreferenced, they no longer hold this process either
      for (const pipe of [child.stdout, child.stderr]) (pipe as unknown as Socket).unref();
    },
    stopNow() {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
      rmSync(dir, { recursive: true, force: true });
    },
    async stop() {
      if (child.exitCode === null) {
        const exited = new Promise((resolve) => child.once('exit', resolve));
        child.kill('SIGTERM');
        await exited;
      }
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
