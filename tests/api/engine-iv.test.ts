import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import Decimal from 'decimal.js';
import { type JOBS } from '../../shared/jobs/contract';
import { startHarness, type Harness } from './harness';
import { calcAs, createPerson, type TestPerson } from './people';

/**
 * Three-loop jobs through the HTTP API (POST /api/calc, the worker pool, GET /api/runs/:id): results
 * validate against the contract and agree with values known independently.
 */

// ζ(3), OEIS A002117
const ZETA3 = new Decimal('1.2020569031595942853997381615114499907650');

const close = (actual: string | null | undefined, expected: Decimal, tolerance: number, label: string) =>
  assert.ok(new Decimal(actual ?? 'NaN').minus(expected).abs().lte(expected.abs().plus(1).times(tolerance)), `${label}: ${actual} vs ${expected.toString()}`);

describe('three-loop jobs through /api/calc', () => {
  let h: Harness;
  let owner: TestPerson;

  before(async () => {
    h = await startHarness();
    owner = await createPerson(h);
  });
  after(() => h?.close());

  const calc = <K extends keyof typeof JOBS>(kind: K, job: Record<string, unknown>) => calcAs(owner, kind, job);

  test('exponents, O(3) at s = 2, d = 3, loops 3: 1/ν, η, ω at ε³ equal the classic three-loop series (Kleinert & Schulte-Frohlinde 2001, recalled from memory)', async () => {
    const N = 3;
    const r = await calc('exponents', { model: { preset: 'on', N: String(N) }, s: '2', d: '3', loops: 3, digits: 20 });
    assert.equal(r.meanField, false);
    if (r.meanField) return;
    const nuInv3 = new Decimal(N + 2).div(8 * (N + 8) ** 5).times(new Decimal(3 * N ** 3 - 452 * N ** 2 - 2672 * N - 5312).plus(ZETA3.times(96 * (N + 8) * (5 * N + 22))));
    const eta3 = new Decimal((N + 2) * (-N * N + 56 * N + 272)).div(8 * (N + 8) ** 4);
    const omega3 = new Decimal(33 * N ** 3 + 538 * N ** 2 + 4288 * N + 9568).plus(ZETA3.times(96 * (N + 8) * (5 * N + 22))).div(4 * (N + 8) ** 4);
    close(r.series.nuInv?.[3] as string, nuInv3, 1e-18, '1/ν ε³');
    close(r.series.eta?.[3] as string, eta3, 1e-18, 'η ε³');
    close(r.series.omega?.[3] as string, omega3, 1e-18, 'ω ε³');
  });

  test('exponents, loops 3, s = 2, the anisotropic two-field model (its field renormalization is a matrix): the stable point is O(2) and 1/ν, η at ε³ equal the classic O(2) series (same source)', async () => {
    const N = 2;
    const potential = 'u/24*phi1^4 + v/24*phi2^4 + w/4*phi1^2*phi2^2';
    const r = await calc('exponents', { model: { preset: 'custom', fields: 2, potential }, s: '2', d: '3', loops: 3, digits: 20 });
    assert.equal(r.meanField, false);
    if (r.meanField) return;
    assert.match(r.fixedPoint, /^O\(2\)/);
    const nuInv3 = new Decimal(N + 2).div(8 * (N + 8) ** 5).times(new Decimal(3 * N ** 3 - 452 * N ** 2 - 2672 * N - 5312).plus(ZETA3.times(96 * (N + 8) * (5 * N + 22))));
    const eta3 = new Decimal((N + 2) * (-N * N + 56 * N + 272)).div(8 * (N + 8) ** 4);
    close(r.series.nuInv?.[3] as string, nuInv3, 1e-18, '1/ν ε³');
    close(r.series.eta?.[3] as string, eta3, 1e-18, 'η ε³');
  });

  test('scan, O(1), d = 3, loops 3, s = 1.6 … 1.9: every printed 1/ν is its printed ε-series summed at that ε', async () => {
    const scan = await calc('scan', { model: { preset: 'on', N: '1' }, d: '3', loops: 3, s: { from: '1.6', to: '1.9', points: 3 }, quantities: ['nuInv'], digits: 20 });
    assert.equal(scan.points.length, 3);
    for (const point of scan.points) {
      const single = await calc('exponents', { model: { preset: 'on', N: '1' }, s: point.s, d: '3', loops: 3, digits: 20 });
      if (single.meanField) assert.fail('not mean field at s > d/2');
      const coefficients = (single.series.nuInv as string[]).map((c) => new Decimal(c));
      assert.equal(coefficients.length, 4, 'series to ε³');
      const eps = new Decimal(point.eps);
      const summed = coefficients.reduceRight((acc, c) => acc.times(eps).plus(c), new Decimal(0));
      close(point.values.nuInv, summed, 1e-17, `1/ν at s = ${point.s}`);
    }
  });
});
