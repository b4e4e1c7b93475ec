import assert from 'node:assert/strict';
import { test } from 'node:test';
import { runJob } from '../../../shared/jobs';

test('a scan reports its progress through the optional hook, rising to the end, and gives the same result with or without it', () => {
  const job = { job: 'scan', model: { preset: 'on', N: 1 }, d: '3', s: { from: '1.55', to: '1.95', points: 200 }, quantities: ['nuInv'], loops: 2, digits: 20 };
  const fractions: number[] = [];
  const withHook = runJob(job, { onProgress: (f) => fractions.push(f) }) as unknown as { points: { s: string; values: { nuInv: string } }[] };
  assert.ok(fractions.length >= 50, `reported ${fractions.length} times`);
  assert.ok(fractions.every((f, i) => f > 0 && f < 1 && (i === 0 || f >= fractions[i - 1])), 'fractions rise inside (0, 1)');
  assert.deepEqual(runJob(job), withHook);
  // At s = 1.55, ε = 0.1: 1/ν = s − ε/3 − (ε²/9)A(s) (Fisher–Ma–Nickel 1972, via Pagni et al. arXiv:2510.02458 eq. 44),
  // so the truncated value lies within ε²·|A|/9 < 0.01 of s − ε/3 = 1.516666…
  const first = withHook.points[0];
  assert.equal(first.s.slice(0, 4), '1.55');
  assert.ok(Math.abs(Number(first.values.nuInv) - (1.55 - 0.1 / 3)) < 0.01);
});
