import { test } from 'node:test';
import assert from 'node:assert/strict';
import { locateKinks } from '../../../shared/engine/data/kinks';
import { mulberry32 } from '../../../shared/engine/data/random';
import { FAST_SINE, KINKED, NOISE_LEVELS, POINT_COUNTS, SMOOTH, UNIT_CHANGES, inUnits, sample } from './curves';

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

// Whether there is a kink must not depend on the units of x and y: a change of units is an affine map
// of each axis, and the rescaled frame the decision is made in is the same for all of them (exact).
for (const curve of [SMOOTH[1], FAST_SINE]) {
  for (const units of UNIT_CHANGES) {
    test(`${curve.name}, 100 points, noise 1e-3, in units ${units.name} → no kink`, () => {
      const search = locateKinks(...xy(inUnits(sample(curve, 100, 1e-3, NOISE_SEED), units)), { resamples: 50 });
      assert.deepEqual(search.kinks.map((k) => k.x), []);
    });
  }
}

for (const units of UNIT_CHANGES) {
  test(`slope jump in the middle in units ${units.name}: the same kink, its position and uncertainty mapped`, () => {
    const values = sample(KINKED[0], 200, 1e-3, NOISE_SEED);
    const plain = locateKinks(values.x, values.y, { resamples: 50 });
    const mapped = locateKinks(...xy(inUnits(values, units)), { resamples: 50 });
    assert.equal(plain.kinks.length, 1);
    assert.equal(mapped.kinks.length, 1);
    const [before, after] = [plain.kinks[0], mapped.kinks[0]];
    const back = (after.x - units.b) / units.a;
    // The planted position (curves.ts) is the independent value.
    assert.ok(Math.abs(back - 0.55) <= after.uncertainty / units.a, `${back} ± ${after.uncertainty / units.a}`);
    // Affine maps commute with the locator up to rounding of the mapped x (an offset of 1e6 keeps ~1e-10).
    assert.ok(Math.abs(back - before.x) < 1e-6, `${back} against ${before.x}`);
    assert.ok(Math.abs(after.uncertainty / units.a - before.uncertainty) < 1e-6 * before.uncertainty + 1e-9);
    assert.ok(Math.abs(after.y / units.c - before.y) < 1e-6 * Math.abs(before.y));
  });
}

// Invented data: 30 noise draws of one slope jump (1 at x = 0.4317 on a line of slope 0.5, 80 points,
// σ = 0.01, about 1 % of the y-range). A stated uncertainty should cover the planted position in most
// draws and never be off by more than 3 of itself; a clear kink should rarely be missed.
test('coverage over 30 noise draws: at most 1 miss, none beyond 3σ, planted within 1σ in ≥ 80 %', (t) => {
  const planted = 0.4317;
  const f = (x: number) => 1 + 0.5 * x + Math.max(0, x - planted);
  let missed = 0;
  let within = 0;
  for (let draw = 0; draw < 30; draw++) {
    const random = mulberry32(1000 + draw);
    const gaussian = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
    const x = Array.from({ length: 80 }, (_, i) => i / 79);
    const search = locateKinks(x, x.map((v) => f(v) + 0.01 * gaussian()), { resamples: 100, seed: draw + 1 });
    if (search.kinks.length === 0) {
      missed++;
      continue;
    }
    for (const kink of search.kinks) assert.ok(Math.abs(kink.x - planted) <= 3 * kink.uncertainty, `draw ${draw}: ${kink.x} ± ${kink.uncertainty}`);
    if (Math.abs(search.kinks[0].x - planted) <= search.kinks[0].uncertainty) within++;
  }
  t.diagnostic(`missed ${missed} of 30, planted within 1σ in ${within}`);
  assert.ok(missed <= 1, `missed ${missed}`);
  assert.ok(within >= 0.8 * 30, `within 1σ in ${within} of 30`);
});

function xy(values: { x: number[]; y: number[] }): [number[], number[]] {
  return [values.x, values.y];
}
