import assert from 'node:assert/strict';
import { test } from 'node:test';
import { asComparison, asExponents, asFixedPoints, asFlow, asScan, asSeries } from '../../../components/notebook/resultShapes';
import { runJob } from '../../../shared/jobs';

/**
 * The app reads each result with the job contract's schema (components/notebook/resultShapes.ts). Real
 * answers of the runners must be read exactly (earlier: false); a result in an older shape is read with
 * the loosened schema (earlier: true) and keeps what still matches; anything else is not recognised.
 */

const ising = { preset: 'on', N: 1 } as const;
const run = (job: Record<string, unknown>) => runJob(job) as unknown;

test('real results of every kind the notebook shows are read with the contract, not loosely', () => {
  const series = asSeries(run({ job: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1, at: { s: '1.5' }, digits: 10 }));
  assert.equal(series?.earlier, false);
  assert.equal(series?.lowest, -1);
  const exponents = asExponents(run({ job: 'exponents', model: ising, d: '3', s: '1.75', loops: 2, digits: 10 }));
  assert.equal(exponents?.earlier, false);
  assert.ok(exponents?.contract && !exponents.contract.meanField);
  // 1/ν = s − ε/3 + … for N = 1 (Fisher, Ma, Nickel 1972; docs/physics.md §5): ε¹ coefficient −1/3 at 10 digits
  assert.equal(exponents?.series.nuInv[1], '-0.3333333333');
  const flow = asFlow(run({ job: 'flow', model: ising, loops: 1, digits: 10 }));
  assert.equal(flow?.earlier, false);
  const fixedPoints = asFixedPoints(run({ job: 'fixedpoints', model: ising, d: '3', s: '1.75', loops: 1, digits: 10 }));
  assert.equal(fixedPoints?.earlier, false);
  assert.deepEqual(fixedPoints?.points.map((p) => p.name), ['Gaussian', 'Ising']);
  const scan = asScan(run({ job: 'scan', model: ising, d: '3', s: { from: '1.4', to: '1.9', points: 3 }, loops: 1, digits: 10 }));
  assert.equal(scan?.earlier, false);
  // s = d/2 = 1.5 marks the end of the mean-field region (docs/physics.md §3)
  assert.equal(scan?.meanField, 1.5);
  const comparison = asComparison(run({ job: 'compare', model: ising, loops: 1, digits: 10, d: '3', s: { from: '1.55', to: '1.95', points: 3 }, quantity: 'nuInv', data: { xAxis: 's', x: ['1.7'], y: ['1.5'] } }));
  assert.ok(comparison);
});

test('an exponents result in an earlier shape is read loosely: fields that no longer match are left out, the rest kept', () => {
  // the shape stored before Padé values became checked tables and before relations were listed
  const earlier = { eps: '0.5', meanField: false, fixedPoint: 'Ising', series: { nuInv: ['1.75', '-0.3333'] }, values: { nuInv: '1.58' }, pade: { nuInv: '1.53' } };
  const shape = asExponents(earlier);
  assert.equal(shape?.earlier, true);
  assert.equal(shape?.contract, null);
  assert.deepEqual(shape?.series, { nuInv: ['1.75', '-0.3333'] });
  assert.deepEqual(shape?.values, { nuInv: '1.58' });
  assert.deepEqual(shape?.extra, { meanField: false, fixedPoint: 'Ising', pade: { nuInv: '1.53' } });
});

test('a scan in an earlier shape keeps its points; shapes of another kind are not recognised', () => {
  const scan = asScan({ points: [{ s: '1.6', values: { nuInv: '1.55' } }] }, '3');
  assert.equal(scan?.earlier, true);
  // an earlier-shaped scan names no followed fixed point: the plot then names none (null, not a guess)
  assert.deepEqual(scan?.points, [{ x: 1.6, values: { nuInv: 1.55 }, flagged: false, fixedPoint: null }]);
  assert.equal(scan?.meanField, 1.5);
  assert.equal(asExponents({ something: 1 }), null);
  assert.equal(asScan({ points: 'many' }), null);
  assert.equal(asFixedPoints([1, 2]), null);
  assert.equal(asComparison({ xAxis: 's' }), null);
  assert.equal(asFlow({ beta: 'none' }), null);
});
