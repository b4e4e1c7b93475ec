import { test } from 'node:test';
import assert from 'node:assert/strict';
import { type DerivedFlow } from '../../../shared/engine/diagrams/index';
import { exponentSeries } from '../../../shared/engine/exponents/index';
import { findFixedPoints } from '../../../shared/engine/fixedpoints/index';
import { familyFlow, flowAt, flowFor } from '../../../shared/engine/flows/index';
import { type ModelSpec, cubicModel, familyPointModel, onFamily, onModel, presetModel } from '../../../shared/engine/models/index';
import { type Real, realContext } from '../../../shared/engine/precision/real';
import { flowAtS } from '../../../shared/engine/scans/flowScan';
import { type Q, q, qAdd, qDiv, qMul, qNeg } from '../../../shared/engine/symbolic/rational';
import { runJob } from '../../../shared/jobs/index';
import { modelSpec } from '../../../shared/notebook/cells';

type Any = Record<string, any>;
const R = realContext(60);

/** |actual − expected| ≤ 10^−digits · max(1, |expected|). */
function assertClose(actual: Real | string, expected: Real | string, digits: number, label: string): void {
  const a = new R(actual.toString());
  const e = new R(expected.toString());
  const tolerance = new R(10).pow(-digits).times(e.abs().gt(1) ? e.abs() : 1);
  assert.ok(a.minus(e).abs().lte(tolerance), `${label}: ${a} vs ${e}`);
}

const qText = (x: Q) => new R(x.num.toString()).div(x.den.toString());

function exponentsAt(model: ModelSpec, s: Q) {
  const flow = flowFor({ model, s, loops: 2, digits: 30 }).flow as DerivedFlow<Real>;
  const point = findFixedPoints(model, flow, { eps: null }).find((p) => p.name === 'O(N)' || p.name === 'Ising');
  assert.ok(point, `${model.label}: the O(N) point`);
  return { flow, series: exponentSeries(flow, point) };
}

test('integer N ≤ 6 give the same digits from the family evaluated at N as from explicit tensors (independent: tensor contractions at that N)', () => {
  const cases: [ModelSpec, ModelSpec][] = [
    [onModel(1), familyPointModel('on', q(1))],
    [onModel(3), familyPointModel('on', q(3))],
    [onModel(6), familyPointModel('on', q(6))],
    [cubicModel(3), familyPointModel('cubic', q(3))],
    [cubicModel(4), familyPointModel('cubic', q(4))],
  ];
  const text = (x: Real) => new (realContext(30))(x).toSignificantDigits(30).toString();
  for (const [explicit, family] of cases) {
    const a = flowFor({ model: explicit, s: q(3, 2), loops: 2, digits: 30 }).flow as DerivedFlow<Real>;
    const b = flowFor({ model: family, s: q(3, 2), loops: 2, digits: 30 }).flow as DerivedFlow<Real>;
    const coefficients = (f: DerivedFlow<Real>) => [...f.beta, f.gammaPhi, f.gammaPhi2].flatMap((p) => (p ? p.sortedTerms().map((t) => `${t.powers}:${text(t.coeff)}`) : []));
    assert.deepEqual(coefficients(b), coefficients(a), `${explicit.label}: β, γ_φ, γ_φ² at 30 digits`);
    const eps = a.calculus.ctx.ring.fromRational(1n, 10n);
    const values = (model: ModelSpec, f: DerivedFlow<Real>) => findFixedPoints(model, f, { eps }).map((p) => `${p.name}:${(p.couplingValues ?? []).map(text)}`);
    assert.deepEqual(values(family, b), values(explicit, a), `${explicit.label}: fixed points at ε = 0.1`);
  }
});

// Two-loop O(N) long range (docs/physics.md §5, derived there; N = 1 is Fisher–Ma–Nickel 1972):
//   1/ν = s − (N+2)/(N+8) ε − (N+2)(7N+20)/(N+8)³ A(s) ε²,  ω = ε − 2(5N+22)/(N+8)² A(s) ε²,  A(3/2) = 2 − π + 4 ln 2.
// Literals: mpmath 1.3.0 at 50 digits, N as mp.mpf, e.g. -(N+2)*(7*N+20)/(N+8)**3*(2-mp.pi+4*mp.log(2)).
const LONG_RANGE: Record<string, { c1: string; c2: string; w2: string }> = {
  '0': { c1: '-0.25', c2: '-0.12742156786328031243799102363697', w2: '-1.1213097971968667494543210080053' },
  '0.5': { c1: '-0.29411764705882352941176470588235', c2: '-0.15602852681976274366516466480765', w2: '-1.1061426624754243870049546024236' },
  '-1': { c1: '-0.14285714285714285714285714285714', c2: '-0.061816177529008291515107015548664', w2: '-1.1317115578387671831227284385063' },
  '1000000': { c1: '-0.9999940000479996160030719754242', c2: '-0.000011416753930195142653382807414794', w2: '-0.000016309771492939188188975684447031' },
};

test('N = 0, 0.5, −1 and 10⁶ at s = 3/2 reproduce the two-loop O(N) formulas for 1/ν and ω (docs/physics.md §5; values from mpmath)', () => {
  for (const [N, ref] of Object.entries(LONG_RANGE)) {
    const { series } = exponentsAt(presetModel('on', q(BigInt(N.replace('.5', '5')), N.includes('.') ? 10n : 1n)), q(3, 2));
    assertClose(series.nuInv.coefficient(0), '1.5', 28, `N=${N} 1/ν ε⁰`);
    assertClose(series.nuInv.coefficient(1), ref.c1, 28, `N=${N} 1/ν ε¹`);
    assertClose(series.nuInv.coefficient(2), ref.c2, 28, `N=${N} 1/ν ε²`);
    assertClose(series.omega.coefficient(1), '1', 28, `N=${N} ω ε¹`);
    assertClose(series.omega.coefficient(2), ref.w2, 28, `N=${N} ω ε²`);
  }
});

test('s = 2 at N = 0, 1/2, −1: the Wilson–Fisher series 1/ν, η, ω (textbook, docs/physics.md §5: Kleinert & Schulte-Frohlinde, Critical Properties of φ⁴-Theories, 2001)', () => {
  for (const N of [q(0), q(1, 2), q(-1)]) {
    const { series } = exponentsAt(presetModel('on', N), q(2));
    const n2 = qAdd(N, q(2));
    const n8 = qAdd(N, q(8));
    const cube = qMul(qMul(n8, n8), n8);
    // 1/ν = 2 − (N+2)/(N+8) ε − (N+2)(13N+44)/(2(N+8)³) ε²;  η = (N+2)/(2(N+8)²) ε²;  ω = ε − 3(3N+14)/(N+8)² ε²
    assertClose(series.nuInv.coefficient(1), qText(qNeg(qDiv(n2, n8))), 28, `N=${N.num}/${N.den} 1/ν ε¹`);
    assertClose(series.nuInv.coefficient(2), qText(qNeg(qDiv(qMul(n2, qAdd(qMul(q(13), N), q(44))), qMul(q(2), cube)))), 28, `1/ν ε²`);
    assertClose(series.eta.coefficient(2), qText(qDiv(n2, qMul(q(2), qMul(n8, n8)))), 28, `η ε²`);
    assertClose(series.omega.coefficient(2), qText(qNeg(qDiv(qMul(q(3), qAdd(qMul(q(3), N), q(14))), qMul(n8, n8)))), 28, `ω ε²`);
  }
});

test('large N: Δ_φ² → s with a 1/N deviation (common practice: large-N long-range result Δ_φ² = s + O(1/N), docs/physics.md §3)', () => {
  const deviation = (N: number) => {
    const r = runJob({ job: 'exponents', model: { preset: 'on', N }, s: '1.5', d: '2.9', digits: 30 }) as Any;
    return new R(r.values.Delta_phi2).minus('1.5');
  };
  const large = deviation(1e6);
  const smaller = deviation(1e3);
  assert.ok(large.abs().lt(1e-5), `|Δ_φ² − s| = ${large} at N = 10⁶`);
  // leading term −6ε/(N+8) (from 1/ν above): the ratio of the deviations at N = 10³ and 10⁶ is ≈ 10³
  assertClose(smaller.div(large), '1000', 1, 'deviation scales as 1/N');
});

test('N as a decimal string or a number gives the same result; labels name the N; cubic at N = 2.5 works and at N = 1 is refused', () => {
  const job = (N: unknown) => runJob({ job: 'exponents', model: { preset: 'on', N }, s: '1.75', d: '3', digits: 20 });
  assert.deepEqual(job('0.5'), job(0.5));
  assert.equal(presetModel('on', q(1, 2)).label, 'O(N) at N = 0.5');
  assert.equal(presetModel('on', q(0)).label, 'O(0) (self-avoiding walk)');
  assert.equal(presetModel('cubic', q(5, 2)).label, 'cubic(N) at N = 2.5');
  const cubic = runJob({ job: 'exponents', model: { preset: 'cubic', N: '2.5' }, s: '1.75', d: '3', digits: 20 }) as Any;
  assert.ok(cubic.values?.nuInv, JSON.stringify(cubic).slice(0, 300));
  const one = runJob({ job: 'exponents', model: { preset: 'cubic', N: 1 }, s: '1.75', d: '3' }) as Any;
  assert.match(one.error?.message ?? '', /N ≠ 1/);
});

test('|N| is limited to 10⁶ (schema and engine)', () => {
  assert.equal((runJob({ job: 'exponents', model: { preset: 'on', N: 2e6 }, s: '1.5', d: '2.9' }) as Any).error?.code, 'invalid-job');
  assert.equal((runJob({ job: 'exponents', model: { preset: 'on', N: '-1000000.5' }, s: '1.5', d: '2.9' }) as Any).error?.code, 'invalid-job');
  assert.throws(() => presetModel('on', q(2_000_000)), /at most 1000000/);
});

test('a scan at real N agrees with the exponents job at the same s (two routes: family symbolic in s then N set, and family at that s)', () => {
  const scan = runJob({ job: 'scan', model: { preset: 'on', N: '0.5' }, d: '3', s: { from: '1.6', to: '1.8', points: 3 }, digits: 25 }) as Any;
  const middle = scan.points[1];
  assert.equal(middle.s, '1.7');
  const single = runJob({ job: 'exponents', model: { preset: 'on', N: '0.5' }, s: '1.7', d: '3', digits: 25 }) as Any;
  assertClose(middle.values.nuInv, single.values.nuInv, 24, '1/ν at s = 1.7');
  assertClose(middle.values.omega, single.values.omega, 24, 'ω at s = 1.7');
});

test('flowAt (general evaluator at {N, s}) equals the scan evaluator flowAtS on a flow symbolic in s', () => {
  const symbolicInS = flowFor({ model: onModel(2), s: null, loops: 2, digits: 30 }).flow as never;
  const s = q(7, 4);
  const a = flowAt(symbolicInS, { s }, 30);
  const b = flowAtS(symbolicInS, s, 30);
  const coefficients = (f: DerivedFlow<Real>) => [...f.beta, f.gammaPhi2].flatMap((p) => (p ? p.sortedTerms().map((t) => t.coeff.toString()) : []));
  assert.deepEqual(coefficients(a), coefficients(b));
  // the family symbolic in N and s at {N = 2, s = 7/4} gives the O(2) numbers too
  const family = flowAt(familyFlow(onFamily, null, 2), { s, N: q(2) }, 30);
  coefficients(family).forEach((c, i) => assertClose(c, coefficients(a)[i], 30, `coefficient ${i}`));
});

test('notebook setup cells take any real N (number or decimal text), "N" for O(N), and refuse |N| > 10⁶ or text that is no number', () => {
  const ok = (model: unknown) => modelSpec.safeParse(model).success;
  assert.ok(ok({ preset: 'on', N: '0.5' }) && ok({ preset: 'on', N: -1 }) && ok({ preset: 'on', N: 'N' }) && ok({ preset: 'cubic', N: '2.5' }));
  assert.ok(!ok({ preset: 'on', N: 2e6 }) && !ok({ preset: 'on', N: Number.NaN }) && !ok({ preset: 'on', N: 'abc' }) && !ok({ preset: 'cubic', N: 'N' }));
});
