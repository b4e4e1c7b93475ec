import { test } from 'node:test';
import assert from 'node:assert/strict';
import DecimalBase from 'decimal.js';
import {
  type DerivedFlow,
  deriveFlow,
  forestPole,
  generateGraphs,
  integralKit,
  lineGraphOf,
  numericCalculus,
  symbolicCalculus,
} from '../../../shared/engine/diagrams/index';
import { type CouplingPolynomial, cubicFamily, onFamily } from '../../../shared/engine/models/index';
import { type Expression, type Q, evaluateExpression, q } from '../../../shared/engine/symbolic/index';
import { special } from '../../../shared/engine/index';
import { assertDigits } from '../helpers/engine';

const Decimal = DecimalBase.clone({ precision: 60 });
type Decimal = InstanceType<typeof Decimal>;
const ZETA3 = new Decimal('1.2020569031595942853997381615114499907650'); // OEIS A002117
const DIGITS = 35;
const close = (a: Decimal, b: Decimal, label: string, tol = 1e-30) => assert.ok(a.minus(b).abs().lte(new Decimal(tol).times(b.abs().plus(1))), `${label}: ${a.toString()} ≠ ${b.toString()}`);

function coefficientAt(p: CouplingPolynomial<Expression>, degree: number, N: number): Decimal {
  const term = [...p.terms.values()].find((t) => t.powers[0] === degree);
  return term ? new Decimal(evaluateExpression(term.coeff, { N: q(N) }, DIGITS).toString()) : new Decimal(0);
}

// ---- s = 2: the classic minimal-subtraction functions of the O(N) model -----------------------------
// u = λ/(16π²) with V = (λ/4!)(φ²)², d = 4 − ε. Kleinert & Schulte-Frohlinde, "Critical Properties of
// φ⁴-Theories" (World Scientific 2001), ch. 11 and 17 (recalled from memory; they reproduce the
// three-loop exponents of docs/physics.md, which are checked in tests/unit/exponents):
//   β(u)     = −εu + (N+8)/3 u² − (3N+14)/3 u³ + [33N² + 922N + 2960 + 96ζ(3)(5N+22)]/216 u⁴
//   γ_φ(u)   = (N+2)/36 u² − (N+2)(N+8)/432 u³
//   γ_φ²(u)  = (N+2)/3 u − 5(N+2)/18 u² + (N+2)(5N+37)/36 u³   (γ_φ² = γ_{m²} − 2γ_φ in the book's terms)
const KSF = {
  beta: [
    (N: number) => new Decimal(N + 8).div(3),
    (N: number) => new Decimal(3 * N + 14).div(-3),
    (N: number) => new Decimal(33 * N * N + 922 * N + 2960).plus(ZETA3.times(96 * (5 * N + 22))).div(216),
  ],
  gammaPhi: [(N: number) => new Decimal(N + 2).div(36), (N: number) => new Decimal(-(N + 2) * (N + 8)).div(432)],
  gammaPhi2: [(N: number) => new Decimal(N + 2).div(3), (N: number) => new Decimal(-5 * (N + 2)).div(18), (N: number) => new Decimal((N + 2) * (5 * N + 37)).div(36)],
};

let shortRange: DerivedFlow<Expression> | null = null;
const onAtTwo = () => (shortRange ??= deriveFlow(onFamily, symbolicCalculus(q(2)), 3));
let cubicShortRange: DerivedFlow<Expression> | null = null;
const cubicAtTwo = () => (cubicShortRange ??= deriveFlow(cubicFamily, symbolicCalculus(q(2)), 3));

test('three loops at s = 2, O(N) with symbolic N: β equals the classic MS function, ζ(3) from the tetrahedron (Kleinert & Schulte-Frohlinde 2001)', () => {
  const flow = onAtTwo();
  for (const N of [0, 1, 2, 3, 4, 7, -2]) KSF.beta.forEach((c, i) => close(coefficientAt(flow.beta[0], i + 2, N), c(N), `β u^${i + 2} at N = ${N}`));
});

test('three loops at s = 2, O(N): γ_φ (η to ε³) and γ_φ² equal the classic MS functions (Kleinert & Schulte-Frohlinde 2001)', () => {
  const flow = onAtTwo();
  for (const N of [0, 1, 2, 3, 10]) {
    KSF.gammaPhi.forEach((c, i) => close(coefficientAt(flow.gammaPhi, i + 2, N), c(N), `γ_φ u^${i + 2} at N = ${N}`));
    KSF.gammaPhi2.forEach((c, i) => close(coefficientAt(flow.gammaPhi2!, i + 1, N), c(N), `γ_φ² u^${i + 1} at N = ${N}`));
  }
  assert.ok(flow.fieldRenormalized);
});

test('three loops: the RG pole equations hold for every coupling and for ln Z_φ, ln Z_t (the derivation throws otherwise)', () => {
  const flow = onAtTwo();
  assert.ok(flow.checks.some((c) => c.includes('1/ε^n pole (n = 2…3)')));
  assert.ok(flow.checks.some((c) => c.startsWith('self-energy (ln Z_φ)')));
  assert.ok(flow.checks.some((c) => c.startsWith('φ² insertion')));
  const cubic = cubicAtTwo();
  assert.equal(cubic.beta.length, 2);
  assert.ok(cubic.checks.some((c) => c.includes('1/ε^n pole')));
});

test('three loops at s = 2 reproduce the two-loop catalogue below three loops (same β, γ_φ, γ_φ² through two loops)', () => {
  const three = onAtTwo();
  const two = deriveFlow(onFamily, symbolicCalculus(q(2)), 2);
  for (const N of [1, 3]) {
    for (const d of [2, 3]) close(coefficientAt(three.beta[0], d, N), coefficientAt(two.beta[0], d, N), `β u^${d}`);
    close(coefficientAt(three.gammaPhi, 2, N), coefficientAt(two.gammaPhi, 2, N), 'γ_φ u²');
    for (const d of [1, 2]) close(coefficientAt(three.gammaPhi2!, d, N), coefficientAt(two.gammaPhi2!, d, N), `γ_φ² u^${d}`);
  }
});

test('cubic anisotropy at s = 2, N = 2: three-loop β is covariant under the 45° rotation (u, v) → (u + 3v/2, −v) that maps the model to itself, and at u = 0 it is N decoupled Ising models (common practice)', () => {
  const flow = cubicAtTwo();
  const at = (p: CouplingPolynomial<Expression>, u: Decimal, v: Decimal) => {
    let sum = new Decimal(0);
    for (const t of p.terms.values()) sum = sum.plus(new Decimal(evaluateExpression(t.coeff, { N: q(2) }, DIGITS).toString()).times(u.pow(t.powers[0])).times(v.pow(t.powers[1])));
    return sum;
  };
  const [u, v] = [new Decimal('0.3'), new Decimal('0.17')];
  const [u2, v2] = [u.plus(v.times('1.5')), v.neg()];
  const betaU = at(flow.beta[0], u, v);
  const betaV = at(flow.beta[1], u, v);
  close(at(flow.beta[0], u2, v2), betaU.plus(betaV.times(1.5)), 'β_u at the rotated point', 1e-28);
  close(at(flow.beta[1], u2, v2), betaV.neg(), 'β_v at the rotated point', 1e-28);
  // u = 0: N decoupled Ising models, β_v(0, v) is the O(1) three-loop β and v alone does not generate u (common practice)
  const w = new Decimal('0.21');
  const zero = new Decimal(0);
  const ising = KSF.beta.reduce((sum, c, i) => sum.plus(c(1).times(w.pow(i + 2))), new Decimal(0));
  close(at(flow.beta[1], zero, w), ising, 'β_v(0, v) = Ising β(v)', 1e-28);
  close(at(flow.beta[0], zero, w), zero, 'β_u(0, v) = 0', 1e-28);
});

test('cubic anisotropy at s = 2, N = 1: Σφ⁴ = (φ²)², so only u + v is a coupling and β_u + β_v is the classic Ising β of u + v, monomial by monomial (u³v, u²v², uv³ included; Kleinert & Schulte-Frohlinde 2001, N = 1, recalled from memory)', () => {
  const flow = cubicAtTwo();
  const coefficient = (p: CouplingPolynomial<Expression>, a: number, b: number) => {
    const term = [...p.terms.values()].find((t) => t.powers[0] === a && t.powers[1] === b);
    return term ? new Decimal(evaluateExpression(term.coeff, { N: q(1) }, DIGITS).toString()) : new Decimal(0);
  };
  const binomial = (n: number, k: number): number => (k === 0 ? 1 : (binomial(n - 1, k - 1) * n) / k);
  for (let loops = 1; loops <= 3; loops++) {
    const degree = loops + 1;
    const ising = KSF.beta[loops - 1](1);
    for (let a = 0; a <= degree; a++) {
      const sum = coefficient(flow.beta[0], a, degree - a).plus(coefficient(flow.beta[1], a, degree - a));
      close(sum, ising.times(binomial(degree, a)), `u^${a} v^${degree - a} in β_u + β_v at N = 1`, 1e-28);
    }
  }
});

test('cubic anisotropy at s = 2, symbolic N: at v = 0 the three-loop β_u is the classic O(N) β and β_v vanishes (the model is O(N) there; Kleinert & Schulte-Frohlinde 2001, recalled from memory)', () => {
  const flow = cubicAtTwo();
  const at = (p: CouplingPolynomial<Expression>, N: number, u: Decimal) => {
    let sum = new Decimal(0);
    for (const t of p.terms.values()) if (t.powers[1] === 0) sum = sum.plus(new Decimal(evaluateExpression(t.coeff, { N: q(N) }, DIGITS).toString()).times(u.pow(t.powers[0])));
    return sum;
  };
  const u = new Decimal('0.23');
  for (const N of [2, 3, 4, 5]) {
    const classic = KSF.beta.reduce((sum, c, i) => sum.plus(c(N).times(u.pow(i + 2))), new Decimal(0));
    close(at(flow.beta[0], N, u), classic, `β_u(u, 0) at N = ${N}`, 1e-28);
    close(at(flow.beta[1], N, u), new Decimal(0), `β_v(u, 0) at N = ${N}`, 1e-28);
  }
});

test('cubic anisotropy at s = 2: the marginal N where the O(N) point loses stability to the cubic one is N_c = 4 − 2ε + (5/12)(6ζ(3) − 1)ε² (Kleinert & Schulte-Frohlinde 2001, recalled from memory) — this probes the v-linear terms u v, u² v, u³ v of the three-loop β_v', () => {
  const flow = cubicAtTwo();
  const coefficient = (p: CouplingPolynomial<Expression>, pu: number, pv: number, N: Q) => {
    const term = [...p.terms.values()].find((t) => t.powers[0] === pu && t.powers[1] === pv);
    return term ? new Decimal(evaluateExpression(term.coeff, { N }, 50).toString()) : new Decimal(0);
  };
  // at the O(N) point u*(ε) (β_u(u, 0) = 0) the v-direction eigenvalue is h(u*) with β_v = v h(u) + O(v²):
  // h(u*) = ε (f₁(N) + f₂(N) ε + f₃(N) ε²), and N_c(ε) solves f₁ + f₂ ε + f₃ ε² = 0 order by order
  const f = (N: Q) => {
    const [b2, b3, b4] = [2, 3, 4].map((k) => coefficient(flow.beta[0], k, 0, N));
    const [c1, c2, c3] = [1, 2, 3].map((k) => coefficient(flow.beta[1], k, 1, N));
    const x1 = new Decimal(1).div(b2);
    const x2 = b3.times(x1.pow(2)).neg().div(b2);
    const x3 = b3.times(x1).times(x2).times(2).plus(b4.times(x1.pow(3))).neg().div(b2);
    return [c1.times(x1).minus(1), c1.times(x2).plus(c2.times(x1.pow(2))), c1.times(x3).plus(c2.times(x1).times(x2).times(2)).plus(c3.times(x1.pow(3)))];
  };
  const scale = 10n ** 12n; // N = 4 ± 10⁻¹² for the derivatives in N
  const [mid, up, down] = [f(q(4)), f({ num: 4n * scale + 1n, den: scale }), f({ num: 4n * scale - 1n, den: scale })];
  const h = new Decimal('1e-12');
  const d1 = (i: number) => up[i].minus(down[i]).div(h.times(2));
  const d2 = (i: number) => up[i].minus(mid[i].times(2)).plus(down[i]).div(h.pow(2));
  close(mid[0], new Decimal(0), 'f₁(4) = 0: N_c = 4 at one loop', 1e-40);
  const n1 = mid[1].neg().div(d1(0));
  const n2 = mid[2].plus(d1(1).times(n1)).plus(d2(0).times(n1.pow(2)).div(2)).neg().div(d1(0));
  close(n1, new Decimal(-2), 'N_c at ε¹', 1e-15);
  close(n2, ZETA3.times(6).minus(1).times(5).div(12), 'N_c at ε²', 1e-15);
});

// Cubic anisotropy at N → ∞ is the Ising model with Fisher renormalization: ν_c = ν_I/(1 − α_I) and η_c = η_I,
// and the cubic point's smallest stability eigenvalue is α_I/ν_I (Aharony 1973, exact at N = ∞; recalled from memory).
// With hyperscaling: 1/ν_c = d − 1/ν_I and ω_c = 2/ν_I − d. Series read from jobs at N = 10⁶ and 5·10⁵,
// Richardson-extrapolated (f(N) = f(∞) + a/N + O(1/N²) leaves O(10⁻¹²)).
function cubicLargeN(runJob: (job: object) => unknown, s: string) {
  const seriesAt = (N: number) => runJob({ job: 'exponents', model: { preset: 'cubic', N: String(N) }, s, d: '3', loops: 3, digits: 30 }) as { fixedPoint: string; series: Record<string, string[]> };
  const big = seriesAt(1_000_000);
  const half = seriesAt(500_000);
  assert.equal(big.fixedPoint, 'cubic');
  return (name: string, m: number) => new Decimal(big.series[name][m]).times(2).minus(new Decimal(half.series[name][m]));
}
function assertFisherRenormalized(limit: (name: string, m: number) => Decimal, ising: { nuInv: Decimal[]; eta: Decimal[] }, s: Decimal, label: string) {
  const d = [s.times(2), new Decimal(-1), new Decimal(0), new Decimal(0)]; // d = 2s − ε
  for (let m = 0; m <= 3; m++) {
    close(limit('nuInv', m), d[m].minus(ising.nuInv[m]), `${label}: 1/ν ε^${m}`, 1e-9);
    close(limit('eta', m), ising.eta[m], `${label}: η ε^${m}`, 1e-9);
    close(limit('omega', m), ising.nuInv[m].times(2).minus(d[m]), `${label}: ω ε^${m}`, 1e-9);
  }
}

test('cubic anisotropy at s = 2, N → ∞: Fisher-renormalized Ising exponents through ε³ — 1/ν = d − 1/ν_I, η = η_I, ω = 2/ν_I − d (Aharony 1973; Ising series of Kleinert & Schulte-Frohlinde 2001; both recalled from memory). This probes the mixed u^a v^b terms of the three-loop β at the fixed point', async () => {
  const { runJob } = await import('../../../shared/jobs/run');
  const N = 1;
  const ising = {
    nuInv: [new Decimal(2), new Decimal(-1).div(3), new Decimal(-(N + 2) * (13 * N + 44)).div(2 * (N + 8) ** 3), new Decimal(N + 2).div(8 * (N + 8) ** 5).times(new Decimal(3 * N ** 3 - 452 * N ** 2 - 2672 * N - 5312).plus(ZETA3.times(96 * (N + 8) * (5 * N + 22))))],
    eta: [new Decimal(0), new Decimal(0), new Decimal(1).div(54), new Decimal((N + 2) * (-N * N + 56 * N + 272)).div(8 * (N + 8) ** 4)],
  };
  assertFisherRenormalized(cubicLargeN(runJob, '2'), ising, new Decimal(2), 's = 2');
});

test('cubic anisotropy at s = 1.75, N → ∞: the same Fisher relations hold with the long-range Ising series (the engine’s O(1) job at s = 1.75), through ε³ with the tetrahedron P(1.75) in the mixed terms (Aharony 1973, an exact statement independent of the kinetic term; recalled from memory)', async () => {
  const { runJob } = await import('../../../shared/jobs/run');
  const o1 = runJob({ job: 'exponents', model: { preset: 'on', N: '1' }, s: '1.75', d: '3', loops: 3, digits: 30 }) as { series: Record<string, string[]> };
  const ising = { nuInv: o1.series.nuInv.map((c) => new Decimal(c)), eta: o1.series.eta.map((c) => new Decimal(c)) };
  assert.deepEqual(ising.eta.map(String), ['0.25', '0', '0', '0'], 'η = 2 − s exactly for s < 2');
  assertFisherRenormalized(cubicLargeN(runJob, '1.75'), ising, new Decimal('1.75'), 's = 1.75');
});

test('infrared counterterms (R*) give the same pole as an infrared-safe routing, for every graph through three loops that has both', () => {
  const calc = numericCalculus(q(3, 2), 30);
  const kit = integralKit(calc.s);
  const primitives = { tetrahedron: () => calc.ctx.ring.zero() };
  let compared = 0;
  for (const loops of [2, 3]) {
    for (const fn of ['vertex', 'massInsertion'] as const) {
      for (const graph of generateGraphs(fn, loops)) {
        const g = lineGraphOf(graph);
        let safe;
        try {
          safe = forestPole(calc, kit, g, primitives);
        } catch {
          continue;
        }
        const viaChains = forestPole(calc, kit, g, primitives, new Map(), { preferInfraredCounterterms: true });
        if (!viaChains.rearrangement.includes('R*') || safe.rearrangement.includes('R*')) continue;
        compared++;
        assert.equal(viaChains.pole.lowest, safe.pole.lowest, graph.id);
        viaChains.pole.coefficients().forEach((c, i) => close(new Decimal(c.toString()), new Decimal(safe.pole.coefficients()[i].toString()), `${graph.id} pole ${i}`, 1e-40));
      }
    }
  }
  assert.ok(compared >= 5, `compared ${compared} graphs`);
});

test('three-loop graphs: every one reduces (series-parallel, R* for the bridge graph) except the tetrahedron, which uses P(s)', () => {
  const calc = numericCalculus(q(7, 4), 30);
  const kit = integralKit(calc.s);
  const used: string[] = [];
  const primitives = { tetrahedron: () => (used.push('P'), calc.ctx.ring.one()) };
  for (const fn of ['vertex', 'selfEnergy', 'massInsertion'] as const) for (const graph of generateGraphs(fn, 3)) forestPole(calc, kit, lineGraphOf(graph), primitives);
  assert.equal(used.length, 1);
});

test('s < 2: the three-loop self-energy has no pole (no field renormalization: Δφ = (d − s)/2 exactly)', () => {
  for (const s of [q(1, 2), q(3, 2), q(19, 10)] as Q[]) {
    const calc = numericCalculus(s, 30);
    const kit = integralKit(calc.s);
    for (const loops of [2, 3]) {
      for (const graph of generateGraphs('selfEnergy', loops)) {
        const pole = forestPole(calc, kit, lineGraphOf(graph), { tetrahedron: () => calc.ctx.ring.zero() }).pole;
        for (const c of pole.coefficients()) assert.ok(calc.isNegligible(c), `${graph.id} at s = ${s.num}/${s.den}: ${c.toString()}`);
      }
    }
  }
});

test('exponents job, loops 3, O(1) at s = 2, d = 3: 1/ν, η, ω to ε³ equal the classic three-loop values (Kleinert & Schulte-Frohlinde 2001, N = 1; docs/physics.md §7, recalled from memory)', async () => {
  const { runJob } = await import('../../../shared/jobs/run');
  const result = runJob({ job: 'exponents', model: { preset: 'on', N: '1' }, s: '2', d: '3', loops: 3, digits: 15 }) as { series: Record<string, string[]> };
  const z3 = ZETA3;
  const N = 1;
  const nuInv3 = new Decimal(N + 2).div(8 * (N + 8) ** 5).times(new Decimal(3 * N ** 3 - 452 * N ** 2 - 2672 * N - 5312).plus(z3.times(96 * (N + 8) * (5 * N + 22))));
  const eta3 = new Decimal((N + 2) * (-N * N + 56 * N + 272)).div(8 * (N + 8) ** 4);
  const omega3 = new Decimal(33 * N ** 3 + 538 * N ** 2 + 4288 * N + 9568).plus(z3.times(96 * (N + 8) * (5 * N + 22))).div(4 * (N + 8) ** 4);
  close(new Decimal(result.series.nuInv[3]), nuInv3, '1/ν ε³', 1e-13);
  close(new Decimal(result.series.eta[3]), eta3, 'η ε³', 1e-13);
  close(new Decimal(result.series.omega[3]), omega3, 'ω ε³', 1e-13);
  close(new Decimal(result.series.nuInv[2]), new Decimal(-(N + 2) * (13 * N + 44)).div(2 * (N + 8) ** 3), '1/ν ε²', 1e-13);
});

test('exponents job, loops 3, O(1) at s = 2, d = 3, at 200 digits (the largest the contract allows): 1/ν, η, ω at ε³ equal the classic values to all 200 digits (same source; ζ(3) from mpmath at 212 digits)', async () => {
  const { runJob } = await import('../../../shared/jobs/run');
  const { ZETA3_212 } = await import('../helpers/threeLoop');
  const Huge = DecimalBase.clone({ precision: 230 });
  const result = runJob({ job: 'exponents', model: { preset: 'on', N: '1' }, s: '2', d: '3', loops: 3, digits: 200 }) as { series: Record<string, string[]> };
  const z3 = new Huge(ZETA3_212);
  const N = 1;
  const expected = {
    nuInv: new Huge(N + 2).div(8 * (N + 8) ** 5).times(new Huge(3 * N ** 3 - 452 * N ** 2 - 2672 * N - 5312).plus(z3.times(96 * (N + 8) * (5 * N + 22)))),
    eta: new Huge((N + 2) * (-N * N + 56 * N + 272)).div(8 * (N + 8) ** 4),
    omega: new Huge(33 * N ** 3 + 538 * N ** 2 + 4288 * N + 9568).plus(z3.times(96 * (N + 8) * (5 * N + 22))).div(4 * (N + 8) ** 4),
  };
  for (const [name, value] of Object.entries(expected)) assertDigits(result.series[name][3], value.toString(), 200, `${name} ε³`);
});

test('large N, any s: 1/ν → s − ε, i.e. Δ_φ² → s, through ε³ (common practice: the leading large-N long-range result); symbolic in N and s, the tetrahedron term included', async () => {
  const { flowFor } = await import('../../../shared/engine/flows/index');
  const { findFixedPoints } = await import('../../../shared/engine/fixedpoints/index');
  const { exponentSeries } = await import('../../../shared/engine/exponents/index');
  const { flow } = flowFor({ model: onFamily, s: null, loops: 3, digits: 30 });
  const f = flow as DerivedFlow<Expression>;
  const point = findFixedPoints(onFamily, f, { eps: null }).find((p) => p.name !== 'Gaussian')!;
  const nuInv = exponentSeries(f, point).nuInv;
  const degreeInN = (p: Map<string, { monomial: [string, number][] }>) => Math.max(0, ...[...p.values()].map((t) => t.monomial.find(([n]) => n === 'N')?.[1] ?? 0));
  const excess = (e: Expression) =>
    Math.max(...[...e.terms.values()].map((t) => degreeInN(t.coeff.num as never) - [...t.coeff.den.values()].reduce((sum, fct) => sum + degreeInN(fct.poly as never) * fct.power, 0)));
  // ε¹: −(N+2)/(N+8) → −1; ε² and ε³: every term vanishes as N → ∞ (numerator degree below denominator degree)
  assert.equal(excess(nuInv.coefficient(1)), 0);
  assert.ok(excess(nuInv.coefficient(2)) < 0, 'ε² coefficient of 1/ν vanishes at large N');
  assert.ok(excess(nuInv.coefficient(3)) < 0, 'ε³ coefficient of 1/ν vanishes at large N');
  assert.ok([...nuInv.coefficient(3).terms.values()].some((t) => t.monomial.some((p) => p.atom.kind === 'tetrahedron')), 'the ε³ coefficient contains P(s)');
});

test('generic s (symbolic): the three-loop pole equations hold exactly for O(N) and cubic(3), and γ_φ = 0 identically (Δφ = (d − s)/2 exactly for s < 2; docs/physics.md, exact statements)', async () => {
  const { cubicModel } = await import('../../../shared/engine/models/index');
  for (const spec of [onFamily, cubicModel(3)]) {
    const flow = deriveFlow(spec, symbolicCalculus(null), 3);
    assert.ok(flow.checks.some((c) => c.includes('1/ε^n pole (n = 2…3)')), spec.label);
    assert.ok(flow.checks.some((c) => c.startsWith('φ² insertion')), spec.label);
    assert.ok(flow.gammaPhi.isZero() || [...flow.gammaPhi.terms.values()].every((t) => t.coeff.isZero()), `${spec.label}: γ_φ = 0`);
    assert.equal(flow.fieldRenormalized, false);
  }
});

test('exponents job, loops 3, s < 2: Δφ = (d − s)/2 exactly and Δφ + Δ_{φ³} = d (no field renormalization for the non-local kinetic term; docs/physics.md, exact statements), for O(1) and cubic(3)', async () => {
  const { runJob } = await import('../../../shared/jobs/run');
  for (const model of [{ preset: 'on', N: '1' }, { preset: 'cubic', N: '3' }]) {
    const result = runJob({ job: 'exponents', model, s: '1.6', d: '3', loops: 3, digits: 30 }) as { values: Record<string, string>; series: Record<string, string[]> };
    const label = `${model.preset}(${model.N})`;
    // (3 − 1.6)/2 = 0.7 exactly, and Δ_{φ³} = 3 − 0.7 = 2.3
    assert.equal(new Decimal(result.values.Delta_phi).toString(), '0.7', `${label} Δφ`);
    assert.equal(new Decimal(result.values.Delta_phi3).toString(), '2.3', `${label} Δ_{φ³}`);
    // η = 2 − s at every order: its series is 0.4 with no ε, ε², ε³ terms
    assert.deepEqual(result.series.eta.map((c) => new Decimal(c).toString()), ['0.4', '0', '0', '0'], `${label} η series`);
  }
});

test('three loops at exactly s = 1/3 are refused with a domain error that says why and what to do; s = 0.3 (below, through the continued P(s)) runs (docs/tetrahedron.md)', async () => {
  const { runJob } = await import('../../../shared/jobs/run');
  // a typed s is a finite decimal, never 1/3; a scan grid can hit it (0.3 + 0.1·i/3 at i = 1)
  const grid = runJob({ job: 'scan', model: { preset: 'on', N: '1' }, d: '0.5', loops: 3, s: { from: '0.3', to: '0.4', points: 4 }, quantities: ['nuInv'], digits: 20 }) as { error?: { code: string; message: string } };
  assert.equal(grid.error?.code, 'domain');
  assert.match(grid.error?.message ?? '', /s = 1\/3 exactly.*shift the range or change the number of points/);
  assert.throws(() => special.tetrahedronPeriod({ num: 1n, den: 3n }, 20), /s = 1\/3.*at most two loops/);
  const below = runJob({ job: 'exponents', model: { preset: 'on', N: '1' }, s: '0.3', d: '0.5', loops: 3, digits: 20 }) as { error?: unknown; series?: Record<string, string[]> };
  assert.equal(below.error, undefined, JSON.stringify(below).slice(0, 300));
  // leading orders are exact: 1/ν = s − (N+2)/(N+8) ε + …, ε⁰ = 0.3 and ε¹ = −1/3 at N = 1 (docs/physics.md §5)
  assert.equal(new Decimal(below.series!.nuInv[0]).toString(), '0.3');
  close(new Decimal(below.series!.nuInv[1]), new Decimal(-1).div(3), '1/ν ε¹', 1e-18);
  assert.equal(below.series!.nuInv.length, 4, 'series to ε³');
});

test('three-loop quadratic-operator matrix: at the decoupled-Ising point of cubic(3) the operators φ_iφ_j (i ≠ j) have Δ = 2Δφ and φ_i² the Ising Δ_φ², through ε³ (decoupled theories, common practice), at s = 2 and s = 1.75', async () => {
  const { runJob } = await import('../../../shared/jobs/run');
  type Operators = { name: string; multiplicity: number; series: { Delta: string[] } }[];
  for (const s of ['2', '1.75']) {
    const cubic = runJob({ job: 'exponents', model: { preset: 'cubic', N: '3' }, s, d: '3', loops: 3, digits: 25, fixedPoint: 'decoupled Ising' }) as { quadraticOperators: Operators };
    const ising = runJob({ job: 'exponents', model: { preset: 'on', N: '1' }, s, d: '3', loops: 3, digits: 25 }) as { series: Record<string, string[]> };
    const byName = (name: string) => cubic.quadraticOperators.find((o) => o.name === name)!;
    const offDiagonal = byName('off-diagonal');
    const diagonal = byName('diagonal');
    assert.equal(offDiagonal.multiplicity, 3);
    assert.equal(diagonal.multiplicity, 3);
    assert.equal(offDiagonal.series.Delta.length, 4, 'to ε³');
    offDiagonal.series.Delta.forEach((c, k) => close(new Decimal(c), new Decimal(ising.series.Delta_phi[k]).times(2), `s = ${s}: off-diagonal Δ ε^${k}`, 1e-22));
    diagonal.series.Delta.forEach((c, k) => close(new Decimal(c), new Decimal(ising.series.Delta_phi2[k]), `s = ${s}: diagonal Δ ε^${k}`, 1e-22));
  }
});

test('three-loop quadratic-operator matrix: its singlet eigenvalue equals Δ_φ² from the scalar φ² insertion (two assemblies of the same graphs), cubic(3) at s = 2 and 1.75', async () => {
  const { runJob } = await import('../../../shared/jobs/run');
  type Operators = { name: string; series: { Delta: string[] } }[];
  for (const s of ['2', '1.75']) {
    const r = runJob({ job: 'exponents', model: { preset: 'cubic', N: '3' }, s, d: '3', loops: 3, digits: 25 }) as { quadraticOperators: Operators; series: Record<string, string[]> };
    const singlet = r.quadraticOperators.find((o) => o.name === 'singlet')!;
    singlet.series.Delta.forEach((c, k) => close(new Decimal(c), new Decimal(r.series.Delta_phi2[k]), `s = ${s}: singlet Δ ε^${k}`, 1e-22));
  }
});
