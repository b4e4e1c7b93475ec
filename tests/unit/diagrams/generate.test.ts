import { test } from 'node:test';
import assert from 'node:assert/strict';
import {
  type Diagram,
  GRAPHS,
  type Graph,
  type GraphFunction,
  type GraphWeight,
  automorphismCount,
  enumerateDiagrams,
  generateGraphs,
  generatedGraphsUpTo,
  graphSign,
  graphWeight,
  symmetryData,
} from '../../../shared/engine/diagrams/index';
import { cubicFamily, onFamily, onModel } from '../../../shared/engine/models/index';
import { type Q, Q0, Q1, polyEquals, polyEvaluate, polyToString, q, qAdd, qDiv, qEquals, qMul, qSub, qToString } from '../../../shared/engine/symbolic/index';

const FUNCTIONS: GraphFunction[] = ['vertex', 'selfEnergy', 'massInsertion'];

// ---- reference: graph structure read off the leg labels, isomorphism by trying every vertex map ----

interface Shape {
  kinds: string[];
  /** External labels per vertex, sorted. */
  legs: string[][];
  lines: number[][];
}

function shapeOf(g: Pick<Graph, 'vertices' | 'externals'>): Shape {
  const m = g.vertices.length;
  const lines = Array.from({ length: m }, () => new Array<number>(m).fill(0));
  const ends = new Map<string, number[]>();
  g.vertices.forEach((v, i) => v.legs.filter((l) => !g.externals.includes(l)).forEach((l) => ends.set(l, [...(ends.get(l) ?? []), i])));
  for (const [i, j] of ends.values()) {
    lines[i][j]++;
    if (i !== j) lines[j][i]++;
  }
  return { kinds: g.vertices.map((v) => v.kind), legs: g.vertices.map((v) => v.legs.filter((l) => g.externals.includes(l)).sort()), lines };
}

function orderings(n: number): number[][] {
  if (n === 0) return [[]];
  return orderings(n - 1).flatMap((p) => Array.from({ length: n }, (_, k) => [...p.slice(0, k), n - 1, ...p.slice(k)]));
}

/** Whether some vertex map carries g onto h; `labelled`: external labels must match, else only their number. */
function isomorphic(g: Pick<Graph, 'vertices' | 'externals'>, h: Pick<Graph, 'vertices' | 'externals'>, labelled: boolean): boolean {
  const [a, b] = [shapeOf(g), shapeOf(h)];
  if (a.kinds.length !== b.kinds.length) return false;
  const legsMatch = (x: string[], y: string[]) => (labelled ? x.join() === y.join() : x.length === y.length);
  return orderings(a.kinds.length).some((s) =>
    a.kinds.every((k, i) => k === b.kinds[s[i]] && legsMatch(a.legs[i], b.legs[s[i]]) && a.lines[i].every((n, j) => n === b.lines[s[i]][s[j]])),
  );
}

function relabelExternals(g: Graph, map: Record<string, string>): Graph {
  return { ...g, vertices: g.vertices.map((v) => ({ ...v, legs: v.legs.map((l) => map[l] ?? l) })) };
}

/** Distinct labelled graphs among all orderings of the external labels, counted by brute force. */
function distinctLabellings(g: Graph): number {
  const classes: Graph[] = [];
  for (const p of orderings(g.externals.length)) {
    const h = relabelExternals(g, Object.fromEntries(g.externals.map((l, i) => [l, g.externals[p[i]]])));
    if (!classes.some((c) => isomorphic(c, h, true))) classes.push(h);
  }
  return classes.length;
}

/** automorphismCount reads only vertices and externals; the function decides the sign alone. */
const asGraph = (d: Diagram): Graph => ({ ...d, function: 'vertex' });

function assertSameWeight(a: GraphWeight, b: GraphWeight, what: string): void {
  const key = (p: number[]) => p.join(',');
  assert.deepEqual(a.terms.map((t) => key(t.powers)).sort(), b.terms.map((t) => key(t.powers)).sort(), what);
  for (const t of a.terms) {
    const u = b.terms.find((x) => key(x.powers) === key(t.powers))!;
    t.values.forEach((v, i) => assert.ok(polyEquals(v, u.values[i]), `${what} [${key(t.powers)}]: ${polyToString(v)} vs ${polyToString(u.values[i])}`));
  }
}

// ---- the generated list --------------------------------------------------------------------------

test('generated graphs have the Graph shape: degree 4 (quartic) or 2 (insertion), lines with two ends, externals a, b, c, d / a, b', () => {
  for (const g of generatedGraphsUpTo(3)) {
    assert.deepEqual(g.externals, g.function === 'vertex' ? ['a', 'b', 'c', 'd'] : ['a', 'b'], g.id);
    for (const v of g.vertices) assert.equal(v.legs.length, v.kind === 'quartic' ? 4 : 2, g.id);
    assert.equal(g.vertices.filter((v) => v.kind === 'insertion').length, g.function === 'massInsertion' ? 1 : 0, g.id);
    const internal = g.vertices.flatMap((v) => v.legs).filter((l) => !g.externals.includes(l));
    for (const l of new Set(internal)) assert.equal(internal.filter((x) => x === l).length, 2, `${g.id}: line ${l}`);
    // Euler: loops = lines − vertices + 1 for a connected graph.
    assert.equal(g.loops, internal.length / 2 - g.vertices.length + 1, g.id);
    assert.ok(!g.vertices.some((v) => new Set(v.legs).size < v.legs.length), `${g.id} has a self-loop (a massless tadpole)`);
  }
});

test('ids and titles are unique and the same on every run; titles are words', () => {
  const [first, second] = [generatedGraphsUpTo(3), generatedGraphsUpTo(3)];
  assert.deepEqual(first.map((g) => g.id), second.map((g) => g.id));
  assert.equal(new Set(first.map((g) => g.id)).size, first.length);
  assert.equal(new Set(first.map((g) => g.title)).size, first.length);
  for (const g of first) assert.match(g.title, /^(one|two|three)-loop (four-point|self-energy|φ² insertion): [a-zφ²(), –-]+$/, g.title);
  assert.ok(first.some((g) => g.title === 'three-loop four-point: chain of three bubbles (double line ab–x, double line x–y, double line y–cd)'));
});

test('no two generated graphs of a function and loop order are isomorphic (external legs unlabelled)', () => {
  for (const fn of FUNCTIONS) for (let loops = 1; loops <= 3; loops++) {
    const gs = generateGraphs(fn, loops, 'onePI');
    for (let i = 0; i < gs.length; i++) for (let j = i + 1; j < gs.length; j++) assert.ok(!isomorphic(gs[i], gs[j], false), `${gs[i].id} ≅ ${gs[j].id}`);
  }
});

test('generation up to three loops takes well under a second', () => {
  const start = performance.now();
  generatedGraphsUpTo(3);
  const ms = performance.now() - start;
  assert.ok(ms < 1000, `${ms.toFixed(0)} ms`);
});

test('enumeration refuses more than five quartic vertices or four external legs', () => {
  assert.throws(() => enumerateDiagrams({ quartic: 6, externalLegs: 4, insertion: false, filter: 'massless' }), /not generated/);
  assert.throws(() => enumerateDiagrams({ quartic: 2, externalLegs: 6, insertion: false, filter: 'all' }), /not generated/);
});

// ---- 1. the hand-written catalogue ---------------------------------------------------------------

test('up to two loops the generated graphs are the catalogue of graphs.ts: same topologies, |Aut| and tensor weights (O(N) and cubic, symbolic N)', () => {
  for (const fn of FUNCTIONS) for (let loops = 1; loops <= 2; loops++) {
    const generated = generateGraphs(fn, loops);
    const catalogue = GRAPHS.filter((g) => g.function === fn && g.loops === loops);
    assert.equal(generated.length, catalogue.length, `${fn}, ${loops} loops`);
    for (const c of catalogue) {
      const matches = generated.filter((g) => isomorphic(g, c, false));
      assert.equal(matches.length, 1, `${c.id}: generated counterparts ${matches.map((g) => g.id).join(', ')}`);
      const g = matches[0];
      assert.equal(g.loops, c.loops, c.id);
      assert.equal(graphSign(g), graphSign(c), c.id);
      assert.equal(automorphismCount(g, false), automorphismCount(c, false), c.id);
      assert.equal(automorphismCount(g, true), automorphismCount(c, true), c.id);
      assert.deepEqual(symmetryData(g), symmetryData(c), c.id);
      for (const spec of [onFamily, cubicFamily]) assertSameWeight(graphWeight(spec, g), graphWeight(spec, c), `${c.id}, ${spec.label}`);
    }
  }
});

// ---- 2. zero-dimensional φ⁴: Wick's theorem counts every graph -----------------------------------

const factorial = (n: number): bigint => (n <= 1 ? 1n : BigInt(n) * factorial(n - 1));
const doubleFactorial = (n: number): bigint => (n <= 0 ? 1n : BigInt(n) * doubleFactorial(n - 2));
const binomial = (n: number, k: number): bigint => factorial(n) / (factorial(k) * factorial(n - k));

/** Σ over graphs with E labelled external legs, all ending on vertices, of 1/|Aut|: E!/|Aut| per unlabelled graph. */
function sumOverGraphs(quartic: number, legs: number, filter: 'all' | 'connected'): Q {
  return enumerateDiagrams({ quartic, externalLegs: legs, insertion: false, filter }).reduce((s, d) => qAdd(s, q(factorial(legs), BigInt(automorphismCount(asGraph(d), true)))), Q0);
}

test('zero-dimensional φ⁴ (common practice): Σ 1/|Aut| over all graphs at V vertices and E labelled legs is (4V+E−1)!!/(V!·(4!)^V)', () => {
  for (const E of [0, 2, 4]) for (let V = 0; V <= 4; V++) {
    // Wick pairings of 4V + E fields with weight (1/4!)^V/V!. External legs paired directly with
    // each other (2k of them, (2k−1)!! ways) are lines without vertices; the rest end on vertices.
    let total = Q0;
    for (let k = 0; 2 * k <= E; k++) total = qAdd(total, qMul(q(binomial(E, 2 * k) * doubleFactorial(2 * k - 1)), sumOverGraphs(V, E - 2 * k, 'all')));
    const wick = q(doubleFactorial(4 * V + E - 1), factorial(V) * 24n ** BigInt(V));
    assert.ok(qEquals(total, wick), `E = ${E}, V = ${V}: ${qToString(total)} vs ${qToString(wick)}`);
  }
});

test('zero-dimensional φ⁴ (common practice): connected vacuum graphs give the coefficients of log Z, Z = Σ (−g/24)^V (4V−1)!!/V!', () => {
  const order = 4;
  const z = Array.from({ length: order + 1 }, (_, V) => q(doubleFactorial(4 * V - 1), factorial(V) * 24n ** BigInt(V))); // coefficients of (−g)^V
  // log Z = Σ c_V (−g)^V from (log Z)' = Z'/Z: V c_V = V z_V − Σ_{k<V} k c_k z_{V−k}.
  const c: Q[] = [Q0];
  for (let V = 1; V <= order; V++) {
    let s = qMul(q(V), z[V]);
    for (let k = 1; k < V; k++) s = qSub(s, qMul(qMul(q(k), c[k]), z[V - k]));
    c.push(qDiv(s, q(V)));
  }
  assert.ok(qEquals(c[1], q(1, 8)) && qEquals(c[2], q(1, 12)), 'log Z begins −g/8 + g²/12 (figure-eight; two-vertex vacuum graphs 1/16 + 1/48)');
  for (let V = 1; V <= order; V++) {
    const connected = sumOverGraphs(V, 0, 'connected');
    assert.ok(qEquals(connected, c[V]), `V = ${V}: ${qToString(connected)} vs ${qToString(c[V])}`);
  }
});

// ---- 3. counts -----------------------------------------------------------------------------------

test('counts of massless 1PI graphs without tadpoles (recalled from memory): four-point 1, 2, 8; self-energy 0, 1, 1', () => {
  assert.deepEqual([1, 2, 3].map((l) => generateGraphs('vertex', l).length), [1, 2, 8]);
  // At one loop the only self-energy graph is the tadpole, which vanishes in the massless theory.
  assert.deepEqual([1, 2, 3].map((l) => generateGraphs('selfEnergy', l).length), [0, 1, 1]);
});

test('φ² insertion graphs are the four-point graphs with one vertex carrying two external legs, that vertex made the insertion', () => {
  for (let loops = 1; loops <= 3; loops++) {
    const fromVertex: Graph[] = [];
    for (const g of generateGraphs('vertex', loops)) {
      g.vertices.forEach((v, i) => {
        const own = v.legs.filter((l) => g.externals.includes(l));
        if (own.length !== 2) return;
        const [x, y] = g.externals.filter((l) => !own.includes(l));
        const vertices = g.vertices.map((w, j) => (j === i ? { kind: 'insertion' as const, legs: w.legs.filter((l) => !own.includes(l)) } : w));
        const h = relabelExternals({ ...g, function: 'massInsertion', vertices, externals: ['a', 'b'] }, { [x]: 'a', [y]: 'b' });
        if (!fromVertex.some((f) => isomorphic(f, h, false))) fromVertex.push(h);
      });
    }
    const generated = generateGraphs('massInsertion', loops);
    assert.equal(generated.length, fromVertex.length, `${loops} loops`);
    for (const h of fromVertex) assert.equal(generated.filter((g) => isomorphic(g, h, false)).length, 1, `${loops} loops`);
  }
});

// ---- 4. O(N) tensor weights ----------------------------------------------------------------------

test('at N = 1 the O(N) weight of every generated graph is its sign × distinct external labellings / |Aut|', () => {
  const ising = onModel(1);
  for (const g of generatedGraphsUpTo(3)) {
    const weight = graphWeight(ising, g);
    assert.equal(weight.terms.length, 1, g.id);
    const expected = q(graphSign(g) * distinctLabellings(g), automorphismCount(g, false));
    const got = polyEvaluate(weight.terms[0].values[0], {});
    assert.ok(qEquals(got, expected), `${g.id}: ${qToString(got)} vs ${qToString(expected)}`);
  }
});

/** Truncated power series in u with rational coefficients. */
type Series = Q[];
const ORDER = 4;
const sMul = (a: Series, b: Series): Series => a.map((_, n) => a.slice(0, n + 1).reduce((s, x, k) => qAdd(s, qMul(x, b[n - k])), Q0));
const sInv = (a: Series): Series => {
  const out: Series = [qDiv(Q1, a[0])];
  for (let n = 1; n <= ORDER; n++) out.push(qDiv(qSub(Q0, a.slice(1, n + 1).reduce((s, x, k) => qAdd(s, qMul(x, out[n - k - 1])), Q0)), a[0]));
  return out;
};
const sAdd = (a: Series, b: Series, scale: Q = Q1): Series => a.map((x, n) => qAdd(x, qMul(scale, b[n])));
const sScale = (a: Series, c: Q): Series => a.map((x) => qMul(x, c));

/**
 * Zero-dimensional O(N) model, S = φ²/2 + u(φ²)²/24 (λ_abcd = u(δδ + δδ + δδ)/3 as in the preset):
 * ⟨(φ²)^n⟩₀ = N(N+2)…(N+2n−2), so ⟨(φ²)^k⟩ = Σ_V (−u/24)^V/V! ⟨(φ²)^(k+2V)⟩₀ / Z. Then with
 * G = ⟨φ₁φ₁⟩ = ⟨φ²⟩/N and ⟨φ_aφ_bφ_cφ_d⟩ = P_abcd ⟨(φ²)²⟩/(N(N+2)), P = δδ + δδ + δδ:
 *   Γ⁽²⁾ = 1/G,  Γ⁽⁴⁾ = −(⟨φφφφ⟩ − 3G² structure)/G⁴ = −P [⟨(φ²)²⟩/(N(N+2)) − G²]/G⁴,
 *   Γ⁽²'¹⁾ = ∂Γ⁽²⁾/∂t for S + tφ²/2 = (⟨(φ²)²⟩ − ⟨φ²⟩²)/(2N G²).
 * In d = 0 every integral is 1, so each sums the 1PI graphs (tadpoles included) weighted by their
 * tensor factors; Γ⁽⁴⁾ is read in units of λ/u = P/3, as the weights project onto the coupling.
 */
function zeroDimensional(N: Q): { gamma2: Series; gamma4: Series; gamma21: Series } {
  const moment0 = (n: number) => Array.from({ length: n }, (_, j) => qAdd(N, q(2 * j))).reduce(qMul, Q1);
  const raw = (k: number): Series => Array.from({ length: ORDER + 1 }, (_, V) => qMul(q((-1n) ** BigInt(V), factorial(V) * 24n ** BigInt(V)), moment0(k + 2 * V)));
  const inverseZ = sInv(raw(0));
  const [m1, m2] = [sMul(raw(1), inverseZ), sMul(raw(2), inverseZ)];
  const G = sScale(m1, qDiv(Q1, N));
  const inverseG = sInv(G);
  const inverseG2 = sMul(inverseG, inverseG);
  const connected4 = sAdd(sScale(m2, qDiv(Q1, qMul(N, qAdd(N, q(2))))), sMul(G, G), q(-1));
  return {
    gamma2: inverseG,
    gamma4: sScale(sMul(connected4, sMul(inverseG2, inverseG2)), q(-3)),
    gamma21: sScale(sMul(sAdd(m2, sMul(m1, m1), q(-1)), inverseG2), qDiv(Q1, qMul(q(2), N))),
  };
}

test('O(N), symbolic N: weights of all 1PI graphs (tadpoles included) sum to the zero-dimensional Γ⁽⁴⁾, Γ⁽²⁾ and Γ⁽²\'¹⁾ (common practice) through three loops', () => {
  const points = [q(1), q(2), q(3), q(7), q(1, 2), q(-3)];
  const sums = (fn: GraphFunction, loops: number) => {
    const weights = generateGraphs(fn, loops, 'onePI').map((g) => graphWeight(onFamily, g));
    return points.map((N) => weights.reduce((s, w) => qAdd(s, w.terms.reduce((t, term) => qAdd(t, polyEvaluate(term.values[0], { N })), Q0)), Q0));
  };
  const exact = points.map(zeroDimensional);
  const cases: [GraphFunction, number, (e: ReturnType<typeof zeroDimensional>, V: number) => Q][] = [
    ['vertex', 0, (e, V) => e.gamma4[V]],
    ['selfEnergy', 1, (e, V) => e.gamma2[V]],
    ['massInsertion', 0, (e, V) => e.gamma21[V]],
  ];
  for (const [fn, first, expected] of cases) for (let loops = first; loops <= 3; loops++) {
    const V = fn === 'vertex' ? loops + 1 : loops;
    sums(fn, loops).forEach((got, i) => {
      const want = expected(exact[i], V);
      assert.ok(qEquals(got, want), `${fn}, ${loops} loops, N = ${qToString(points[i])}: ${qToString(got)} vs ${qToString(want)}`);
    });
  }
});
