import os from 'node:os';
import { pino, type Logger } from 'pino';

/** One structured (JSON) log format for every Rungbook process; `role` tells a web server's lines from a worker's. */
export function processLogger(level: string, role: 'server' | 'worker'): Logger {
  return pino({ level, base: { pid: process.pid, hostname: os.hostname(), role } });
}
