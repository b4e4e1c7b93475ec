import { test } from 'node:test';
import assert from 'node:assert/strict';
import { customModel, onModel } from '../../../shared/engine/models/index';
import { flowFor } from '../../../shared/engine/flows/index';
import { findFixedPoints } from '../../../shared/engine/fixedpoints/index';
import { exponentSeries, quadraticSpectrum } from '../../../shared/engine/exponents/index';
import { type DerivedFlow } from '../../../shared/engine/diagrams/index';
import { type Expression } from '../../../shared/engine/index';
import { type Real } from '../../../shared/engine/precision/real';
import { q } from '../../../shared/engine/symbolic/rational';
import { runFlowJob } from '../../../shared/jobs/flowJobs';
import { type CouplingPolynomial } from '../../../shared/engine/models/couplingPolynomial';
import { assertExprEqual, num, ratio } from '../helpers/flow';

type Any = Record<string, any>;
const close = (a: string | number | Real, b: string | number | Real, tol: number, label: string) => assert.ok(Math.abs(Number(String(a)) - Number(String(b))) < tol, `${label}: ${String(a)} vs ${String(b)}`);

function numericAt(model: ReturnType<typeof onModel>, s: bigint[], eps: bigint[]) {
  const { flow } = flowFor({ model, s: q(s[0], s[1]), loops: 2, digits: 30 });
  const f = flow as DerivedFlow<Real>;
  const { ring } = f.calculus.ctx;
  const points = findFixedPoints(model, f, { eps: ring.fromRational(eps[0], eps[1]) });
  return { flow: f, points, ring };
}

function assertPolyEqual(a: CouplingPolynomial<Expression>, b: CouplingPolynomial<Expression>, label: string) {
  const keys = new Set([...a.terms.keys(), ...b.terms.keys()]);
  for (const k of keys) {
    const x = a.terms.get(k)?.coeff;
    const y = b.terms.get(k)?.coeff;
    if (!x) assert.ok(y?.isZero(), `${label} [${k}] missing`);
    else if (!y) assert.ok(x.isZero(), `${label} [${k}] extra`);
    else assertExprEqual(x, y, `${label} [${k}]`);
  }
}

test('O(3): the quadratic-operator matrix applied to δ reproduces the singlet γ_φ² of the identity insertion (same graphs, independent projection), symbolic in s', () => {
  const { flow } = flowFor({ model: onModel(3), s: null, loops: 2, digits: 30 });
  const f = flow as DerivedFlow<Expression>;
  assert.ok(f.quadratic && f.gammaPhi2);
  const { pairs, gamma } = f.quadratic;
  const diagonal = pairs.map(([i, j], c) => (i === j ? c : -1)).filter((c) => c >= 0);
  pairs.forEach(([k, l], r) => {
    let applied = gamma[r][diagonal[0]];
    for (const c of diagonal.slice(1)) applied = applied.add(gamma[r][c]);
    if (k === l) assertPolyEqual(applied, f.gammaPhi2 as CouplingPolynomial<Expression>, `(γ·δ)_${k}${l} = γ_φ²`);
    else assert.ok([...applied.terms.values()].every((t) => t.coeff.isZero()), `(γ·δ)_${k}${l} = 0`);
  });
});

test('O(3): symmetric-traceless one-loop γ_T = 2u/3 (hand: Σ_ef t_ef λ_efab = u/3 (tr t δ_ab + 2 t_ab), weight 2/6 vs singlet (N+2)/6, common practice), symbolic in s', () => {
  const { flow } = flowFor({ model: onModel(3), s: null, loops: 2, digits: 30 });
  const f = flow as DerivedFlow<Expression>;
  assert.ok(f.quadratic);
  const r = f.quadratic.pairs.findIndex(([i, j]) => i === 0 && j === 1);
  assertExprEqual(f.quadratic.gamma[r][r].terms.get('1')?.coeff as Expression, ratio(num(2), num(3)), 'γ_(12),(12) u coefficient 2/3');
  const singlet = f.gammaPhi2?.terms.get('1')?.coeff as Expression;
  assertExprEqual(singlet, ratio(num(5), num(3)), 'singlet u coefficient (N+2)/3 = 5/3 (docs/physics.md §5)');
});

test('O(N) at numeric s: eigen-operators singlet (×1) and symmetric traceless (×N(N+1)/2−1); singlet Δ equals Δ_φ², traceless γ = 2ε/(N+8) + O(ε²) (hand, from γ_T = 2u/3 and u* = 3ε/(N+8))', () => {
  for (const N of [2, 3]) {
    const model = onModel(N);
    const { flow, points, ring } = numericAt(model, [7n, 4n], [1n, 2n]);
    const wf = points.find((p) => p.name === 'O(N)');
    assert.ok(wf);
    const spectrum = quadraticSpectrum(flow, wf, ring.fromRational(7n, 4n), N);
    assert.ok(spectrum);
    const byName = Object.fromEntries(spectrum.operators.map((o) => [o.name, o]));
    assert.deepEqual(spectrum.operators.map((o) => `${o.name}×${o.multiplicity}`).sort(), ['singlet×1', `symmetric traceless×${(N * (N + 1)) / 2 - 1}`]);
    const delta2 = exponentSeries(flow, wf).Delta_phi2.coefficients();
    byName.singlet.deltaSeries.coefficients().forEach((c, k) => close(c, delta2[k], 1e-25, `N=${N} singlet Δ ε^${k} = Δ_φ² (identity insertion)`));
    close(byName['symmetric traceless'].gammaSeries.coefficient(1), 2 / (N + 8), 1e-25, `N=${N} traceless γ ε¹ = 2/(N+8)`);
  }
});

test('decoupled Ising pair u/24(φ1⁴+φ2⁴): the matrix is diagonal, φ1² and φ2² entries equal the N = 1 singlet γ_φ², φ1φ2 has γ = 0 (hand: product of independent fields, Δ = 2Δφ), symbolic in s', () => {
  const pair = flowFor({ model: customModel(2, 'u/24*(phi1^4+phi2^4)'), s: null, loops: 2, digits: 30 }).flow as DerivedFlow<Expression>;
  const ising = flowFor({ model: onModel(1), s: null, loops: 2, digits: 30 }).flow as DerivedFlow<Expression>;
  assert.ok(pair.quadratic && ising.gammaPhi2);
  const { pairs, gamma } = pair.quadratic;
  pairs.forEach(([i, j], r) => pairs.forEach((_, c) => {
    if (r !== c) assert.ok([...gamma[r][c].terms.values()].every((t) => t.coeff.isZero()), `off-diagonal entry (${r},${c}) vanishes`);
  }));
  pairs.forEach(([i, j], r) => {
    if (i === j) assertPolyEqual(gamma[r][r], ising.gammaPhi2 as CouplingPolynomial<Expression>, `γ_(${i + 1}${j + 1}) = Ising γ_φ²`);
    else assert.equal([...gamma[r][r].terms.values()].filter((t) => !t.coeff.isZero()).length, 0, 'γ_(12) = 0');
  });
});

test('mixing model u/24 φ1⁴ + w/24 φ2⁴: γ_φ² singlet is unavailable, the matrix is not; at u* = w* both φ_a² have the Ising Δ_φ² (independent: O(1) exponents job)', () => {
  const model = { preset: 'custom', fields: 2, potential: 'u/24*phi1^4 + w/24*phi2^4' };
  const flow = runFlowJob({ job: 'flow', model, s: '1.75', digits: 20 }) as Any;
  assert.ok(flow.gamma_phi2.note, 'singlet insertion not proportional to δ');
  assert.deepEqual(flow.gamma_quadratic.operators, ['phi1^2', 'phi1*phi2', 'phi2^2']);
  const fp = runFlowJob({ job: 'fixedpoints', model, d: '3', s: '1.75', digits: 20 }) as Any;
  const both = fp.fixedPoints.find((p: Any) => p.name === 'all couplings (u, w)');
  const diag = both.quadraticOperators.find((o: Any) => o.name === 'diagonal');
  assert.equal(diag.multiplicity, 2);
  const ising = runFlowJob({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', digits: 20 }) as Any;
  diag.series.Delta.forEach((c: string, k: number) => close(c, ising.series.Delta_phi2[k], 1e-17, `Δ ε^${k}`));
  close(diag.values.Delta, ising.values.Delta_phi2, 1e-17, 'Δ value at ε = 1/2');
});

test('cubic N = 3 at the cubic point: quadratic operators split as 1 + (N−1) + N(N−1)/2 (singlet, diagonal traceless, off-diagonal; common practice, cubic-group decomposition of the symmetric 2-tensor); singlet Δ = Δ_φ² of the exponents job', () => {
  const r = runFlowJob({ job: 'exponents', model: { preset: 'cubic', N: 3 }, d: '3.9', s: '2', digits: 20, fixedPoint: 'cubic' }) as Any;
  const ops = r.quadraticOperators as Any[];
  assert.deepEqual(ops.map((o) => `${o.name}×${o.multiplicity}`).sort(), ['diagonal traceless×2', 'off-diagonal×3', 'singlet×1']);
  const singlet = ops.find((o) => o.name === "singlet") as Any;
  singlet.series.Delta.forEach((c: string, k: number) => close(c, r.series.Delta_phi2[k], 1e-17, `singlet Δ ε^${k}`));
});

test('mixing model u/24 φ1⁴ + w/24 φ2⁴: the exponents job picks u* = w* and, with φ_aφ_a an eigen-operator there, gives the Ising 1/ν, ω, Δ_φ² (hand: two decoupled Ising copies; independent: O(1) exponents job)', () => {
  const r = runFlowJob({ job: 'exponents', model: { preset: 'custom', fields: 2, potential: 'u/24*phi1^4 + w/24*phi2^4' }, d: '3', s: '1.75', digits: 20 }) as Any;
  assert.equal(r.error, undefined, JSON.stringify(r.error));
  assert.equal(r.fixedPoint, 'all couplings (u, w)');
  const ising = runFlowJob({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', digits: 20 }) as Any;
  for (const k of ['nuInv', 'omega', 'Delta_phi2']) {
    r.series[k].forEach((c: string, m: number) => close(c, ising.series[k][m], 1e-17, `${k} ε^${m}`));
    close(r.values[k], ising.values[k], 1e-17, `${k} value`);
  }
});
