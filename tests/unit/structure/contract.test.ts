import assert from 'node:assert/strict';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { test } from 'node:test';
import { ROOT, importsOf, sourceFiles } from './imports';

/**
 * The job contract (shared/jobs/contract) is bundled into the app, which must not carry the engine:
 * everything it imports, followed file by file, is zod, the contract itself, or the dataset contract
 * shared/notebook/datasets.ts (limits and axis kinds of the data jobs).
 */

const ALLOWED_FILES = [/^shared\/jobs\/contract\/[A-Za-z]+\.ts$/, /^shared\/notebook\/datasets\.ts$/];
const ALLOWED_PACKAGES = ['zod'];

/** The file a relative import names: `x.ts` or `x/index.ts`. */
function resolved(target: string): string | null {
  for (const candidate of [`${target}.ts`, `${target}/index.ts`, target]) if (existsSync(join(ROOT, candidate)) && candidate.endsWith('.ts')) return candidate;
  return null;
}

test('the contract imports only zod, itself and the dataset contract, all the way down', () => {
  const seen = new Set<string>();
  const pending = ['shared/jobs/contract/index.ts'];
  const problems: string[] = [];
  while (pending.length) {
    const file = pending.pop()!;
    if (seen.has(file)) continue;
    seen.add(file);
    for (const entry of importsOf(join(ROOT, file))) {
      if (entry.target === null) {
        if (!ALLOWED_PACKAGES.includes(entry.specifier)) problems.push(`${file}: package '${entry.specifier}'`);
        continue;
      }
      const next = resolved(entry.target);
      if (next === null || !ALLOWED_FILES.some((allowed) => allowed.test(next))) problems.push(`${file}: '${entry.specifier}'`);
      else pending.push(next);
    }
  }
  assert.deepEqual(problems, []);
  assert.ok(seen.has('shared/jobs/contract/calc.ts') && seen.has('shared/notebook/datasets.ts'), 'the walk reached the contract files');
});

test('the app imports the contract but neither the engine nor the job runners', () => {
  const app = ['app', 'components', 'hooks', 'constants'].flatMap(sourceFiles).flatMap(importsOf);
  const engineSide = app.filter((entry) => entry.target !== null && (entry.target.startsWith('shared/engine') || (entry.target.startsWith('shared/jobs') && !entry.target.startsWith('shared/jobs/contract'))));
  assert.deepEqual(engineSide.map((entry) => `${entry.file}: '${entry.specifier}'`), []);
  assert.ok(app.some((entry) => entry.target?.startsWith('shared/jobs/contract')), 'the app reads results with the contract');
});
