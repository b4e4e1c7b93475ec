import { readFileSync } from 'node:fs';
import path from 'node:path';

/**
 * Cached results are keyed by this: bump the package version (or set ENGINE_VERSION) whenever the
 * engine's output could change, so stale results are never served.
 */
export const ENGINE_VERSION: string =
  process.env.ENGINE_VERSION ??
  `engine-${(JSON.parse(readFileSync(path.resolve(__dirname, '..', '..', 'package.json'), 'utf8')) as { version: string }).version}`;
