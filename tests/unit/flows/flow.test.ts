import { test } from 'node:test';
import assert from 'node:assert/strict';
import { onFamily, onModel, cubicModel } from '../../../shared/engine/models/index';
import { flowFor } from '../../../shared/engine/flows/index';
import { findFixedPoints } from '../../../shared/engine/fixedpoints/index';
import { exponentSeries } from '../../../shared/engine/exponents/index';
import { CATALOGUE, ConsistencyError, VERTEX_CORRECTED, integralKit, numericCalculus, subtractGraph, type DerivedFlow } from '../../../shared/engine/diagrams/index';
import { Expression, evaluateExpression, special } from '../../../shared/engine/index';
import { affineConstant } from '../../../shared/engine/symbolic/affine';
import { q } from '../../../shared/engine/symbolic/rational';
import { polyMul, polyScale } from '../../../shared/engine/symbolic/polynomial';
import { type Real } from '../../../shared/engine/precision/real';
import { aOfS, assertExprEqual, lin, num, ratio, sExpr, symbolicExponents } from '../helpers/flow';

const symbolic = symbolicExponents();

test('β(u) and γ_φ²(u) derived from diagrams, symbolic in s and N (docs/physics.md §5, derived)', () => {
  const beta = symbolic.flow.beta[0];
  const A = aOfS();
  assertExprEqual(beta.terms.get('2')?.coeff as Expression, ratio(lin(1, 8), num(3)), 'u² coefficient (N+8)/3');
  assertExprEqual(beta.terms.get('3')?.coeff as Expression, A.mul(ratio(lin(-10, -44), num(9))), 'u³ coefficient −2(5N+22)/9·A(s)');
  const g2 = symbolic.flow.gammaPhi2;
  assert.ok(g2);
  assertExprEqual(g2.terms.get('1')?.coeff as Expression, ratio(lin(1, 2), num(3)), 'γ_φ² u coefficient (N+2)/3');
  assertExprEqual(g2.terms.get('2')?.coeff as Expression, A.mul(ratio(lin(-1, -2), num(3))), 'γ_φ² u² coefficient −(N+2)/3·A(s)');
  assert.equal(symbolic.flow.gammaPhi.terms.size, 0, 'no field renormalization for generic s < 2 (docs/physics.md §2)');
});

test('1/ν and ω at two loops, symbolic in s and N (docs/physics.md §5, derived)', () => {
  const A = aOfS();
  const [c0, c1, c2] = symbolic.series.nuInv.coefficients();
  assertExprEqual(c0, sExpr(), '1/ν at ε⁰ = s');
  assertExprEqual(c1, ratio(lin(-1, -2), lin(1, 8)), '1/ν at ε¹ = −(N+2)/(N+8)');
  assertExprEqual(c2, A.mul(ratio(polyScale(polyMul(lin(1, 2), lin(7, 20)), q(-1)), lin(1, 8), 3)), '1/ν at ε² = −(N+2)(7N+20)/(N+8)³·A');
  const [, w1, w2] = symbolic.series.omega.coefficients();
  assertExprEqual(w1, Expression.rational(q(1)), 'ω at ε¹ = 1');
  assertExprEqual(w2, A.mul(ratio(lin(-10, -44), lin(1, 8), 2)), 'ω at ε² = −2(5N+22)/(N+8)²·A');
});

test('N = 1: 1/ν = s − ε/3 − (ε²/9)A(s) (Fisher–Ma–Nickel 1972, as quoted in Pagni et al. arXiv:2510.02458 eq. (44)), symbolic in s', () => {
  const ising = symbolicExponents(onModel(1));
  const [c0, c1, c2] = ising.series.nuInv.coefficients();
  assertExprEqual(c0, sExpr(), 'σ');
  assertExprEqual(c1, Expression.rational(q(-1, 3)), '−ε/3');
  assertExprEqual(c2, aOfS().scale(q(-1, 9)), '−A(σ)/9');
});

function numericNuInv(N: number, s: ReturnType<typeof q>) {
  const { flow } = flowFor({ model: onModel(N), s, loops: 2, digits: 30 });
  const f = flow as DerivedFlow<Real>;
  const wf = findFixedPoints(onModel(N), f, { eps: null }).find((p) => p.name !== 'Gaussian');
  assert.ok(wf);
  return exponentSeries(f, wf);
}

test('A(s) from the subtracted vertex-corrected graph (1/ε residue of K R̄) against closed forms A(1) = 4 ln 2, A(3/2) = 2 − π + 4 ln 2, A(2) = 1 (docs/physics.md §5, derived)', () => {
  const entry = CATALOGUE.find((e) => e.graph === VERTEX_CORRECTED);
  assert.ok(entry);
  const closed: [ReturnType<typeof q>, Real][] = [
    [q(1), special.ln2(40).times(4)],
    [q(3, 2), special.ln2(40).times(4).minus(special.pi(40)).plus(2)],
    [q(2), special.ln2(40).mul(0).plus(1)],
  ];
  for (const [s, expected] of closed) {
    const pole = subtractGraph(numericCalculus(s, 30), integralKit(affineConstant(s)), entry).pole;
    assert.ok(pole.coefficient(-1).minus(expected).abs().lt(1e-28), `s = ${s.num}/${s.den}: ${pole.coefficient(-1)} vs ${expected}`);
    assert.ok(pole.coefficient(-2).plus(2).abs().lt(1e-28), 'leading pole −2/ε² fixed by one-loop data');
  }
});

test('N = 1 at numeric s < 2: ε² coefficient of 1/ν is −A(s)/9 (Fisher–Ma–Nickel 1972, as quoted in Pagni et al. arXiv:2510.02458 eq. (44))', () => {
  const cases: [ReturnType<typeof q>, Real][] = [
    [q(1), special.ln2(40).times(4)],
    [q(3, 2), special.ln2(40).times(4).minus(special.pi(40)).plus(2)],
    // A(7/4) = ψ(1) − 2ψ(7/8) + ψ(7/4), evaluated with the special-function layer
    [q(7, 4), special.polygamma(0, '1', 40).minus(special.polygamma(0, '0.875', 40).times(2)).plus(special.polygamma(0, '1.75', 40))],
  ];
  for (const [s, A] of cases) {
    const series = numericNuInv(1, s);
    assert.ok(series.nuInv.coefficient(1).times(3).plus(1).abs().lt(1e-28), 'ε¹: −1/3');
    assert.ok(series.nuInv.coefficient(2).minus(A.div(-9)).abs().lt(1e-28), `s = ${s.num}/${s.den}: ${series.nuInv.coefficient(2)} vs ${A.div(-9)}`);
  }
});

test('s = 2 short-range limit, symbolic in N: η, 1/ν, ω (Wilson 1972; Kleinert & Schulte-Frohlinde 2001)', () => {
  const sr = symbolicExponents(onFamily, q(2));
  assert.ok(sr.flow.fieldRenormalized, 'the self-energy has a pole at s = 2');
  const eta = sr.series.eta.coefficients();
  assertExprEqual(eta[0], Expression.rational(q(0)), 'η at ε⁰');
  assertExprEqual(eta[1], Expression.rational(q(0)), 'η at ε¹');
  assertExprEqual(eta[2], ratio(lin(1, 2), polyScale(polyMul(lin(1, 8), lin(1, 8)), q(2))), 'η = (N+2)/(2(N+8)²) ε²');
  const nu = sr.series.nuInv.coefficients();
  assertExprEqual(nu[0], Expression.rational(q(2)), '1/ν at ε⁰');
  assertExprEqual(nu[1], ratio(lin(-1, -2), lin(1, 8)), '1/ν at ε¹');
  assertExprEqual(nu[2], ratio(polyScale(polyMul(lin(1, 2), lin(13, 44)), q(-1, 2)), lin(1, 8), 3), '1/ν at ε² = −(N+2)(13N+44)/(2(N+8)³)');
  const omega = sr.series.omega.coefficients();
  assertExprEqual(omega[2], ratio(polyScale(lin(3, 14), q(-3)), lin(1, 8), 2), 'ω at ε² = −3(3N+14)/(N+8)²');
});

test('large-N limit: Δ_φ² → s (common practice, large-N long-range result)', () => {
  const coefficients = symbolic.series.Delta_phi2.coefficients();
  const at = { N: q(10n ** 9n), s: q(3, 2) };
  assert.equal(evaluateExpression(coefficients[0], at, 20).toString(), '1.5');
  for (const k of [1, 2]) assert.ok(evaluateExpression(coefficients[k], at, 20).abs().lt(1e-7), `ε^${k} coefficient vanishes as N → ∞`);
});

test('exact relations for s < 2: Δφ = (d − s)/2 to all computed orders, Δφ + Δφ³ = d (Lohmann–Slade–Wallace 2017; Paulos et al. 2016)', () => {
  const [p0, p1, p2] = symbolic.series.Delta_phi.coefficients();
  assertExprEqual(p0, sExpr().scale(q(1, 2)), 'Δφ at ε⁰ = s/2');
  assertExprEqual(p1, Expression.rational(q(-1, 2)), 'Δφ at ε¹ = −1/2');
  assertExprEqual(p2, Expression.rational(q(0)), 'Δφ at ε² = 0');
  const sum = symbolic.series.Delta_phi.add(symbolic.series.Delta_phi3).coefficients();
  assertExprEqual(sum[0], sExpr().scale(q(2)), 'Δφ + Δφ³ at ε⁰ = 2s');
  assertExprEqual(sum[1], Expression.rational(q(-1)), 'Δφ + Δφ³ at ε¹ = −1');
  assertExprEqual(sum[2], Expression.rational(q(0)), 'Δφ + Δφ³ at ε² = 0');
});

function oneLoopStability(N: number) {
  const model = cubicModel(N);
  const { flow } = flowFor({ model, s: q(3, 2), loops: 1, digits: 20 });
  const f = flow as DerivedFlow<Real>;
  const points = findFixedPoints(model, f, { eps: f.calculus.ctx.ring.fromRational(1n, 10n) });
  return (name: string) => points.find((p) => p.name === name);
}

test('cubic anisotropy at one loop: cubic and O(N) fixed points exchange stability at N = 4 (common practice; Aharony 1973)', () => {
  const below = oneLoopStability(3);
  assert.equal(below('O(N)')?.stable, true, 'N = 3: O(N) stable');
  assert.equal(below('cubic')?.stable, false, 'N = 3: cubic unstable');
  const above = oneLoopStability(5);
  assert.equal(above('O(N)')?.stable, false, 'N = 5: O(N) unstable');
  assert.equal(above('cubic')?.stable, true, 'N = 5: cubic stable');
  const at = oneLoopStability(4);
  const on = at('O(N)');
  assert.ok(on && on.eigenvalueSeries, 'N = 4: O(N) point');
  const slopes = (on.eigenvalueSeries ?? []).map((e) => Math.abs(Number(String(e?.coefficient(1)))));
  assert.ok(Math.min(...slopes) < 1e-15, 'N = 4: a marginal direction (the fixed points merge)');
});

test('custom potential equal to the O(2) tensor reproduces the O(2) preset exactly (symbolic in s)', async () => {
  const { customModel } = await import('../../../shared/engine/models/index');
  const custom = symbolicExponents(customModel(2, 'u/24*(phi1^2+phi2^2)^2'));
  const preset = symbolicExponents(onModel(2));
  for (const key of ['nuInv', 'omega', 'Delta_phi2'] as const) {
    custom.series[key].coefficients().forEach((c, k) => assertExprEqual(c, preset.series[key].coefficients()[k], `${key} ε^${k}`));
  }
  assertExprEqual(custom.flow.beta[0].terms.get('3')?.coeff as Expression, preset.flow.beta[0].terms.get('3')?.coeff as Expression, 'β u³');
});

test('a wrong subtraction is caught: dropping the subdivergence of the vertex-corrected graph leaves ln(p²)/ε (consistency check throws)', () => {
  const entry = CATALOGUE.find((e) => e.graph === VERTEX_CORRECTED);
  assert.ok(entry);
  const calc = numericCalculus(q(3, 2), 20);
  const kit = integralKit(affineConstant(q(3, 2)));
  assert.doesNotThrow(() => subtractGraph(calc, kit, entry));
  assert.throws(() => subtractGraph(calc, kit, { ...entry, subdivergences: [] }), ConsistencyError);
});
