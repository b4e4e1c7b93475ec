import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runFlowJob } from '../../../shared/jobs/flowJobs';
import { realContext } from '../../../shared/engine/precision/real';

/**
 * Printed values obey the printed relations: on a grid of (N, d, s) every relation the result states
 * is checked on the printed numbers, to within what their printed digits allow. The relations are
 * written out here independently (common practice: Fisher γ = ν(2 − η), hyperscaling α = 2 − dν,
 * β = νΔφ, δ = (d − Δφ)/Δφ; Δ_{φ²} = d − 1/ν, Δ_{φ⁴} = d + ω; long range s < 2: η = 2 − s and the
 * shadow relation Δ_{φ³} = d − Δφ; s = 2: Δ_{φ³} = Δφ + 2; Gaussian regime: Landau values and
 * Δ_{φ³} = 3Δφ — docs/physics.md §Exact statements and §Regimes).
 */

type Any = Record<string, any>;
const DIGITS = 20;
const P = realContext(80);
type V = InstanceType<typeof P>;
const run = (job: object) => runFlowJob(job) as Any;

/** Half a unit in the last of DIGITS significant digits: what rounding to the printed digits may move a value. */
function halfUlp(text: string): V {
  const x = new P(text);
  if (x.isZero()) return new P(10).pow(-(DIGITS + 10));
  const exponent = Math.floor(Math.log10(Math.abs(Number(text))) + 1e-12);
  return new P(10).pow(exponent - DIGITS + 1).div(2);
}

interface Relation {
  quantity: string;
  inputs: string[];
  f: (x: V[], at: { d: V; s: V }) => V;
  /** A fragment the result's relation text must contain (the relation is stated). */
  stated: string;
}

const rel = (quantity: string, inputs: string[], stated: string, f: Relation['f']): Relation => ({ quantity, inputs, f, stated });
const two = new P(2);

const COMMON: Relation[] = [
  rel('nu', ['nuInv'], 'ν = 1/(1/ν)', ([a]) => new P(1).div(a)),
  rel('Delta_phi', ['eta'], 'Δ_φ = (d − 2 + η)/2', ([e], { d }) => d.minus(2).plus(e).div(2)),
  rel('Delta_phi2', ['nuInv'], 'Δ_{φ²} = d − 1/ν', ([a], { d }) => d.minus(a)),
  rel('Delta_phi4', ['omega'], 'Δ_{φ⁴} = d + ω', ([w], { d }) => d.plus(w)),
  rel('gamma', ['nu', 'eta'], 'γ = ν(2 − η)', ([n, e]) => n.times(two.minus(e))),
];
const HYPERSCALING: Relation[] = [
  rel('alpha', ['nu'], 'α = 2 − dν', ([n], { d }) => two.minus(d.times(n))),
  rel('beta', ['nu', 'Delta_phi'], 'β = νΔ_φ', ([n, p]) => n.times(p)),
  rel('delta', ['Delta_phi'], 'δ = (d − Δ_φ)/Δ_φ', ([p], { d }) => d.minus(p).div(p)),
];
const LONG_RANGE: Relation[] = [
  ...COMMON,
  ...HYPERSCALING,
  rel('eta', [], '2 − s exactly', (_, { s }) => two.minus(s)),
  rel('Delta_phi3', ['Delta_phi'], 'Δ_{φ³} = d − Δ_φ', ([p], { d }) => d.minus(p)),
];
const SHORT_RANGE: Relation[] = [...COMMON, ...HYPERSCALING, rel('Delta_phi3', ['Delta_phi'], 'Δ_{φ³} = Δ_φ + 2', ([p]) => p.plus(2))];
const MEAN_FIELD: Relation[] = [
  ...COMMON,
  rel('nuInv', [], '1/ν = s', (_, { s }) => s),
  rel('eta', [], 'η = 2 − s', (_, { s }) => two.minus(s)),
  rel('omega', [], 'ω = d − 2s', (_, { d, s }) => d.minus(s.times(2))),
  rel('Delta_phi3', ['Delta_phi'], 'Δ_{φ³} = 3Δ_φ', ([p]) => p.times(3)),
  rel('alpha', [], 'α = 0', () => new P(0)),
  rel('beta', [], 'β = 1/2', () => new P('0.5')),
  rel('delta', ['Delta_phi3', 'Delta_phi'], 'δ = Δ_{φ³}/Δ_φ = 3', ([p3, p]) => p3.div(p)),
];

/** |printed − f(printed inputs)| ≤ half-ulp(printed) + Σ |∂f/∂xᵢ| half-ulp(xᵢ) (partials by central differences at 80 digits). */
function checkRelation(r: Relation, values: Record<string, string>, at: { d: V; s: V }, where: string): void {
  const printed = values[r.quantity];
  assert.equal(typeof printed, 'string', `${where}: ${r.quantity} printed`);
  const x = r.inputs.map((k) => {
    assert.equal(typeof values[k], 'string', `${where}: ${k} printed`);
    return new P(values[k]);
  });
  const value = r.f(x, at);
  let tolerance = halfUlp(printed);
  r.inputs.forEach((k, i) => {
    const h = x[i].abs().plus(1).times('1e-30');
    const shifted = (sign: number) => r.f(x.map((xi, j) => (j === i ? xi.plus(h.times(sign)) : xi)), at);
    const partial = shifted(1).minus(shifted(-1)).div(h.times(2));
    tolerance = tolerance.plus(partial.abs().times(halfUlp(values[k])));
  });
  const gap = new P(printed).minus(value).abs();
  assert.ok(gap.lte(tolerance.times('1.0001')), `${where}: ${r.quantity} = ${printed} but ${r.stated} gives ${value.toSignificantDigits(DIGITS + 3).toString()} (gap ${gap.toExponential(3)}, allowed ${tolerance.toExponential(3)})`);
}

/** The truncated series at ε from the printed coefficients (each good to half an ulp). */
function checkSeriesValue(quantity: string, series: string[], printed: string, eps: V, where: string): void {
  let value = new P(0);
  let tolerance = halfUlp(printed);
  series.forEach((c, k) => {
    value = value.plus(new P(c).times(eps.pow(k)));
    tolerance = tolerance.plus(halfUlp(c).times(eps.abs().pow(k)));
  });
  assert.ok(new P(printed).minus(value).abs().lte(tolerance.times('1.0001')), `${where}: ${quantity} = ${printed} is not its truncated series ${value.toSignificantDigits(DIGITS).toString()}`);
}

function checkStated(result: Any, relations: Relation[], where: string): void {
  for (const r of relations) assert.ok(String(result.relations[r.quantity]).includes(r.stated), `${where}: relations.${r.quantity} = ${result.relations[r.quantity]} should state ${r.stated}`);
}

const MODELS = [0, 1, 2, 3, 10];
const POINTS: [string, string][] = [
  ['3', '1.51'], // just above s = d/2
  ['3', '2'], // short range
  ['2.5', '1.7'],
  ['2', '2'],
];

for (const N of MODELS) {
  test(`O(${N}): exponents jobs on (d, s) = ${POINTS.map(([d, s]) => `(${d}, ${s})`).join(', ')} — every printed value obeys every stated relation`, () => {
    for (const [dText, sText] of POINTS) {
      const where = `O(${N}) d = ${dText} s = ${sText}`;
      const r = run({ job: 'exponents', model: { preset: 'on', N }, d: dText, s: sText, digits: DIGITS });
      assert.equal(r.error, undefined, `${where}: ${JSON.stringify(r.error)}`);
      assert.equal(Object.keys(r)[0], 'notices', 'notices come first');
      const at = { d: new P(dText), s: new P(sText) };
      const relations = sText === '2' ? SHORT_RANGE : LONG_RANGE;
      checkStated(r, relations, where);
      for (const relation of relations) checkRelation(relation, r.values, at, where);
      const eps = at.s.times(2).minus(at.d);
      for (const k of sText === '2' ? ['nuInv', 'omega', 'eta'] : ['nuInv', 'omega']) checkSeriesValue(k, r.series[k], r.values[k], eps, where);
      assert.match(r.sources.nu, /^1\/\(1\/ν\)/, 'ν is printed as 1/(printed 1/ν)');
    }
  });
}

test('Gaussian regime d ≥ 2s (d = 3, s = 1.2 and 1.5; d = 5 and 4 at s = 2): Landau values obey the stated relations; hyperscaling holds too at d = 2s', () => {
  for (const [dText, sText] of [['3', '1.2'], ['3', '1.5'], ['5', '2'], ['4', '2']]) {
    const where = `mean field d = ${dText} s = ${sText}`;
    const r = run({ job: 'exponents', model: { preset: 'on', N: 1 }, d: dText, s: sText, digits: DIGITS });
    assert.equal(r.meanField, true, where);
    const at = { d: new P(dText), s: new P(sText) };
    checkStated(r, MEAN_FIELD, where);
    for (const relation of MEAN_FIELD) checkRelation(relation, r.values, at, where);
    const upper = at.d.eq(at.s.times(2));
    if (upper) for (const relation of HYPERSCALING) checkRelation(relation, r.values, at, `${where} (d = 2s)`);
    assert.deepEqual(r.notices.map((n: Any) => n.kind), [upper ? 'upper-critical-dimension' : 'mean-field'], where);
  }
});

for (const N of [0, 1, 3, 10]) {
  test(`O(${N}) scans over s from below d/2 to 2 (d = 3 and 2.5): every point's printed values obey the relations of its regime`, () => {
    for (const [dText, from] of [['3', '1.4'], ['2.5', '1.15']]) {
      const r = run({ job: 'scan', model: { preset: 'on', N }, d: dText, s: { from, to: '2', points: 5 }, quantities: ['nuInv', 'omega', 'eta', 'Delta_phi', 'Delta_phi2', 'Delta_phi3', 'Delta_phi4', 'nu', 'gamma', 'alpha', 'beta', 'delta'], digits: DIGITS });
      assert.equal(r.error, undefined, JSON.stringify(r.error));
      for (const p of r.points) {
        const at = { d: new P(dText), s: new P(p.s) };
        const relations = p.regime === 'mean-field' ? MEAN_FIELD : p.s === '2' ? SHORT_RANGE : LONG_RANGE;
        for (const relation of relations) checkRelation(relation, p.values, at, `scan O(${N}) d = ${dText} s = ${p.s}`);
      }
    }
  });
}

test('the check has teeth: ν from its own truncated series (what was printed before) breaks ν = 1/(1/ν) at d = 3, s = 1.8', () => {
  const r = run({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '3', s: '1.8', digits: DIGITS });
  const eps = new P('0.6');
  const truncatedNu = (r.series.nu as string[]).reduce((sum, c, k) => sum.plus(new P(c).times(eps.pow(k))), new P(0));
  const values = { ...r.values, nu: truncatedNu.toSignificantDigits(DIGITS).toString() };
  assert.throws(() => checkRelation(COMMON[0], values, { d: new P(3), s: new P('1.8') }, 'control'), /ν = 1\/\(1\/ν\) gives/);
});
