import { test } from 'node:test';
import assert from 'node:assert/strict';
import { customModel, cubicModel, onModel } from '../../../shared/engine/models/index';
import { type QuarticModel } from '../../../shared/engine/models/model';
import { tensorFrom } from '../../../shared/engine/models/tensor';
import { deriveFlow, symbolicCalculus, type DerivedFlow } from '../../../shared/engine/diagrams/index';
import { explainLegCorrection, legCorrectionOutside } from '../../../shared/engine/diagrams/fieldWeights';
import { flowFor } from '../../../shared/engine/flows/index';
import { findFixedPoints, type FixedPoint } from '../../../shared/engine/fixedpoints/index';
import { quadraticSpectrum } from '../../../shared/engine/exponents/quadratic';
import { fieldAnomalousSpectrum } from '../../../shared/engine/exponents/fieldMatrix';
import { type Real } from '../../../shared/engine/precision/real';
import { type Q, Q0, q, qMul } from '../../../shared/engine/symbolic/rational';
import { ANISO, ROTATED, anisoStructures, assertTensorsEqual, betaRef, engineBetaTensor, gammaRef, lambdaOf, pAdd, pConst, pEqual, pText, rotated, toP } from '../helpers/tensorReference';
import { runFlowJob } from '../../../shared/jobs/flowJobs';
import { FlowResult } from '../../../shared/jobs/contract/flow';

type Any = Record<string, any>;

const exactFlowAtTwo = (model: QuarticModel) => deriveFlow(model, symbolicCalculus(q(2)), 2);

test('the recalled general-tensor formulas reduce to the O(N) textbook values (N = 3): β = −ελ + (N+8)/3 λ² − (3N+14)/3 λ³, γ_φ = (N+2)/36 λ² (Wilson, PRL 28 (1972) 548; Kleinert & Schulte-Frohlinde 2001; recalled from memory)', () => {
  const N = 3;
  const pairing = (i: number[]) => q((i[0] === i[1] && i[2] === i[3] ? 1 : 0) + (i[0] === i[2] && i[1] === i[3] ? 1 : 0) + (i[0] === i[3] && i[1] === i[2] ? 1 : 0), 3);
  const l = lambdaOf(N, [pairing]);
  const b = betaRef(l, 1);
  // entry 1111 of the O(N) tensor is λ: the β coefficient is read there
  assert.ok(pEqual(b.e[0], new Map([['2', q(N + 8, 3)], ['3', q(-(3 * N + 14), 3)]])), pText(b.e[0]));
  assert.ok(pEqual(gammaRef(l, 1)[0][0], new Map([['2', q(N + 2, 36)]])));
});

test('anisotropic 2-field model at s = 2: two-loop β and the γ_φ matrix equal the general-tensor formulas (exact rationals; formulas recalled from memory)', () => {
  const flow = exactFlowAtTwo(customModel(2, ANISO));
  assert.ok(flow.gammaPhiMatrix, 'γ_φ is a matrix for u ≠ v');
  const l = lambdaOf(2, anisoStructures);
  assertTensorsEqual(engineBetaTensor(flow, 2, anisoStructures), betaRef(l, 3), 'β');
  const g = gammaRef(l, 3);
  flow.gammaPhiMatrix.forEach((row, a) => row.forEach((p, b) => assert.ok(pEqual(toP(p), g[a][b]), `γ_φ(${a + 1},${b + 1}): ${pText(toP(p))} vs ${pText(g[a][b])}`)));
  // tr γ_φ / n is what gammaPhi keeps (documented convention)
  assert.ok(pEqual(toP(flow.gammaPhi), new Map([...pAdd(g[0][0], g[1][1])].map(([m, c]) => [m, qMul(c, q(1, 2))]))));
  assert.equal(flow.gammaPhi2, null, 'φ_aφ_a mixes');
});

test('the same model in rotated fields (φ1 ± φ2)/√2: off-diagonal γ_φ and β equal the general-tensor formulas, and β equals the unrotated β (field rotations do not change β of the couplings; common practice)', () => {
  const flow = exactFlowAtTwo(customModel(2, ROTATED));
  const structures = anisoStructures.map(rotated);
  const l = lambdaOf(2, structures);
  assertTensorsEqual(engineBetaTensor(flow, 2, structures), betaRef(l, 3), 'β (rotated)');
  const g = gammaRef(l, 3);
  assert.ok(flow.gammaPhiMatrix);
  assert.ok(!pEqual(g[0][1], pConst(3, Q0)), 'the reference γ_φ has off-diagonal entries here');
  flow.gammaPhiMatrix.forEach((row, a) => row.forEach((p, b) => assert.ok(pEqual(toP(p), g[a][b]), `γ_φ(${a + 1},${b + 1})`)));
  const plain = exactFlowAtTwo(customModel(2, ANISO));
  flow.beta.forEach((p, k) => assert.ok(pEqual(toP(p), toP(plain.beta[k])), `β_${flow.couplings[k]} rotated = unrotated`));
});

test('isotropic models are unchanged: O(3) and cubic(3) at s = 2 keep a scalar γ_φ and match the general-tensor formulas (cubic tensor λ = u/3(δδ+δδ+δδ) + v δ_abcd, written out here)', () => {
  const pairing = (i: number[]) => q((i[0] === i[1] && i[2] === i[3] ? 1 : 0) + (i[0] === i[2] && i[1] === i[3] ? 1 : 0) + (i[0] === i[3] && i[1] === i[2] ? 1 : 0), 3);
  const diagonal = (i: number[]) => q(i.every((x) => x === i[0]) ? 1 : 0);
  for (const [model, structures] of [[onModel(3), [pairing]], [cubicModel(3), [pairing, diagonal]]] as const) {
    const flow = exactFlowAtTwo(model);
    assert.equal(flow.gammaPhiMatrix ?? null, null, `${model.label}: γ_φ ∝ δ`);
    const l = lambdaOf(3, [...structures]);
    assertTensorsEqual(engineBetaTensor(flow, 3, [...structures]), betaRef(l, structures.length), `${model.label} β`);
    assert.ok(pEqual(toP(flow.gammaPhi), gammaRef(l, structures.length)[0][0]), `${model.label} γ_φ`);
    assert.ok(flow.gammaPhi2, `${model.label}: γ_φ² still defined`);
  }
});

test('a leg correction outside the couplings is named: an off-diagonal W on the legs of the anisotropic couplings generates phi1^3*phi2 and phi1*phi2^3 (hand: W_12 moves one index 1 ↔ 2)', () => {
  const model = customModel(2, ANISO);
  const offDiagonal = tensorFrom(2, 2, ([a, b]) => (a === b ? 0 : 1));
  assert.deepEqual(legCorrectionOutside(model, offDiagonal, model.basis[0]), ['phi1^3*phi2']);
  assert.deepEqual(legCorrectionOutside(model, offDiagonal, model.basis[2]).sort(), ['phi1*phi2^3', 'phi1^3*phi2']);
  const diagonal = tensorFrom(2, 2, ([a, b]) => (a === b ? a + 1 : 0));
  assert.deepEqual(legCorrectionOutside(model, diagonal, model.basis[2]), [], 'a diagonal W keeps each monomial');
  assert.equal(explainLegCorrection(model), null, 'the anisotropic model is closed');
  assert.equal(explainLegCorrection(customModel(2, ROTATED)), null, 'and so is its rotation');
});

// ---- fixed points at s = 2, numeric ----------------------------------------------------------------

function numericPoints(potential: string, s: Q, eps: Q) {
  const model = customModel(2, potential);
  const { flow } = flowFor({ model, s, loops: 2, digits: 30 });
  const f = flow as DerivedFlow<Real>;
  const ring = f.calculus.ctx.ring;
  const e = ring.fromRational(eps.num, eps.den);
  return { model, flow: f, e, points: findFixedPoints(model, f, { eps: e }) };
}
const close = (a: unknown, b: number, tol: number, label: string) => assert.ok(Math.abs(Number(String(a)) - b) < tol, `${label}: ${String(a)} vs ${b}`);
const leading = (p: FixedPoint<Real>) => (p.couplingSeries ?? []).map((x) => Number(String(x.coefficient(1))));

test('anisotropic model, s = 2, point u* = ε/3, v* = w* = 0 (Ising ⊕ free field): γ_φ directions phi1 with ε²/108 (η_Ising/2 = (N+2)/(4(N+8)²), N = 1; Wilson 1972) and phi2 with 0 (free); φ1φ2 has γ = ε²/108 and φ2² has γ = 0 (hand: Δ(φ1φ2) = Δφ1 + Δφ2, Δ(φ2²) = 2Δφ2)', () => {
  const { flow, e, points } = numericPoints(ANISO, q(2), q(1, 5));
  const ising = points.find((p) => { const [u, v, w] = leading(p); return Math.abs(u - 1 / 3) < 1e-12 && v === 0 && w === 0; });
  assert.ok(ising, 'the u-only point');
  const spectrum = fieldAnomalousSpectrum(flow, ising, e);
  assert.equal(spectrum.proportional, false);
  const byField = Object.fromEntries(spectrum.directions.map((d) => [d.field, d]));
  assert.deepEqual(Object.keys(byField).sort(), ['phi1', 'phi2']);
  close(byField.phi1.gammaSeries.coefficient(2), 1 / 108, 1e-25, 'γ_φ1 at ε²');
  close(byField.phi1.gammaSeries.coefficient(1), 0, 1e-25, 'γ_φ1 at ε¹');
  close(byField.phi2.gammaSeries.coefficient(2), 0, 1e-25, 'γ_φ2 at ε²');
  close(byField.phi1.value, 1 / 108 / 25, 1e-25, 'γ_φ1 at ε = 1/5 (truncated series)');
  const quad = quadraticSpectrum(flow, ising, flow.calculus.ctx.ring.fromRational(2n), 2);
  assert.ok(quad);
  const op = (name: string) => quad.operators.find((o) => o.operator === name);
  close(op('phi1*phi2')?.gammaSeries.coefficient(2), 1 / 108, 1e-25, 'γ(φ1φ2) at ε²');
  close(op('phi1*phi2')?.gammaSeries.coefficient(1), 0, 1e-25, 'γ(φ1φ2) at ε¹');
  close(op('phi2^2')?.gammaSeries.coefficient(2), 0, 1e-25, 'γ(φ2²) at ε²');
  // φ1² is the Ising energy operator: γ = 2 − 1/ν = ε/3 + 19ε²/162 (N = 1 of (N+2)(13N+44)/(2(N+8)³); Wilson 1972)
  close(op('phi1^2')?.gammaSeries.coefficient(1), 1 / 3, 1e-25, 'γ(φ1²) at ε¹');
  close(op('phi1^2')?.gammaSeries.coefficient(2), 19 / 162, 1e-25, 'γ(φ1²) at ε²');
});

test('rotated model at the same point: γ_φ eigen-directions phi1 + phi2 (ε²/108) and phi1 - phi2 (0), found by diagonalizing the non-diagonal matrix', () => {
  const { flow, e, points } = numericPoints(ROTATED, q(2), q(1, 5));
  const ising = points.find((p) => { const [u, v, w] = leading(p); return Math.abs(u - 1 / 3) < 1e-12 && v === 0 && w === 0; });
  assert.ok(ising);
  const spectrum = fieldAnomalousSpectrum(flow, ising, e);
  const byField = Object.fromEntries(spectrum.directions.map((d) => [d.field, d]));
  assert.deepEqual(Object.keys(byField).sort(), ['phi1 + phi2', 'phi1 - phi2']);
  close(byField['phi1 + phi2'].gammaSeries.coefficient(2), 1 / 108, 1e-25, 'γ along φ1 + φ2');
  close(byField['phi1 - phi2'].gammaSeries.coefficient(2), 0, 1e-25, 'γ along φ1 − φ2');
  assert.ok(byField['phi1 + phi2'].atRoot, 'value at the numeric root');
});

test('anisotropic model at its O(2) point u = v = 3w: γ_φ ∝ δ there, one direction with γ = ε²/100 (η_O(2)/2 = (N+2)/(4(N+8)²); Wilson 1972)', () => {
  const { flow, e, points } = numericPoints(ANISO, q(2), q(1, 5));
  const o2 = points.find((p) => { const [u, v, w] = leading(p); return u > 0 && Math.abs(u - v) < 1e-12 && Math.abs(u - 3 * w) < 1e-12; });
  assert.ok(o2, 'the O(2) point');
  const spectrum = fieldAnomalousSpectrum(flow, o2, e);
  assert.equal(spectrum.proportional, true);
  assert.equal(spectrum.directions.length, 1);
  assert.equal(spectrum.directions[0].multiplicity, 2);
  close(spectrum.directions[0].gammaSeries.coefficient(2), 1 / 100, 1e-25, 'γ_φ at ε²');
  // φ1² − φ2² (symmetric traceless) through the matrix path: with y_T = s − γ_T and the crossover exponent
  // φ_T = y_T ν = 1 + Nε/(2(N+8)) + (N³+24N²+68N)ε²/(4(N+8)³) (recalled from memory; Wilson 1972, Fisher–Pfeuty 1972),
  // N = 2 and 1/ν = 2 − 0.4ε − 0.14ε² give γ_T = 0.2ε + 0.06ε²
  const quad = quadraticSpectrum(flow, o2, flow.calculus.ctx.ring.fromRational(2n), 2);
  const traceless = quad?.operators.find((o) => o.name === 'symmetric traceless');
  assert.ok(traceless, 'φ1² − φ2² and φ1φ2 degenerate at the O(2) point');
  assert.equal(traceless.multiplicity, 2);
  close(traceless.gammaSeries.coefficient(1), 0.2, 1e-25, 'γ_T at ε¹');
  close(traceless.gammaSeries.coefficient(2), 0.06, 1e-25, 'γ_T at ε²');
});

test('s = 1.7: no field renormalization for s < 2 (Lohmann–Slade–Wallace 2017; docs/physics.md §Exact statements): no matrix, γ_φ = 0 on every field', () => {
  const { flow, e, points } = numericPoints(ANISO, q(17, 10), q(1, 5));
  assert.equal(flow.gammaPhiMatrix ?? null, null);
  assert.equal(flow.fieldRenormalized, false);
  const point = points.find((p) => p.name !== 'Gaussian' && p.couplingSeries);
  assert.ok(point);
  const spectrum = fieldAnomalousSpectrum(flow, point, e);
  assert.equal(spectrum.proportional, true);
  spectrum.directions[0].gammaSeries.coefficients().forEach((c, m) => close(c, 0, 1e-25, `γ_φ at ε^${m}`));
});

test('flow job: gamma_phi_matrix shown for the anisotropic model at s = 2 (entries (u²+3w²)/12, (v²+3w²)/12 as in the formula above) and absent for O(2); both validate against FlowResult', () => {
  const r = runFlowJob({ job: 'flow', model: { preset: 'custom', fields: 2, potential: ANISO }, s: '2', digits: 10 }) as Any;
  assert.equal(r.error, undefined, JSON.stringify(r.error));
  assert.ok(FlowResult.safeParse(r).success);
  assert.deepEqual(r.gamma_phi_matrix.fields, ['phi1', 'phi2']);
  assert.deepEqual(r.gamma_phi_matrix.matrix[0][0], [{ monomial: 'u^2', coeff: '0.08333333333' }, { monomial: 'w^2', coeff: '0.25' }]);
  assert.deepEqual(r.gamma_phi_matrix.matrix[0][1], []);
  const sunset = r.trail.find((t: Any) => t.graph === 'sunset');
  assert.deepEqual(sunset.weight.find((w: Any) => w.monomial === 'w^2').projections, { '(1,1)': '-1/2', '(1,2)': '0', '(2,2)': '-1/2' });
  const o2 = runFlowJob({ job: 'flow', model: { preset: 'on', N: 2 }, s: '2', digits: 10 }) as Any;
  assert.ok(FlowResult.safeParse(o2).success);
  assert.equal(o2.gamma_phi_matrix, undefined);
});
