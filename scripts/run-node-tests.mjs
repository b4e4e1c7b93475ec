// Node 20's test runner takes no glob patterns, so this finds the *.test.ts files under the given
// folders (or takes the files named) and hands them to `node --test` with tsx loaded.
import { spawnSync } from 'node:child_process';
import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

const args = process.argv.slice(2);
const options = args.filter((arg) => arg.startsWith('--'));
const folders = args.filter((arg) => !arg.startsWith('--'));

function testFiles(folder) {
  if (!statSync(folder).isDirectory()) return [folder];
  return readdirSync(folder)
    .flatMap((entry) => {
      const path = join(folder, entry);
      if (statSync(path).isDirectory()) return testFiles(path);
      return entry.endsWith('.test.ts') ? [path] : [];
    })
    .sort();
}

const files = folders.flatMap(testFiles);
if (files.length === 0) {
  console.error(`No *.test.ts files under ${folders.join(', ')}`);
  process.exit(1);
}
const result = spawnSync(process.execPath, ['--import', 'tsx', '--test', ...options, ...files], { stdio: 'inherit' });
process.exit(result.status ?? 1);
