import { test } from 'node:test';
import assert from 'node:assert/strict';
import { isJobError, runJob } from '../../../shared/jobs/index';

// docs/physics.md §5: the one-loop O(N) point has u* ∝ ε/(N + 8), the cubic point v* ∝ ε/N (common practice),
// so the family's ε-series have poles at N = −8 (O(N)) and N = 0 (cubic); only those points are left out.

test('asking for a fixed point that has a pole at this N names the pole instead of "no such point"', () => {
  const cubicAtZero = runJob({ job: 'exponents', model: { preset: 'cubic', N: 0 }, d: '3.9', s: '2', fixedPoint: 'cubic' } as never);
  assert.ok(isJobError(cubicAtZero));
  assert.equal(cubicAtZero.error.code, 'domain');
  assert.match(cubicAtZero.error.message, /"cubic" is not listed at N = 0: its ε-series divide by N\b/);
});

test('with the only non-Gaussian point omitted, the exponents job says why', () => {
  const onAtMinusEight = runJob({ job: 'exponents', model: { preset: 'on', N: -8 }, d: '3.9', s: '2' } as never);
  assert.ok(isJobError(onAtMinusEight));
  assert.equal(onAtMinusEight.error.code, 'domain');
  assert.match(onAtMinusEight.error.message, /"O\(N\)" is not listed at N = -8: its ε-series divide by N \+ 8/);
});

test('the other points of cubic N = 0 are computed: O(N) at one loop is u* = 3ε/8', () => {
  const result = runJob({ job: 'fixedpoints', model: { preset: 'cubic', N: 0 }, d: '3.9', s: '2' } as never) as { fixedPoints: { name: string; couplings: Record<string, { series: string[] }> }[] };
  assert.ok(!isJobError(result));
  const names = result.fixedPoints.map((p) => p.name);
  assert.ok(names.includes('Gaussian') && names.includes('O(N)') && !names.includes('cubic'), names.join(', '));
  const on = result.fixedPoints.find((p) => p.name === 'O(N)')!;
  assert.equal(Number(on.couplings.u.series[1]), 3 / 8);
});
