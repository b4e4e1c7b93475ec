import { test } from 'node:test';
import assert from 'node:assert/strict';
import { deriveFlow, generateGraphs, graphWeight, symbolicCalculus, type DerivedFlow } from '../../../shared/engine/diagrams/index';
import type { Graph } from '../../../shared/engine/diagrams/graphs';
import { cubicFamily, onFamily, onModel } from '../../../shared/engine/models/index';
import type { CouplingPolynomial } from '../../../shared/engine/models/couplingPolynomial';
import { type Expression, q } from '../../../shared/engine/symbolic/index';
import { polyEvaluate } from '../../../shared/engine/symbolic/polynomial';
import { type Q, Q0, qAdd, qDiv, qEquals, qIsZero, qMul, qSub, qToString } from '../../../shared/engine/symbolic/rational';
import { ratEvaluate } from '../../../shared/engine/symbolic/ratfunc';
import { type CouplingPoly, PAIRED_ASSIGNMENTS, averagedValue, cubicStructure, onStructure } from '../helpers/graphContraction';

/*
 * The three-loop β-functions of the cubic model at s = 2, rebuilt outside the engine from the classic
 * O(N) functions, and compared entry by entry with what the engine derives.
 *
 * Why this pins them. In minimal subtraction every graph g contributes (its tensor weight) × (one number
 * z_g, the simple pole of K R̄ g times −L), the same number in every model; the leg terms come from γ_φ.
 * So, per loop order L:
 *   β_k      = Σ_vertex graphs W_g,k z_g + 4 γ_φ g_k            (γ_φ ∝ δ in the O(N) and cubic models)
 *   γ_φ²     = Σ_insertion graphs W_h z_g(h) + 2 γ_φ            (h: g with one vertex made the φ² insertion)
 *   γ_φ      = W_Σ z_Σ                                          (the self-energy graph of that order)
 * Facts of the trade used (common practice): the pole of a logarithmically divergent graph after
 * subtraction does not depend on where the external momenta enter, so an insertion graph shares z with
 * its four-point graph; a graph that falls apart at one vertex (a chain) has no simple pole after
 * subtraction; at three loops only the tetrahedron (one external leg per vertex, a line between every two; period
 * 6ζ(3)) gives
 * ζ(3), and the others (reducible to one-loop integrals with integer indices) give rationals.
 * The weights W are computed here by plain index sums (tests/unit/helpers/graphContraction.ts) times
 * the graph's sign·labellings/|Aut| (the engine's N = 1 weight, checked against that formula and the
 * zero-dimensional counts in generate.test.ts). The numbers z are solved from the classic O(N)
 * functions at N = 2 … 6; they are overdetermined (at three loops 10 equations from β and γ_φ² for 5
 * rational unknowns, of rank 5, and 5 equations for the ζ(3) one), so the O(N) data also check
 * themselves. Nothing of the engine's
 * integrals enters: the rebuilt cubic β is what the published O(N) functions imply.
 *
 * Classic O(N) functions, d = 4 − ε, u = λ/(16π²), V = u/4!·(φ²)² (Kleinert & Schulte-Frohlinde,
 * "Critical Properties of φ⁴-Theories", 2001, ch. 11 and 17; recalled from memory, also in
 * tests/unit/helpers/threeLoop.ts and docs/physics.md):
 *   β    = −εu + (N+8)/3 u² − (3N+14)/3 u³ + [33N² + 922N + 2960 + 96ζ(3)(5N+22)]/216 u⁴
 *   γ_φ  = (N+2)/36 u² − (N+2)(N+8)/432 u³
 *   γ_φ² = (N+2)/3 u − 5(N+2)/18 u² + (N+2)(5N+37)/36 u³
 */

/** A coefficient split as rational + ζ(3) × rational. */
interface Value {
  rational: Q;
  zeta3: Q;
}
const value = (rational: Q, zeta3: Q = Q0): Value => ({ rational, zeta3 });

const CLASSIC = {
  beta: [
    (N: number) => value(q(N + 8, 3)),
    (N: number) => value(q(-(3 * N + 14), 3)),
    (N: number) => value(q(33 * N * N + 922 * N + 2960, 216), q(96 * (5 * N + 22), 216)),
  ],
  gammaPhi: [() => value(Q0), (N: number) => value(q(N + 2, 36)), (N: number) => value(q(-(N + 2) * (N + 8), 432))],
  gammaPhi2: [(N: number) => value(q(N + 2, 3)), (N: number) => value(q(-5 * (N + 2), 18)), (N: number) => value(q((N + 2) * (5 * N + 37), 36))],
};
const ON_POINTS = [2, 3, 4, 5, 6];
const CUBIC_POINTS = [2, 3, 4, 5];

// ---- graphs as data ------------------------------------------------------------------------------

/** Sign · distinct labellings / |Aut|: the engine's weight at N = 1, checked in generate.test.ts. */
const prefactors = new Map<string, Q>();
const prefactor = (g: Graph): Q => prefactors.get(g.id) ?? prefactors.set(g.id, polyEvaluate(graphWeight(onModel(1), g).terms[0].values[0], {})).get(g.id)!;

/** Internal adjacency and external legs per vertex, canonical over vertex orderings (externals unlabelled). */
function shape(vertices: readonly { legs: readonly string[] }[], externals: readonly string[]): string {
  const n = vertices.length;
  const between = (a: number, b: number) => vertices[a].legs.filter((l) => !externals.includes(l) && vertices[b].legs.includes(l)).length;
  const permutations = (items: number[]): number[][] => (items.length <= 1 ? [items] : items.flatMap((x, i) => permutations([...items.slice(0, i), ...items.slice(i + 1)]).map((p) => [x, ...p])));
  const forms = permutations([...Array(n).keys()]).map((order) =>
    order.map((a) => `${vertices[a].legs.filter((l) => externals.includes(l)).length}:${order.map((b) => (a === b ? '-' : between(a, b))).join('')}`).join('|'),
  );
  return forms.sort()[0];
}
const vertexShape = (g: Graph) => shape(g.vertices, g.externals);
/** The four-point graph an insertion graph comes from: its insertion vertex made quartic with two external legs. */
const parentShape = (h: Graph) =>
  shape(h.vertices.map((v) => (v.kind === 'insertion' ? { legs: [...v.legs, '#1', '#2'] } : v)), [...h.externals, '#1', '#2']);

/** True when removing one vertex splits the rest (the graph is a product of smaller ones: no simple pole). */
function fallsApart(g: Graph): boolean {
  const internal = (a: number, b: number) => g.vertices[a].legs.some((l) => !g.externals.includes(l) && g.vertices[b].legs.includes(l));
  return g.vertices.some((_, cut) => {
    const rest = [...g.vertices.keys()].filter((v) => v !== cut);
    const reached = new Set([rest[0]]);
    for (let grew = true; grew; ) {
      grew = false;
      for (const a of rest) if (!reached.has(a) && [...reached].some((b) => internal(a, b))) (reached.add(a), (grew = true));
    }
    return reached.size < rest.length;
  });
}
/** The tetrahedron: one external leg per vertex and a line between every two vertices. */
const isTetrahedron = (g: Graph) =>
  g.vertices.length === 4 &&
  g.vertices.every((v, a) => v.legs.filter((l) => g.externals.includes(l)).length === 1 && g.vertices.every((w, b) => a === b || v.legs.filter((l) => w.legs.includes(l)).length === 1));

// ---- weights by index sums -----------------------------------------------------------------------

/** W_g for a four-point graph: coefficients on the structures (P/3, δ_ijkl) per coupling monomial. */
function vertexWeight(g: Graph, n: number, structures: typeof onStructure[]): Map<string, [Q, Q]> {
  const paired = averagedValue(g, n, structures, PAIRED_ASSIGNMENTS); // = w_P/3
  const equal = averagedValue(g, n, structures, [[0, 0, 0, 0]]); // = w_P + w_δ
  const c = prefactor(g);
  const out = new Map<string, [Q, Q]>();
  for (const key of new Set([...paired.keys(), ...equal.keys()])) {
    const wP = qMul(q(3), paired.get(key) ?? Q0);
    out.set(key, [qMul(c, wP), qMul(c, qSub(equal.get(key) ?? Q0, wP))]);
  }
  return out;
}

/** W for a two-point graph (self-energy or φ² insertion): the coefficient of δ_ab per monomial. */
function twoPointWeight(g: Graph, n: number, structures: typeof onStructure[]): CouplingPoly {
  const off = averagedValue(g, n, structures, [[0, 1]]);
  for (const [key, c] of off) assert.ok(qIsZero(c), `${g.id}: the two-point weight is ∝ δ_ab (monomial ${key})`);
  const diagonal = averagedValue(g, n, structures, [[0, 0]]);
  return new Map([...diagonal].map(([key, c]) => [key, qMul(prefactor(g), c)]));
}

// ---- exact linear algebra ------------------------------------------------------------------------

/** Solves A z = b exactly for an overdetermined, consistent system of full column rank; fails otherwise. */
function solveExactly(rows: Q[][], rhs: Q[], label: string): Q[] {
  const m = rows.map((r, i) => [...r, rhs[i]]);
  const unknowns = rows[0].length;
  let pivotRow = 0;
  const pivots: number[] = [];
  for (let col = 0; col < unknowns; col++) {
    const found = m.findIndex((r, i) => i >= pivotRow && !qIsZero(r[col]));
    assert.ok(found >= 0, `${label}: the classic functions do not fix unknown ${col} (rank below ${unknowns})`);
    [m[pivotRow], m[found]] = [m[found], m[pivotRow]];
    const p = m[pivotRow][col];
    m[pivotRow] = m[pivotRow].map((x) => qDiv(x, p));
    for (let i = 0; i < m.length; i++) {
      if (i === pivotRow || qIsZero(m[i][col])) continue;
      const f = m[i][col];
      m[i] = m[i].map((x, j) => qSub(x, qMul(f, m[pivotRow][j])));
    }
    pivots.push(pivotRow++);
  }
  for (let i = pivotRow; i < m.length; i++) assert.ok(qIsZero(m[i][unknowns]), `${label}: the classic functions contradict each other (row ${i} leaves ${qToString(m[i][unknowns])})`);
  return pivots.map((row) => m[row][unknowns]);
}

// ---- the per-graph numbers from the classic O(N) functions -----------------------------------------

interface GraphNumbers {
  /** z_g for every four-point graph of the order, by graph id, as rational + ζ(3) parts. */
  vertex: Map<string, Value>;
  /** z_Σ of the self-energy graph of the order (none at one loop). */
  selfEnergy: Q | null;
}

function solveGraphNumbers(L: number): GraphNumbers {
  const vertexGraphs = generateGraphs('vertex', L);
  const insertions = generateGraphs('massInsertion', L);
  const selfEnergy = generateGraphs('selfEnergy', L)[0] ?? null;
  // γ_φ of this order fixes z_Σ; it must be one number for every N
  let zSigma: Q | null = null;
  if (selfEnergy) {
    const values = ON_POINTS.map((N) => qDiv(CLASSIC.gammaPhi[L - 1](N).rational, twoPointWeight(selfEnergy, N, [onStructure]).get(String(L))!));
    values.forEach((v) => assert.ok(qEquals(v, values[0]), `γ_φ at ${L} loops: one number for the self-energy graph at every N`));
    zSigma = values[0];
  }
  const gammaAt = (N: number) => (selfEnergy ? qMul(zSigma!, twoPointWeight(selfEnergy, N, [onStructure]).get(String(L))!) : Q0);
  const rational = vertexGraphs.filter((g) => !fallsApart(g) && !isTetrahedron(g));
  const withZeta = vertexGraphs.filter((g) => isTetrahedron(g));
  const rows: Q[][] = [];
  const rhs: Q[] = [];
  const zetaRows: Q[][] = [];
  const zetaRhs: Q[] = [];
  const key = String(L + 1);
  for (const N of ON_POINTS) {
    const weightOf = (g: Graph) => vertexWeight(g, N, [onStructure]).get(key)![0];
    const beta = CLASSIC.beta[L - 1](N);
    rows.push(rational.map(weightOf));
    rhs.push(qSub(beta.rational, qMul(q(4), gammaAt(N))));
    if (withZeta.length) (zetaRows.push(withZeta.map(weightOf)), zetaRhs.push(beta.zeta3));
    else assert.ok(qIsZero(beta.zeta3));
    const insertionRow = rational.map(() => Q0);
    for (const h of insertions) {
      const parent = rational.findIndex((g) => vertexShape(g) === parentShape(h));
      if (parent < 0) continue; // its four-point graph falls apart: no simple pole
      insertionRow[parent] = qAdd(insertionRow[parent], twoPointWeight(h, N, [onStructure]).get(String(L))!);
    }
    rows.push(insertionRow);
    rhs.push(qSub(CLASSIC.gammaPhi2[L - 1](N).rational, qMul(q(2), gammaAt(N))));
  }
  const z = solveExactly(rows, rhs, `${L} loops`);
  const zZeta = withZeta.length ? solveExactly(zetaRows, zetaRhs, `${L} loops, ζ(3)`) : [];
  const vertex = new Map<string, Value>(vertexGraphs.map((g) => [g.id, value(Q0)]));
  rational.forEach((g, i) => vertex.set(g.id, value(z[i])));
  withZeta.forEach((g, i) => vertex.set(g.id, value(Q0, zZeta[i])));
  return { vertex, selfEnergy: zSigma };
}

/** β_u, β_v of the cubic model at one loop order, per monomial "a,b", rebuilt from the per-graph numbers. */
function rebuiltCubicBeta(L: number, numbers: GraphNumbers, N: number): [Map<string, Value>, Map<string, Value>] {
  const structures = [onStructure, cubicStructure];
  const out: [Map<string, Value>, Map<string, Value>] = [new Map(), new Map()];
  const add = (k: number, key: string, v: Value) => {
    const prev = out[k].get(key) ?? value(Q0);
    out[k].set(key, value(qAdd(prev.rational, v.rational), qAdd(prev.zeta3, v.zeta3)));
  };
  for (const g of generateGraphs('vertex', L)) {
    const z = numbers.vertex.get(g.id)!;
    for (const [key, [wP, wD]] of vertexWeight(g, N, structures)) {
      add(0, key, value(qMul(wP, z.rational), qMul(wP, z.zeta3)));
      add(1, key, value(qMul(wD, z.rational), qMul(wD, z.zeta3)));
    }
  }
  const selfEnergy = generateGraphs('selfEnergy', L)[0];
  if (selfEnergy) {
    // leg terms 4γ_φ g_k: γ_φ is a monomial of degree L; times g_k raises the power of coupling k
    for (const [key, w] of twoPointWeight(selfEnergy, N, structures)) {
      const [a, b] = key.split(',').map(Number);
      const leg = qMul(q(4), qMul(w, numbers.selfEnergy!));
      add(0, `${a + 1},${b}`, value(leg));
      add(1, `${a},${b + 1}`, value(leg));
    }
  }
  return out;
}

// ---- the engine's side ---------------------------------------------------------------------------

/** An engine coefficient at numeric N, split exactly into its rational and ζ(3) parts. */
function engineValue(e: Expression, N: number): Value {
  let rational = Q0;
  let zeta3 = Q0;
  for (const t of e.terms.values()) {
    const c = ratEvaluate(t.coeff, { N: q(N) });
    if (t.monomial.length === 0) rational = qAdd(rational, c);
    else {
      assert.ok(t.monomial.length === 1 && t.monomial[0].atom.kind === 'zeta' && t.monomial[0].atom.n === 3 && qEquals(t.monomial[0].exponent, q(1)), 'only ζ(3) appears at s = 2');
      zeta3 = qAdd(zeta3, c);
    }
  }
  return value(rational, zeta3);
}
function engineTerms(p: CouplingPolynomial<Expression>, degree: number, N: number): Map<string, Value> {
  const out = new Map<string, Value>();
  for (const t of p.terms.values()) if (t.powers.reduce((a, b) => a + b, 0) === degree) out.set(t.powers.join(','), engineValue(t.coeff, N));
  return out;
}

let cubic: DerivedFlow<Expression> | null = null;
const cubicAtTwo = () => (cubic ??= deriveFlow(cubicFamily, symbolicCalculus(q(2)), 3));
const numbersByOrder = new Map<number, GraphNumbers>();
const numbersAt = (L: number) => numbersByOrder.get(L) ?? numbersByOrder.set(L, solveGraphNumbers(L)).get(L)!;
const shown = (v: Value | undefined) => (v ? `${qToString(v.rational)} + ${qToString(v.zeta3)}ζ(3)` : '0');
const same = (a: Value | undefined, b: Value | undefined) => qEquals(a?.rational ?? Q0, b?.rational ?? Q0) && qEquals(a?.zeta3 ?? Q0, b?.zeta3 ?? Q0);

test('index sums give the engine\'s tensor weights for every graph through three loops, O(N) and cubic (N = 2 … 5)', () => {
  for (const L of [1, 2, 3]) {
    for (const g of generateGraphs('vertex', L)) {
      const engine = graphWeight(cubicFamily, g);
      for (const N of CUBIC_POINTS) {
        const mine = vertexWeight(g, N, [onStructure, cubicStructure]);
        for (const t of engine.terms) {
          const [wP, wD] = mine.get(t.powers.join(',')) ?? [Q0, Q0];
          const [eP, eD] = t.values.map((v) => polyEvaluate(v, { N: q(N) }));
          assert.ok(qEquals(wP, eP) && qEquals(wD, eD), `${g.id} at N = ${N}, monomial ${t.powers}: (${qToString(wP)}, ${qToString(wD)}) vs engine (${qToString(eP)}, ${qToString(eD)})`);
        }
      }
    }
  }
});

test('the classic O(N) β, γ_φ and γ_φ² fix one number per graph at one, two and three loops, consistently at N = 2 … 6 (chains: none; the tetrahedron: ζ(3) only)', () => {
  // one and two loops: the bubble and the two-loop vertex graph (written out: both −2 in these units)
  const bubble = numbersAt(1);
  assert.deepEqual([...bubble.vertex.values()].map(shown), ['-2 + 0ζ(3)']);
  const two = numbersAt(2);
  assert.deepEqual([...two.vertex.values()].map(shown).sort(), ['-2 + 0ζ(3)', '0 + 0ζ(3)']);
  const three = numbersAt(3);
  assert.equal([...three.vertex.values()].filter((v) => !qIsZero(v.zeta3)).length, 1);
});

test('the engine\'s own pole of every graph through three loops is the number the classic O(N) functions fix (z = −L × the 1/ε coefficient of K R̄ G)', () => {
  const flow = deriveFlow(onFamily, symbolicCalculus(q(2)), 3);
  for (const entry of flow.trail) {
    if (entry.graph.function !== 'vertex') continue;
    const L = entry.graph.loops;
    const fromClassic = numbersAt(L).vertex.get(entry.graph.id)!;
    const pole = engineValue(entry.subtracted.pole.coefficient(-1) as Expression, 1);
    const engine = value(qMul(q(-L), pole.rational), qMul(q(-L), pole.zeta3));
    assert.ok(same(engine, fromClassic), `${entry.graph.title}: engine ${shown(engine)} vs classic ${shown(fromClassic)}`);
  }
});

test('cubic anisotropy at s = 2: the engine\'s β_u and β_v through three loops equal the ones the classic O(N) functions imply, every monomial (u⁴ … v⁴, rational and ζ(3) parts), N = 2 … 5', () => {
  const flow = cubicAtTwo();
  for (const L of [1, 2, 3]) {
    const numbers = numbersAt(L);
    for (const N of CUBIC_POINTS) {
      const rebuilt = rebuiltCubicBeta(L, numbers, N);
      for (const k of [0, 1]) {
        const engine = engineTerms(flow.beta[k], L + 1, N);
        for (const key of new Set([...engine.keys(), ...rebuilt[k].keys()])) {
          assert.ok(same(engine.get(key), rebuilt[k].get(key)), `β_${k === 0 ? 'u' : 'v'} at ${L} loops, N = ${N}, u^a v^b with (a, b) = (${key}): engine ${shown(engine.get(key))} vs classic ${shown(rebuilt[k].get(key))}`);
        }
      }
    }
  }
});

test('the rebuilt cubic β is not trivially the engine\'s: changing one graph number changes a mixed term', () => {
  const numbers = numbersAt(3);
  const [id] = [...numbers.vertex.entries()].find(([, v]) => !qIsZero(v.rational))!;
  const altered: GraphNumbers = { ...numbers, vertex: new Map(numbers.vertex).set(id, value(qAdd(numbers.vertex.get(id)!.rational, q(1, 7)))) };
  const [good, bad] = [rebuiltCubicBeta(3, numbers, 3), rebuiltCubicBeta(3, altered, 3)];
  assert.ok(!same(good[0].get('3,1'), bad[0].get('3,1')) || !same(good[1].get('3,1'), bad[1].get('3,1')), 'a changed graph number shows in the u³v terms');
});
