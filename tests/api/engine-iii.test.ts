import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import Decimal from 'decimal.js';
import { type JOBS } from '../../shared/jobs/contract';
import { startHarness, type Harness } from './harness';
import { calcAs, createPerson, type TestPerson } from './people';

/**
 * Engine results through the HTTP API (POST /api/calc, the worker pool, GET /api/runs/:id): each answer
 * must validate against the contract's result schema and agree with values derived independently.
 */

const close = (actual: string | null | undefined, expected: number, tolerance: number, label: string) =>
  assert.ok(Math.abs(Number(actual) - expected) <= tolerance * Math.max(1, Math.abs(expected)), `${label}: ${actual} vs ${expected}`);

describe('engine jobs through /api/calc', () => {
  let h: Harness;
  let owner: TestPerson;

  before(async () => {
    h = await startHarness();
    owner = await createPerson(h);
  });
  after(() => h?.close());

  const calc = <K extends keyof typeof JOBS>(kind: K, job: Record<string, unknown>) => calcAs(owner, kind, job);

  test('exponents at N = 0 (self-avoiding walks, through the symbolic-N family), d = 3, s = 1.75', async () => {
    const r = await calc('exponents', { model: { preset: 'on', N: 0 }, d: '3', s: '1.75', loops: 2, digits: 20 });
    assert.equal(r.meanField, false);
    if (r.meanField) return;
    // 1/ν = s − (N + 2)/(N + 8) ε + O(ε²) (docs/physics.md §5): at N = 0 the ε coefficient is −1/4
    close(r.series.nuInv?.[0] as string, 1.75, 1e-18, '1/ν at ε⁰');
    close(r.series.nuInv?.[1] as string, -0.25, 1e-18, '1/ν at ε¹');
    // ω = ε + O(ε²) (docs/physics.md §5)
    close(r.series.omega?.[1] as string, 1, 1e-18, 'ω at ε¹');
    // s < 2: η = 2 − s and Δφ = (d − s)/2 exactly (docs/physics.md §2)
    close(r.values?.eta, 0.25, 1e-18, 'η');
    close(r.values?.Delta_phi, 0.625, 1e-18, 'Δφ');
  });

  test('cubic N = 4 fixed points at s = 2, d = 3.8 agree with the textbook β solved independently (tests/unit/fixedpoints/cubicN4.test.ts)', async () => {
    const r = await calc('fixedpoints', { model: { preset: 'cubic', N: 4 }, s: '2', d: '3.8', loops: 2, digits: 30 });
    const byName = (name: string) => r.fixedPoints.find((p) => p.name === name)!;
    assert.deepEqual(r.fixedPoints.map((p) => p.name).sort(), ['Gaussian', 'O(N)', 'cubic', 'decoupled Ising']);
    const cubic = byName('cubic');
    const on = byName('O(N)');
    type Coupling = { series: string[]; value?: string };
    const coupling = (point: typeof cubic, name: string) => (point.couplings as Record<string, Coupling>)[name];
    // ε² coefficients of the series solution of the textbook β: cubic (5/96, 1/6), O(N) (13/96, 0) — cubicN4.test.ts
    close(coupling(cubic, 'u').series[2], 5 / 96, 1e-28, 'cubic u ε²');
    close(coupling(cubic, 'v').series[2], 1 / 6, 1e-28, 'cubic v ε²');
    close(coupling(on, 'u').series[2], 13 / 96, 1e-28, 'O(N) u ε²');
    // roots of the truncated textbook β at ε = 0.2 by mpmath findroot at 70 digits, as cubicN4.test.ts quotes them
    close(coupling(cubic, 'u').value, 0.05051652298046148195371838, 1e-24, 'cubic u at ε = 0.2');
    close(coupling(cubic, 'v').value, 0.01246324682892683797148256, 1e-24, 'cubic v at ε = 0.2');
    close(coupling(on, 'u').value, 0.05705246475944284730984231, 1e-24, 'O(N) u at ε = 0.2');
    // at N = 4 the cubic point is IR-stable at two loops (N_c = 4 − 2ε at s = 2, textbook, recalled from memory)
    assert.equal(cubic.stable, true);
    assert.equal(on.stable, false);
  });

  test('lngamma at −2.5: ln|Γ(−5/2)| = ln(8√π/15) with sign −1 (DLMF 5.4.6 with 5.5.1)', async () => {
    const r = await calc('special', { fn: 'lngamma', x: '-2.5', digits: 30 });
    assert.equal(r.sign, -1);
    const D = Decimal.clone({ precision: 40 });
    const expected = D.ln(8).plus(D.ln(D.acos(-1)).div(2)).minus(D.ln(15)); // decimal.js, 40 digits
    assert.ok(expected.minus(r.value).abs().lte(expected.abs().times('1e-29')), `${r.value} vs ${expected.toString()}`);
  });
});
