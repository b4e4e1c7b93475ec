import { test } from 'node:test';
import assert from 'node:assert/strict';
import DecimalBase from 'decimal.js';
import { type DerivedFlow, deriveFlow, numericCalculus, symbolicCalculus } from '../../../shared/engine/diagrams/index';
import { customModel } from '../../../shared/engine/models/index';
import { type CouplingPolynomial } from '../../../shared/engine/models/couplingPolynomial';
import { flowFor } from '../../../shared/engine/flows/index';
import { type FixedPoint, findFixedPoints } from '../../../shared/engine/fixedpoints/index';
import { fieldAnomalousSpectrum } from '../../../shared/engine/exponents/fieldMatrix';
import { quadraticSpectrum } from '../../../shared/engine/exponents/quadratic';
import { type Expression, evaluateExpression } from '../../../shared/engine/symbolic/index';
import { type Real } from '../../../shared/engine/precision/real';
import { q } from '../../../shared/engine/symbolic/rational';
import { runFlowJob } from '../../../shared/jobs/flowJobs';
import { FlowResult } from '../../../shared/jobs/contract/flow';
import { ANISO, ROTATED, type P, type PT, anisoStructures, gammaRef, idx, lambdaOf, pAdd, pConst, pEqual, pMul, pText, rotated, toP } from '../helpers/tensorReference';
import { ZETA3, onThreeLoopExponents } from '../helpers/threeLoop';

/**
 * Three loops at s = 2 for a model whose field renormalization is a matrix not ∝ δ_ab: the
 * anisotropic two-field model u/24 φ1⁴ + v/24 φ2⁴ + w/4 φ1²φ2² and the same model in the rotated
 * fields (φ1 ± φ2)/√2 (tests/unit/helpers/tensorReference.ts), where γ_φ has off-diagonal entries.
 */

const Decimal = DecimalBase.clone({ precision: 60 });
type Decimal = InstanceType<typeof Decimal>;
const DIGITS = 35;
const TOL = new Decimal('1e-30');
const z3 = new Decimal(ZETA3);

const cache = new Map<string, DerivedFlow<Expression>>();
const exactAtTwo = (potential: string) => {
  if (!cache.has(potential)) cache.set(potential, deriveFlow(customModel(2, potential), symbolicCalculus(q(2)), 3));
  return cache.get(potential) as DerivedFlow<Expression>;
};

const value = (e: Expression) => new Decimal(evaluateExpression(e, {}, DIGITS).toString());
/** Coefficients by monomial "a,b,c", as decimals (ζ(3) evaluated). */
const coefficients = (p: CouplingPolynomial<Expression>) => new Map([...p.terms.values()].map((t) => [t.powers.join(','), value(t.coeff)]));
const at = (p: CouplingPolynomial<Expression>, g: Decimal[]) => [...p.terms.values()].reduce((sum, t) => sum.plus(t.powers.reduce((m, e, i) => m.times(g[i].pow(e)), value(t.coeff))), new Decimal(0));

function assertClose(a: Decimal, b: Decimal, label: string) {
  assert.ok(a.minus(b).abs().lte(TOL.times(b.abs().plus(1))), `${label}: ${a.toString()} ≠ ${b.toString()}`);
}
function assertSamePolynomial(a: CouplingPolynomial<Expression>, b: Map<string, Decimal>, label: string) {
  const ca = coefficients(a);
  for (const key of new Set([...ca.keys(), ...b.keys()])) assertClose(ca.get(key) ?? new Decimal(0), b.get(key) ?? new Decimal(0), `${label} [${key}]`);
}

// Single-component φ⁴ in MS, d = 4 − ε, u = λ/(16π²), V = (u/4!)φ⁴ (Kleinert & Schulte-Frohlinde 2001, ch. 11,
// recalled from memory; the engine's O(N) derivation is checked against the same functions in threeLoop.test.ts):
//   β(u) = 3u² − 17/3 u³ + (145/8 + 12ζ(3)) u⁴ (+ the −εu),   γ_φ(u) = u²/12 − u³/16.
const isingBeta = [new Decimal(3), new Decimal(-17).div(3), new Decimal(145).div(8).plus(z3.times(12))];
const isingGamma = [new Decimal(1).div(12), new Decimal(-1).div(16)];
/** O(N) with λ = u/3 (δδ + δδ + δδ), same source: β and γ_φ coefficients of u², u³ (u⁴). */
const onBeta = (N: number) => [new Decimal(N + 8).div(3), new Decimal(-(3 * N + 14)).div(3), new Decimal(33 * N * N + 922 * N + 2960).plus(z3.times(96 * (5 * N + 22))).div(216)];
const onGamma = (N: number) => [new Decimal(N + 2).div(36), new Decimal(-(N + 2) * (N + 8)).div(432)];
const series = (coeffs: Decimal[], first: number, g: Decimal) => coeffs.reduce((sum, c, i) => sum.plus(c.times(g.pow(first + i))), new Decimal(0));

test('three loops, s = 2, anisotropic model at w = 0: two decoupled Ising models, β_u = β_Ising(u), β_v = β_Ising(v), β_w = 0, γ_φ = diag(γ_Ising(u), γ_Ising(v)) (decoupled theories, common practice; Ising functions recalled from memory, Kleinert & Schulte-Frohlinde 2001)', () => {
  const flow = exactAtTwo(ANISO);
  assert.ok(flow.gammaPhiMatrix, 'γ_φ is a matrix');
  // the terms without w, and a single-variable series written as monomials "a,b,c"
  const restrict = (p: CouplingPolynomial<Expression>) => new Map([...coefficients(p)].filter(([key]) => key.endsWith(',0')));
  const only = (variable: 0 | 1, coeffs: Decimal[], first: number) => new Map(coeffs.map((c, i) => [variable === 0 ? `${first + i},0,0` : `0,${first + i},0`, c]));
  const compare = (actual: Map<string, Decimal>, expected: Map<string, Decimal>, label: string) => {
    for (const key of new Set([...actual.keys(), ...expected.keys()])) assertClose(actual.get(key) ?? new Decimal(0), expected.get(key) ?? new Decimal(0), `${label} [${key}]`);
  };
  compare(restrict(flow.beta[0]), only(0, isingBeta, 2), 'β_u(u, v, 0)');
  compare(restrict(flow.beta[1]), only(1, isingBeta, 2), 'β_v(u, v, 0)');
  compare(restrict(flow.beta[2]), new Map(), 'β_w(u, v, 0)');
  compare(restrict(flow.gammaPhiMatrix[0][0]), only(0, isingGamma, 2), 'γ_11(u, v, 0)');
  compare(restrict(flow.gammaPhiMatrix[1][1]), only(1, isingGamma, 2), 'γ_22(u, v, 0)');
  assertSamePolynomial(flow.gammaPhiMatrix[0][1], new Map(), 'γ_12 (φ1 → −φ1 symmetry)');
  assert.ok(flow.checks.some((c) => c.startsWith('self-energy (the matrix Z_φ)')), 'matrix pole equations checked');
  assert.equal(flow.gammaPhi2, null, 'φ_aφ_a mixes');
});

test('three loops, s = 2, anisotropic model on its O(2) line u = v = 3w: β_u = β_v = 3β_w = β_O(2)(u) and γ_φ = γ_O(2)(u) δ (O(N) functions at N = 2, recalled from memory, Kleinert & Schulte-Frohlinde 2001)', () => {
  const flow = exactAtTwo(ANISO);
  const u = new Decimal('0.23');
  const g = [u, u, u.div(3)];
  const o2 = series(onBeta(2), 2, u);
  assertClose(at(flow.beta[0], g), o2, 'β_u');
  assertClose(at(flow.beta[1], g), o2, 'β_v');
  assertClose(at(flow.beta[2], g).times(3), o2, '3β_w');
  const gamma = series(onGamma(2), 2, u);
  assert.ok(flow.gammaPhiMatrix);
  assertClose(at(flow.gammaPhiMatrix[0][0], g), gamma, 'γ_11');
  assertClose(at(flow.gammaPhiMatrix[1][1], g), gamma, 'γ_22');
  assertClose(at(flow.gammaPhiMatrix[0][1], g), new Decimal(0), 'γ_12');
});

test('three loops, s = 2, rotated fields (φ1 ± φ2)/√2: β of the couplings equals the unrotated β term by term, and γ_φ is Oᵀ γ_φ O with O = [[1, 1], [1, −1]]/√2 (field rotations; common practice)', () => {
  const plain = exactAtTwo(ANISO);
  const turned = exactAtTwo(ROTATED);
  turned.beta.forEach((p, k) => assertSamePolynomial(p, coefficients(plain.beta[k]), `β_${turned.couplings[k]}`));
  assert.ok(plain.gammaPhiMatrix && turned.gammaPhiMatrix);
  const R = [[1, 1], [1, -1]];
  const g = plain.gammaPhiMatrix.map((row) => row.map(coefficients));
  for (let a = 0; a < 2; a++) for (let b = 0; b < 2; b++) {
    const expected = new Map<string, Decimal>();
    for (let x = 0; x < 2; x++) for (let y = 0; y < 2; y++) for (const [key, c] of g[x][y]) expected.set(key, (expected.get(key) ?? new Decimal(0)).plus(c.times(R[x][a] * R[y][b]).div(2)));
    assertSamePolynomial(turned.gammaPhiMatrix[a][b], expected, `γ'(${a + 1},${b + 1})`);
  }
  assert.ok(coefficients(turned.gammaPhiMatrix[0][1]).size > 0, 'the rotated γ_φ has off-diagonal entries');
});

/**
 * γ_ab through three loops for any quartic tensor: (1/12) λ_acde λ_bcde − (1/16) λ_acde λ_cdfg λ_befg.
 * The three-loop self-energy has one graph, hence one tensor structure; its −1/16 is the single-
 * component coefficient above (recalled from memory, Kleinert & Schulte-Frohlinde 2001).
 */
function gammaRefThreeLoop(l: PT, k: number): P[][] {
  const n = l.n;
  const L = (a: number, b: number, c: number, d: number) => l.e[idx(n, a, b, c, d)];
  const two = gammaRef(l, k);
  return two.map((row, a) => row.map((g2, b) => {
    let s = pConst(k, q(0));
    for (let c = 0; c < n; c++) for (let d = 0; d < n; d++) for (let e = 0; e < n; e++) for (let f = 0; f < n; f++) for (let h = 0; h < n; h++) {
      s = pAdd(s, pMul(pMul(L(a, c, d, e), L(c, d, f, h)), L(b, e, f, h)));
    }
    return pAdd(g2, s, q(-1, 16));
  }));
}

// the most general quartic potential of two fields: λ_1111 = u, λ_2222 = v, λ_1122 = w, λ_1112 = x, λ_1222 = y (all orders)
const GENERAL = `${ANISO} + x/6*phi1^3*phi2 + y/6*phi1*phi2^3`;
const count = (i: number[], a: number) => i.filter((x) => x === a).length;
const generalStructures = [...anisoStructures, (i: number[]) => q(count(i, 0) === 3 ? 1 : 0), (i: number[]) => q(count(i, 0) === 1 ? 1 : 0)];

test('three loops, s = 2: the γ_φ matrix equals the general-tensor formula (1/12) λλ − (1/16) λλλ entry by entry, exactly, for the anisotropic model, its rotation and the general two-field quartic (formula as above, recalled from memory)', () => {
  for (const [potential, structures] of [[ANISO, anisoStructures], [ROTATED, anisoStructures.map(rotated)], [GENERAL, generalStructures]] as const) {
    const flow = exactAtTwo(potential);
    const reference = gammaRefThreeLoop(lambdaOf(2, [...structures]), structures.length);
    assert.ok(flow.gammaPhiMatrix);
    flow.gammaPhiMatrix.forEach((row, a) => row.forEach((p, b) => assert.ok(pEqual(toP(p), reference[a][b]), `${potential} γ(${a + 1},${b + 1}): ${pText(toP(p))} vs ${pText(reference[a][b])}`)));
  }
});

// ---- fixed points to ε³ -----------------------------------------------------------------------------

const leading = (p: FixedPoint<Real>) => (p.couplingSeries ?? []).map((x) => Number(String(x.coefficient(1))));
const numericThreeLoop = (potential: string) => {
  const model = customModel(2, potential);
  const flow = flowFor({ model, s: q(2), loops: 3, digits: 30 }).flow as DerivedFlow<Real>;
  const ring = flow.calculus.ctx.ring;
  const eps = ring.fromRational(1n, 5n);
  const points = findFixedPoints(model, flow, { eps });
  const ising = points.find((p) => { const [u, v, w] = leading(p); return Math.abs(u - 1 / 3) < 1e-12 && v === 0 && w === 0; });
  assert.ok(ising, 'the Ising ⊕ free point u* = ε/3 + …, v* = w* = 0');
  return { flow, eps, ising };
};
const assertSeries = (actual: { coefficient(m: number): unknown }, expected: Decimal[], label: string) =>
  expected.forEach((c, m) => assertClose(new Decimal(String(actual.coefficient(m))), c, `${label} at ε^${m}`));

// η_Ising/2 through ε³: ε²/108 + 109ε³/11664 (N = 1 of η = (N+2)ε²/(2(N+8)²) + (N+2)(−N²+56N+272)ε³/(8(N+8)⁴);
// Kleinert & Schulte-Frohlinde 2001, recalled from memory; the same values as tests/unit/helpers/threeLoop.ts)
const isingHalfEta = onThreeLoopExponents(1).eta.map((c) => new Decimal(c.toString()).div(2));
const ZERO = [0, 1, 2, 3].map(() => new Decimal(0));

test('three loops, s = 2, anisotropic model at the Ising ⊕ free point: γ_φ1 = η_Ising/2 and γ_φ2 = 0 through ε³; γ(φ1φ2) = γ_φ1 + γ_φ2, γ(φ2²) = 0 and γ(φ1²) = 2 − 1/ν_Ising through ε³ (decoupled theories, common practice; Ising exponents recalled from memory, Kleinert & Schulte-Frohlinde 2001)', () => {
  const { flow, eps, ising } = numericThreeLoop(ANISO);
  const spectrum = fieldAnomalousSpectrum(flow, ising, eps);
  const byField = Object.fromEntries(spectrum.directions.map((d) => [d.field, d]));
  assert.deepEqual(Object.keys(byField).sort(), ['phi1', 'phi2']);
  assertSeries(byField.phi1.gammaSeries, isingHalfEta, 'γ_φ1');
  assertSeries(byField.phi2.gammaSeries, ZERO, 'γ_φ2');
  const quad = quadraticSpectrum(flow, ising, flow.calculus.ctx.ring.fromRational(2n), 2);
  assert.ok(quad);
  const op = (name: string) => quad.operators.find((o) => o.operator === name)?.gammaSeries;
  assertSeries(op('phi1*phi2') as never, isingHalfEta, 'γ(φ1φ2)');
  assertSeries(op('phi2^2') as never, ZERO, 'γ(φ2²)');
  const energy = onThreeLoopExponents(1).nuInv.map((c, m) => (m === 0 ? new Decimal(0) : new Decimal(c.toString()).neg()));
  assertSeries(op('phi1^2') as never, energy, 'γ(φ1²) = 2 − 1/ν_Ising');
});

test('three loops, s = 2, rotated model at the same point: the non-diagonal γ_φ matrix has eigen-directions phi1 + phi2 (η_Ising/2 through ε³) and phi1 - phi2 (0); the quadratic operators (φ1+φ2)², (φ1+φ2)(φ1−φ2), (φ1−φ2)² have 2 − 1/ν_Ising, η_Ising/2 and 0 (same sources)', () => {
  const { flow, eps, ising } = numericThreeLoop(ROTATED);
  const spectrum = fieldAnomalousSpectrum(flow, ising, eps);
  const byField = Object.fromEntries(spectrum.directions.map((d) => [d.field, d]));
  assert.deepEqual(Object.keys(byField).sort(), ['phi1 + phi2', 'phi1 - phi2']);
  assertSeries(byField['phi1 + phi2'].gammaSeries, isingHalfEta, 'γ along φ1 + φ2');
  assertSeries(byField['phi1 - phi2'].gammaSeries, ZERO, 'γ along φ1 − φ2');
  const quad = quadraticSpectrum(flow, ising, flow.calculus.ctx.ring.fromRational(2n), 2);
  assert.ok(quad);
  const energy = onThreeLoopExponents(1).nuInv.map((c, m) => (m === 0 ? new Decimal(0) : new Decimal(c.toString()).neg()));
  // the three operators' γ series at ε¹ are 1/3, 0, 0: pick them by their series
  const byLeading = quad.operators.map((o) => o.gammaSeries).sort((a, b) => Number(String(b.coefficient(2))) - Number(String(a.coefficient(2))));
  assert.equal(byLeading.length, 3);
  assertSeries(byLeading[0], energy, 'γ((φ1+φ2)²)');
  assertSeries(byLeading[1], isingHalfEta, 'γ((φ1+φ2)(φ1−φ2))');
  assertSeries(byLeading[2], ZERO, 'γ((φ1−φ2)²)');
});

test('three loops: the RG pole equations of the quadratic-operator matrix (the products in the order z_n (g·∂)z₁) hold with a non-commuting matrix, for the general two-field quartic at s = 7/4 (no field renormalization) and s = 2 (matrix Z_φ); the derivation throws otherwise', () => {
  for (const s of [q(7, 4), q(2)]) {
    const flow = deriveFlow(customModel(2, GENERAL), numericCalculus(s, 30), 3);
    assert.ok(flow.checks.some((c) => c.startsWith('quadratic-operator matrix: every higher pole')), `s = ${s.num}/${s.den}`);
    assert.equal(flow.fieldRenormalized, s.num === 2n);
  }
});

test('flow job, loops 3, anisotropic model at s = 2: runs (no longer refused), shows the γ_φ matrix with its three-loop entries and the matrix weight of the three-loop self-energy graph; validates against FlowResult', () => {
  const r = runFlowJob({ job: 'flow', model: { preset: 'custom', fields: 2, potential: ANISO }, s: '2', loops: 3, digits: 10 }) as Record<string, any>;
  assert.equal(r.error, undefined, JSON.stringify(r.error));
  assert.ok(FlowResult.safeParse(r).success);
  // γ_11 = u²/12 + w²/4 − u³/16 + … (the u-only terms are the Ising ones above)
  const entry = r.gamma_phi_matrix.matrix[0][0] as { monomial: string; coeff: string }[];
  assert.equal(entry.find((t) => t.monomial === 'u^3')?.coeff, '-0.0625');
  assert.equal(entry.find((t) => t.monomial === 'u^2')?.coeff, '0.08333333333');
  const matrixWeights = (r.trail as { function: string; loops: number; weight: unknown }[]).filter((t) => Array.isArray(t.weight) && t.weight.some((w: { projections?: object }) => w.projections && '(1,2)' in w.projections));
  assert.deepEqual(matrixWeights.map((t) => [t.function, t.loops]), [['selfEnergy', 2], ['selfEnergy', 3]], 'the sunset and the three-loop self-energy graph carry matrix weights');
  // the three-loop graph's u³ entry: the trail's sign +1 and symmetry factor 1/4 times λ_1111³ = 1 (hand)
  const three = r.trail.find((t: { loops: number; function: string }) => t.function === 'selfEnergy' && t.loops === 3);
  assert.deepEqual(three.weight.find((w: { monomial: string }) => w.monomial === 'u^3').projections, { '(1,1)': '1/4', '(1,2)': '0', '(2,2)': '0' });
});
