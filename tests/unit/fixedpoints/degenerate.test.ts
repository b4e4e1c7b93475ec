import { test } from 'node:test';
import assert from 'node:assert/strict';
import Decimal from 'decimal.js';
import { numericCalculus } from '../../../shared/engine/diagrams/calculus';
import { type DerivedFlow } from '../../../shared/engine/diagrams/renormalization';
import { findFixedPoints } from '../../../shared/engine/fixedpoints/index';
import { CouplingPolynomial } from '../../../shared/engine/models/couplingPolynomial';
import { type ModelSpec } from '../../../shared/engine/models/model';
import { type Real } from '../../../shared/engine/precision/real';
import { q } from '../../../shared/engine/symbolic/rational';
import { runFlowJob } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const run = (job: object) => runFlowJob(job) as Any;
const D50 = Decimal.clone({ precision: 50 });
// A(3/2) = 2 − π + 4 ln 2 (docs/physics.md, A(s) check values); mpmath 1.3.0 at mp.dps = 45
const A = new D50('1.63099606864998799920628510255320338810483114');
const near = (actual: string, expected: Decimal | number, tol: number, label: string) => assert.ok(new D50(expected).minus(actual).abs().lte(tol), `${label}: ${actual} vs ${expected.toString()}`);
const sortedSeries = (p: Any) => [...p.stability.series].sort((x: string[], y: string[]) => Number(y[1]) - Number(x[1]) || Number(y[2]) - Number(x[2]));

// Ising (N = 1) two-loop series for s < 2 (docs/physics.md): β = −εu + 3u² − 6A u³, so u = ε/3 + (2A/9)ε²
// and ω = ε − (2/3)A ε² (ω = ε − 2(5N+22)/(N+8)² A ε² at N = 1).
test('two decoupled Ising copies u/24 φ1⁴ + v/24 φ2⁴: the repeated one-loop eigenvalue 1 splits by the eigenvalues of M₂ — both −(2/3)A', () => {
  const r = run({ job: 'fixedpoints', model: { preset: 'custom', fields: 2, potential: 'u/24*phi1^4 + v/24*phi2^4' }, s: '1.5', d: '2.8', digits: 30 });
  const both = r.fixedPoints.find((p: Any) => p.name === 'all couplings (u, v)');
  for (const series of both.stability.series) {
    assert.equal(series[1], '1');
    near(series[2], A.times(-2).div(3), 1e-27, 'ε² of ω');
  }
  near(both.couplings.u.series[2], A.times(2).div(9), 1e-27, 'u₂');
  // at ε = 0.2 the root of the truncated β by the quadratic formula (mpmath 1.3.0, 70 digits): both eigenvalues β′(u*)
  assert.deepEqual(both.stability.values, [both.stability.values[0], both.stability.values[0]]);
  near(both.stability.values[0], new D50('0.106042924043902194436389'), 1e-22, 'ω at ε = 0.2');
});

test('D4 model u/24 φ1⁴ + v/24 φ2⁴ + w/4 φ1²φ2²: the 45°-rotated Ising pair is a triple one-loop root with an exactly marginal direction — found once, exact, eigenvalue 0 to ε²', () => {
  const r = run({ job: 'fixedpoints', model: { preset: 'custom', fields: 2, potential: 'u/24*phi1^4 + v/24*phi2^4 + w/4*phi1^2*phi2^2' }, s: '1.5', d: '2.8', digits: 30 });
  const names = r.fixedPoints.map((p: Any) => p.name);
  assert.deepEqual([...names].sort(), ['Gaussian', 'O(2) (all couplings (u, v, w))', 'all couplings (u, v, w)', 'u only', 'u, v only', 'v only']);
  const rotated = r.fixedPoints.find((p: Any) => p.name === 'all couplings (u, v, w)');
  // (u/24)(φ1⁴ + φ2⁴ + 6φ1²φ2²) = (u/12)(ψ₊⁴ + ψ₋⁴) with ψ± = (φ1 ± φ2)/√2: two Ising copies with coupling 2u (hand computation)
  for (const g of ['u', 'v', 'w']) {
    assert.equal(rotated.couplings[g].series[1], '0.166666666666666666666666666667');
    near(rotated.couplings[g].series[2], A.div(9), 1e-27, `${g}₂ = (Ising u₂)/2`);
    near(rotated.couplings[g].value, new D50('0.04899284599268296759393516'), 1e-15, `${g} at ε = 0.2 (half the Ising root)`);
  }
  const eig = sortedSeries(rotated);
  assert.equal(eig[0][1], '1');
  near(eig[0][2], A.times(-2).div(3), 1e-27, 'radial ε²');
  // φ1⁴ − φ2⁴ = 2(ψ₊³ψ₋ + ψ₊ψ₋³): Δ(ψ³) + Δ(ψ) = d for s < 2 (docs/physics.md, exact statements) — exactly marginal
  assert.deepEqual(eig[1], ['0', '0', '0']);
  assert.equal(eig[2][1], '-0.333333333333333333333333333333');
  near(eig[2][2], A.times(2).div(9), 1e-27, 'ψ₊²ψ₋² direction ε²');
  assert.ok(rotated.stability.values.includes('0'), JSON.stringify(rotated.stability.values));
  assert.equal(rotated.status, 'degenerate');
  assert.ok(rotated.caveats.some((c: Any) => c.kind === 'degenerate-one-loop'));
});

test('O(2)⊕O(2) with a coupling w (an O(2)×O(2)×Z₂ model): O(4) and the biconical point merge at one loop and split at two loops', () => {
  const potential = 'u/24*((phi1^2+phi2^2)^2+(phi3^2+phi4^2)^2) + w/4*(phi1^2+phi2^2)*(phi3^2+phi4^2)';
  const r = run({ job: 'fixedpoints', model: { preset: 'custom', fields: 4, potential }, s: '1.5', d: '2.8', digits: 30 });
  const o4 = r.fixedPoints.find((p: Any) => p.name === 'O(4) (all couplings (u, w))');
  const biconical = r.fixedPoints.find((p: Any) => p.name === 'all couplings (u, w)');
  assert.ok(o4 && biconical, r.fixedPoints.map((p: Any) => p.name).join(', '));
  // O(4): ω = ε − 2(5N+22)/(N+8)² A ε² = ε − (7/12)A ε² (docs/physics.md); the anisotropy is the rank-4
  // traceless O(4) tensor, the same representation as cubic anisotropy: −A/6 (cubic N = 4, tests above)
  const [radial, anisotropy] = sortedSeries(o4);
  near(radial[2], A.times(-7).div(12), 1e-27, 'O(4) ω₂');
  assert.equal(anisotropy[1], '0');
  near(anisotropy[2], A.div(-6), 1e-27, 'O(4) anisotropy ε²');
  // transcritical exchange of stability: the merging partner has the opposite ε² coefficient (common practice)
  near(sortedSeries(biconical)[1][2], A.div(6), 1e-27, 'biconical ε²');
  assert.equal(biconical.stable, true);
  assert.equal(o4.stable, false);
  // the truncated β at ε = 0.2 (coefficients from the test's general-tensor contraction, × A(3/2)), mpmath 1.3.0 findroot at 70 digits
  near(biconical.couplings.u.value, new D50('0.08508166543602008227102891'), 1e-24, 'biconical u');
  near(biconical.couplings.w.value, new D50('0.002662549105180951324696283'), 1e-24, 'biconical w');
  const values = biconical.stability.values.map(Number).sort((x: number, y: number) => x - y);
  near(String(values[0]), new D50('0.0034763078206262301291'), 1e-17, 'biconical λ₂');
});

/** A hand-made two-coupling flow: β_x = −εx + x², β_y = −εy + xy + y² + c x³ (numeric, s = 2). */
function foldFlow(c: number): { flow: DerivedFlow<Real>; model: ModelSpec } {
  const calculus = numericCalculus(q(2), 30);
  const { ring } = calculus.ctx;
  const term = (powers: number[], k: number) => ({ powers, coeff: ring.fromRational(BigInt(k)) });
  const beta = [new CouplingPolynomial(ring, 2, [term([2, 0], 1)]), new CouplingPolynomial(ring, 2, [term([1, 1], 1), term([0, 2], 1), term([3, 0], c)])];
  const flow = { calculus, couplings: ['x', 'y'], loops: 2, beta } as unknown as DerivedFlow<Real>;
  const model = { classify: (v: readonly number[]) => (v.every((x) => Math.abs(x) < 1e-12) ? 'Gaussian' : `(${v.map((x) => (Math.abs(x) < 1e-12 ? 0 : Math.sign(x))).join(', ')})`) } as unknown as ModelSpec;
  return { flow, model };
}

// Hand computation: β_x = 0 gives x = ε exactly; then β_y = y² + c ε³, so y = ±√(−c) ε^{3/2}: a fold where
// the one-loop double root (1, 0) splits as ±ε^{3/2} — real for c < 0, a complex pair for c > 0.
test('a fold (saddle-node) of a hand-made flow: the merging points split as ±ε^{3/2}, real or complex as c < 0 or c > 0', () => {
  const { flow, model } = foldFlow(-1);
  const eps = flow.calculus.ctx.ring.fromRational(1n, 4n);
  const points = findFixedPoints(model, flow, { eps });
  const split = points.filter((p) => p.caveats?.some((x) => x.kind === 'degenerate-one-loop' && /ε\^\{3\/2\}/.test(x.message)));
  assert.equal(split.length, 2, points.map((p) => p.name).join(', '));
  const ys = split.map((p) => Number(p.couplingValues?.[1])).sort((a, b) => a - b);
  assert.deepEqual(ys, [-0.125, 0.125]); // ±ε^{3/2} at ε = 1/4
  split.forEach((p) => assert.equal(String(p.couplingValues?.[0]), '0.25'));

  const complex = findFixedPoints(foldFlow(1).model, foldFlow(1).flow, { eps });
  const pair = complex.filter((p) => p.status === 'complex' && p.couplingSeries !== null);
  assert.equal(pair.length, 1);
  assert.equal(pair[0].stable, false);
  assert.ok(pair[0].caveats?.some((x) => x.kind === 'complex-at-eps'));
  assert.ok(Math.abs(Number(pair[0].complexValues?.[1].im) - 0.125) < 1e-25, String(pair[0].complexValues?.[1].im));
});
