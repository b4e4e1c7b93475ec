import { test } from 'node:test';
import assert from 'node:assert/strict';
import { type DerivedFlow } from '../../../shared/engine/diagrams/index';
import { findFixedPoints } from '../../../shared/engine/fixedpoints/index';
import { omittedFixedPoints } from '../../../shared/engine/flows/index';
import { familyPointModel } from '../../../shared/engine/models/index';
import { type Real } from '../../../shared/engine/precision/real';
import { q } from '../../../shared/engine/symbolic/rational';
import { runJob } from '../../../shared/jobs/index';
import { deriveFor } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const coefficient = (r: Any, k: string, monomial: string) => r.beta[k].find((t: Any) => t.monomial === monomial)?.coeff;

// docs/physics.md §5: β(u) = −εu + (N + 8)/3 · u² − 2(5N + 22)/9 · A(s) · u³, A(3/2) = 2 − π + 4 ln 2.
// At N = −8 the u² term vanishes and the u³ coefficient is 4A(3/2) = 6.52398427459995… (hand, DLMF 5.4).
test('the flow at N = −8 is polynomial in N and is given (O(N) and cubic): no u² term, u³ coefficient 4A(3/2)', () => {
  const on = runJob({ job: 'flow', model: { preset: 'on', N: -8 }, s: '1.5', loops: 2, digits: 20 }) as Any;
  assert.equal(on.error, undefined, JSON.stringify(on.error));
  assert.equal(coefficient(on, 'u', 'u^2'), undefined);
  const A = 2 - Math.PI + 4 * Math.log(2);
  assert.ok(Math.abs(Number(coefficient(on, 'u', 'u^3')) - 4 * A) < 1e-14, coefficient(on, 'u', 'u^3'));
  const cubic = runJob({ job: 'flow', model: { preset: 'cubic', N: -8 }, s: '1.5', loops: 1, digits: 20 }) as Any;
  assert.equal(cubic.error, undefined, JSON.stringify(cubic.error));
  // cubic one loop: β_u = −εu + (N + 8)/3 u² + 2uv, β_v = −εv + 4uv + 3v² (docs/physics.md §5; printed at N = 3 as 11/3, 2, 4, 3)
  assert.equal(coefficient(cubic, 'u', 'u^2'), undefined);
  assert.equal(coefficient(cubic, 'u', 'u*v'), '2');
});

// Cubic one loop (above): the cubic point solves (N + 8)/3 u + 2v = 1, 4u + 3v = 1 (couplings /ε);
// the determinant is N, so u = 1/N, v = (N − 4)/(3N): a pole at N = 0 for the cubic point only.
// O(N): u = 3/(N + 8) (docs/physics.md §5), 3/8 at N = 0; decoupled Ising: v = 1/3, u = 0.
test('cubic N = 0: Gaussian, O(N) (u₁ = 3/8) and decoupled Ising are given; only the cubic point is missing, with a note naming it and N', () => {
  const r = runJob({ job: 'fixedpoints', model: { preset: 'cubic', N: 0 }, d: '3.9', s: '2', loops: 2, digits: 20 }) as Any;
  assert.equal(r.error, undefined, JSON.stringify(r.error));
  assert.deepEqual(r.fixedPoints.map((p: Any) => p.name).sort(), ['Gaussian', 'O(N)', 'decoupled Ising']);
  const on = r.fixedPoints.find((p: Any) => p.name === 'O(N)');
  assert.equal(on.couplings.u.series[1], '0.375');
  assert.equal(on.couplings.v.series[1], '0');
  assert.equal(r.fixedPoints.find((p: Any) => p.name === 'decoupled Ising').couplings.v.series[1], '0.33333333333333333333');
  const gaussian = r.fixedPoints.find((p: Any) => p.name === 'Gaussian');
  assert.ok(gaussian.notes.some((n: string) => /"cubic" is not listed at N = 0: its ε-series divide by N\b/.test(n)), JSON.stringify(gaussian.notes));
});

test('O(N) at N = −8: the O(N) point (u₁ = 3/(N + 8)) is the one omitted, named with its factor N + 8', () => {
  const r = runJob({ job: 'fixedpoints', model: { preset: 'on', N: -8 }, d: '2.9', s: '1.5', loops: 2, digits: 20 }) as Any;
  assert.deepEqual(r.fixedPoints.map((p: Any) => p.name), ['Gaussian']);
  assert.ok(r.fixedPoints[0].notes.some((n: string) => /"O\(N\)" is not listed at N = -8: its ε-series divide by N \+ 8/.test(n)), JSON.stringify(r.fixedPoints[0].notes));
});

test('omittedFixedPoints names exactly the points with a pole at that N: cubic at N = 0, none at N = 3 or N = 4 (merging, not a pole)', () => {
  const omitted = (N: number) => {
    const model = familyPointModel('cubic', q(N));
    const { flow } = deriveFor(model, q(7, 4), 2, 20);
    findFixedPoints(model, flow as DerivedFlow<Real>, { eps: null });
    return omittedFixedPoints(flow as DerivedFlow<unknown>).map((o) => `${o.point}: ${o.factor}`);
  };
  assert.deepEqual(omitted(0), ['cubic: N']);
  assert.deepEqual(omitted(3), []);
  assert.deepEqual(omitted(4), []);
});
