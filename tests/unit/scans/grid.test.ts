import { test } from 'node:test';
import assert from 'node:assert/strict';
import { walkGrid } from '../../../shared/engine/scans/scan';
import { scanNotices, scanRegimeNotices } from '../../../shared/engine/exponents/notices';
import { crossoverFor } from '../../../shared/engine/exponents/shortRange';
import { q } from '../../../shared/engine/symbolic/rational';

test('regimes on a grid at d = 3: mean field for s ≤ d/2, short range from s* on and at s = 2 even without s* (s = 2 is the local theory; common practice)', () => {
  const sValues = [q(14, 10), q(3, 2), q(18, 10), q(197, 100), q(2)];
  const regimes = (shortRangeS: ReturnType<typeof q> | null) => walkGrid({ d: q(3), sValues, shortRangeS }, (_s, _eps, regime) => regime);
  assert.deepEqual(regimes(null), ['mean-field', 'mean-field', 'long-range', 'long-range', 'short-range']);
  // s* = 3 − 2·0.5181489 = 1.9637022 (by hand)
  assert.deepEqual(regimes(crossoverFor({ preset: 'on', N: 1 }, q(3))!.sStar), ['mean-field', 'mean-field', 'long-range', 'short-range', 'short-range']);
  assert.deepEqual(walkGrid({ d: q(3), sValues: [q(2)], shortRangeS: null }, (_s, eps) => eps), [q(1)], 'ε = 2s − d');
});

test('regime notices of scan points: Gaussian below d/2, d = 2s at d/2, the crossover between s* and 2, the short-range flow at 2', () => {
  const crossover = crossoverFor({ preset: 'on', N: 1 }, q(2)); // 2D Ising: s* = 2 − 2/8 = 7/4
  const kinds = (s: ReturnType<typeof q>) => scanRegimeNotices(q(2), s, crossover).map((n) => n.kind);
  assert.deepEqual([kinds(q(9, 10)), kinds(q(1)), kinds(q(3, 2)), kinds(q(7, 4)), kinds(q(2))], [['mean-field'], ['upper-critical-dimension'], [], ['beyond-s-star'], ['short-range-flow']]);
});

test('a scan lists each notice once with the values of s where it applies (one per point even if a point says it twice)', () => {
  const notice = (kind: string, message = kind) => ({ kind, message });
  const points = [
    { s: q(16, 10), notices: [] },
    { s: q(17, 10), notices: [notice('complex-at-eps', 'at ε = 0.4 …'), notice('complex-at-eps', 'chosen …')] },
    { s: q(18, 10), notices: [notice('complex-at-eps', 'at ε = 0.6 …'), notice('not-ir-stable')] },
  ];
  assert.deepEqual(scanNotices(points, 10), [
    { kind: 'complex-at-eps', message: 'At s = 1.7, 1.8 (as said at s = 1.7): at ε = 0.4 …' },
    { kind: 'not-ir-stable', message: 'At s = 1.8: not-ir-stable' },
  ]);
});
