import { test } from 'node:test';
import assert from 'node:assert/strict';
import { locateKinks } from '../../../shared/engine/data/kinks';
import { KINKED, NOISE_LEVELS, POINT_COUNTS, SMOOTH, sample } from './curves';

// The planted positions are the independent values: each curve is built with its kinks there (curves.ts).
const NOISE_SEED = 20261202;

for (const curve of KINKED) {
  for (const points of POINT_COUNTS) {
    for (const noise of NOISE_LEVELS) {
      test(`${curve.name}: ${points} points, noise ${noise} of the y-range → kinks at ${curve.kinks.join(', ')}`, (t) => {
        const { x, y } = sample(curve, points, noise, NOISE_SEED + points);
        const search = locateKinks(x, y);
        const range = curve.to - curve.from;
        assert.equal(search.kinks.length, curve.kinks.length, `found ${search.kinks.map((k) => k.x.toFixed(4)).join(', ')}`);
        curve.kinks.forEach((planted, i) => {
          const found = search.kinks[i];
          t.diagnostic(`planted ${planted} | found ${found.x.toFixed(4)} ± ${found.uncertainty.toFixed(4)} | strength ${found.strength.toPrecision(3)}`);
          assert.ok(Math.abs(found.x - planted) <= found.uncertainty, `kink ${i + 1}: |${found.x} − ${planted}| > ${found.uncertainty}`);
          assert.ok(found.uncertainty < 0.05 * range, `uncertainty ${found.uncertainty} is not below 5 % of the x-range`);
          assert.ok(Math.abs(found.y - curve.f(found.x)) < 0.02 * Math.abs(curve.f(curve.to) - curve.f(curve.from)) + 0.01, 'y lies on the curve');
        });
        for (let i = 1; i < search.kinks.length; i++) assert.ok(search.kinks[i - 1].strength >= search.kinks[i].strength, 'strongest first');
      });
    }
  }
}

for (const curve of SMOOTH) {
  for (const points of POINT_COUNTS) {
    for (const noise of NOISE_LEVELS) {
      test(`${curve.name}: ${points} points, noise ${noise} → no kink`, () => {
        const { x, y } = sample(curve, points, noise, NOISE_SEED + points);
        const search = locateKinks(x, y);
        assert.deepEqual(search.kinks.map((k) => k.x), []);
        assert.ok(search.effectiveDof >= 2 && search.effectiveDof <= points, `effective degrees of freedom ${search.effectiveDof}`);
      });
    }
  }
}

test('a straight line (rounding errors only) has no kink', () => {
  const x = Array.from({ length: 400 }, (_, i) => i / 399);
  const search = locateKinks(x, x.map((v) => 0.3 + 0.7 * v));
  assert.deepEqual(search.kinks, []);
});

test('the same data and seed give the same answer; another seed the same kinks', () => {
  const { x, y } = sample(KINKED[0], 200, 1e-3, 11);
  const first = locateKinks(x, y, { seed: 5 });
  assert.deepEqual(locateKinks(x, y, { seed: 5 }), first);
  const other = locateKinks(x, y, { seed: 6 });
  assert.equal(other.kinks.length, first.kinks.length);
  assert.ok(Math.abs(other.kinks[0].x - first.kinks[0].x) <= first.kinks[0].uncertainty);
});

test('unevenly spaced points: the slope jump is still found within its uncertainty', () => {
  const curve = KINKED[0];
  const x = Array.from({ length: 300 }, (_, i) => (i / 299) ** 1.3);
  const y = x.map(curve.f);
  const search = locateKinks(x, y);
  assert.equal(search.kinks.length, 1);
  assert.ok(Math.abs(search.kinks[0].x - 0.55) <= search.kinks[0].uncertainty);
});

test('doubling every weight doubles the chosen λ and keeps the kinks', () => {
  const { x, y } = sample(KINKED[2], 150, 1e-3, 3);
  const plain = locateKinks(x, y);
  const doubled = locateKinks(x, y, { weights: x.map(() => 2) });
  assert.equal(doubled.kinks.length, plain.kinks.length);
  // λ multiplies a penalty that the doubled weights double: the same fit needs twice the λ.
  assert.ok(Math.abs(doubled.lambda / plain.lambda - 2) < 0.05, `λ ratio ${doubled.lambda / plain.lambda}`);
});
