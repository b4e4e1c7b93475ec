import { test } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { KinksResult } from '../../../shared/jobs/contract';
import { runKinksJob } from '../../../shared/jobs/kinksJob';
import { runJob } from '../../../shared/jobs/run';
import { DATASET_LIMITS } from '../../../shared/notebook/datasets';
import { EngineError } from '../../../shared/engine/precision/errors';
import { KINKED, SMOOTH, sample } from './curves';

const repoRoot = join(__dirname, '..', '..', '..');
const asText = (values: { x: number[]; y: number[] }): [string, string][] => values.x.map((x, i) => [String(x), String(values.y[i])]);
const errorOf = (result: unknown) => (result as { error?: { code: string; message: string } }).error;

test('a kinks job through runJob: the planted kink within its uncertainty, decimal strings, schema-valid', () => {
  const points = asText(sample(KINKED[0], 200, 1e-3, 4)); // invented data: slope jump planted at 0.55
  const result = runJob({ job: 'kinks', points });
  assert.equal(errorOf(result), undefined, JSON.stringify(result));
  const parsed = KinksResult.parse(result);
  assert.equal(parsed.kinks.length, 1);
  const [kink] = parsed.kinks;
  for (const value of [kink.x, kink.y, kink.uncertainty, kink.strength]) assert.match(value, /^-?\d+(\.\d+)?(e[+-]\d+)?$/);
  assert.ok(Math.abs(Number(kink.x) - 0.55) <= Number(kink.uncertainty));
  assert.equal(parsed.smoothing?.resamples, 200);
  // Six significant digits at most.
  assert.ok(kink.x.replace(/^0\.0*|\./g, '').replace(/e.*$/, '').length <= 6, kink.x);
});

test('a smooth curve gives "kinks": []', () => {
  const result = runJob({ job: 'kinks', points: asText(sample(SMOOTH[0], 120, 1e-3, 9)), resamples: 50, seed: 3 });
  assert.deepEqual((result as unknown as { kinks: unknown[] }).kinks, []);
});

test('points in any order give the same answer as sorted points', () => {
  const points = asText(sample(KINKED[2], 150, 1e-4, 8));
  const shuffled = [...points].reverse();
  [shuffled[3], shuffled[90]] = [shuffled[90], shuffled[3]];
  assert.deepEqual(runKinksJob({ job: 'kinks', points: shuffled }), runKinksJob({ job: 'kinks', points }));
});

test(`fewer than ${DATASET_LIMITS.minKinkPoints} points: invalid-job naming the minimum`, () => {
  const points = asText(sample(KINKED[0], DATASET_LIMITS.minKinkPoints - 1, 0, 1));
  const error = errorOf(runJob({ job: 'kinks', points }));
  assert.equal(error?.code, 'invalid-job');
  assert.match(error!.message, new RegExp(`at least ${DATASET_LIMITS.minKinkPoints} points`));
  assert.throws(() => runKinksJob({ job: 'kinks', points }), (e: unknown) => e instanceof EngineError && e.code === 'invalid');
});

test('duplicate x: invalid-job naming both points (1-based) and the x', () => {
  const points = asText(sample(KINKED[0], 20, 0, 1));
  points[12] = [points[5][0], '7'];
  const error = errorOf(runJob({ job: 'kinks', points }));
  assert.equal(error?.code, 'invalid-job');
  assert.match(error!.message, /points 6 and 13/);
  assert.ok(error!.message.includes(points[5][0]), error!.message);
});

test('"1e999" overflows a double: invalid-job naming the point; "NaN" is refused by the schema', () => {
  const points = asText(sample(KINKED[0], 20, 0, 1));
  points[3] = [points[3][0], '1e999'];
  const error = errorOf(runJob({ job: 'kinks', points }));
  assert.equal(error?.code, 'invalid-job');
  assert.match(error!.message, /point 4: y = 1e999/);
  points[3] = ['NaN', '1'];
  assert.equal(errorOf(runJob({ job: 'kinks', points }))?.code, 'invalid-job');
});

test('the CLI exits with code 2 on a bad kinks job and 0 on a good one', () => {
  const calc = (job: unknown) => spawnSync(process.execPath, ['--import', 'tsx', 'shared/cli/calc.ts', JSON.stringify(job)], { cwd: repoRoot, encoding: 'utf8' });
  const bad = calc({ job: 'kinks', points: [['1', '2'], ['1', '3']] });
  assert.equal(bad.status, 2, bad.stdout + bad.stderr);
  const good = calc({ job: 'kinks', points: asText(sample(SMOOTH[1], 40, 0, 1)), resamples: 20 });
  assert.equal(good.status, 0, good.stdout + good.stderr);
  assert.deepEqual(JSON.parse(good.stdout).kinks, []);
});
