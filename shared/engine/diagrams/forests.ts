import { fail } from '../precision';
import { LaurentSeries } from '../series';
import { type Affine, affineScale, q } from '../symbolic';
import { type Calculus } from './calculus';
import { type IntegralKit, type MomentumIntegral, integralLatex, integralSeries, logarithmFactor } from './integrals';
import { type LineGraph, type Subgraph, canonicalKey, contract, disjointFamilies, divergenceOf, divergentSubgraphs, loopsOf } from './lineGraph';
import { SCALELESS, isInfraredSafe, reduceSeriesParallel } from './seriesParallel';
import { ConsistencyError, type CountertermTrail, polePart } from './subtraction';

/**
 * The R̄-operation on any graph by its forests (docs/engine.md, "Three loops"):
 *   R̄G = G + Σ_F Π_{γ∈F} (−K R̄γ) · G/F,
 * F running over the non-empty sets of vertex-disjoint divergent 1PI proper subgraphs; K R̄γ comes
 * from the same function (nested divergences by recursion). A four-point or φ²-insertion subgraph's
 * K R̄γ is a number; a two-point subgraph's is that number times (p²)^{s/2}, which sits on the point
 * it shrinks to. Each graph is evaluated with momentum through two of its vertices such that it and
 * every G/F reduce to nested one-loop bubbles without infrared poles (infrared rearrangement: the
 * pole part of a logarithmically divergent graph does not depend on where momenta enter).
 */
export interface ForestPole<C> {
  /** K R̄G (for a self-energy: the coefficient of (p²)^{s/2}). */
  pole: LaurentSeries<C>;
  laurent: LaurentSeries<C>;
  subtracted: LaurentSeries<C>;
  counterterms: CountertermTrail<C>[];
  integralLatex: string;
  rearrangement: string;
}

/** The non-reducible graph: K4 with one external leg per vertex, pole (2/3) Γ(s)² P(s)/ε. */
export interface Primitives<C> {
  tetrahedron(kit: IntegralKit): C;
}

export type PoleMemo<C> = Map<string, ForestPole<C>>;

/** One term of R̄*G: IR chains deleted (S'), UV subgraphs shrunk (F), the reduced integral. */
interface Term {
  subs: Subgraph[];
  /** Lines deleted as infrared counterterms (two-line chains of power s). */
  chains: number[];
  reduced: MomentumIntegral | typeof SCALELESS;
}

interface Plan {
  from: number;
  to: number;
  /** The graph itself (no counterterm) and every counterterm term. */
  integral: MomentumIntegral | typeof SCALELESS;
  terms: Term[];
  chains: number[];
}

export interface PlanOptions {
  /** Tests: skip infrared-safe routings and use infrared counterterms (R*) wherever a chain exists. */
  preferInfraredCounterterms?: boolean;
}

const weightsFor = (kit: IntegralKit, twoPoint: readonly number[]) => new Map<number, Affine>(twoPoint.map((v) => [v, affineScale(kit.s, q(-1, 2))]));

function terminalPairs(g: LineGraph): [number, number][] {
  const n = g.kinds.length;
  const rank = (v: number) => (g.kinds[v] === 'insertion' ? 0 : g.externals[v] > 0 ? 1 : 2);
  const pairs: [number, number][] = [];
  for (let a = 0; a < n; a++) for (let b = a + 1; b < n; b++) pairs.push([a, b]);
  return pairs.sort((x, y) => rank(x[0]) + rank(x[1]) - rank(y[0]) - rank(y[1]));
}

/**
 * Infrared chains for a routing: two lines meeting at a vertex that carries no external momentum
 * and no other line. Their common momentum k has the propagator (k²)^{−s}, logarithmically
 * divergent at k → 0 in d = 2s − ε. Null when chains touch (a longer chain: a power divergence).
 */
function infraredChains(g: LineGraph, from: number, to: number): number[] | null {
  const chains: number[] = [];
  for (let w = 0; w < g.kinds.length; w++) {
    if (w === from || w === to) continue;
    const at = g.lines.map((l, k) => [l, k] as const).filter(([l]) => l[0] === w || l[1] === w);
    if (at.length !== 2 || at.some(([l]) => l[0] === l[1])) continue;
    const others = at.map(([l]) => (l[0] === w ? l[1] : l[0]));
    if (others[0] === others[1]) continue;
    chains.push((1 << at[0][1]) | (1 << at[1][1]));
  }
  for (let i = 0; i < chains.length; i++) for (let j = i + 1; j < chains.length; j++) if (chains[i] & chains[j]) return null;
  return chains;
}

const subsetsOf = <T>(xs: readonly T[]): T[][] => xs.reduce<T[][]>((acc, x) => [...acc, ...acc.map((s) => [...s, x])], [[]]);

function usable(kit: IntegralKit, m: MomentumIntegral | typeof SCALELESS | null, allowChains: boolean): m is MomentumIntegral | typeof SCALELESS {
  return m !== null && (m === SCALELESS || isInfraredSafe(kit, m, allowChains));
}

function termsFor(kit: IntegralKit, g: LineGraph, subs: readonly Subgraph[], from: number, to: number, chains: readonly number[]): Term[] | null {
  const terms: Term[] = [];
  for (const deleted of subsetsOf(chains)) {
    const mask = deleted.reduce((m, c) => m | c, 0);
    const avoiding = subs.filter((s) => (s.lineSet & mask) === 0);
    const families = [[] as number[], ...disjointFamilies(avoiding)].map((f) => f.map((i) => avoiding[i]));
    const stillChained = deleted.length < chains.length;
    for (const f of families) {
      if (f.length === 0 && deleted.length === 0) continue;
      const c = contract(g, f, mask);
      const reduced = reduceSeriesParallel(kit, c.graph, c.map[from], c.map[to], weightsFor(kit, c.twoPoint));
      if (!usable(kit, reduced, stillChained)) return null;
      terms.push({ subs: f, chains: deleted, reduced });
    }
  }
  return terms;
}

/** The first routing for which the graph and every term of R̄G (or R̄*G) reduce to bubbles with known infrared poles. */
function plan(kit: IntegralKit, g: LineGraph, subs: readonly Subgraph[], options: PlanOptions): Plan | null {
  const selfEnergy = divergenceOf(g) === 'selfEnergy';
  const legs = g.kinds.map((_, v) => v).filter((v) => g.externals[v] > 0);
  const pairs: [number, number][] = selfEnergy ? (legs.length === 2 ? [[legs[0], legs[1]]] : [[legs[0], legs[0]]]) : terminalPairs(g);
  const passes = options.preferInfraredCounterterms ? [true, false] : [false, true];
  for (const withChains of passes) {
    for (const [from, to] of pairs) {
      const chains = withChains ? infraredChains(g, from, to) : [];
      if (chains === null || (withChains && chains.length === 0) || chains.length > 2) continue;
      const integral = reduceSeriesParallel(kit, g, from, to);
      if (!usable(kit, integral, withChains)) continue;
      const terms = termsFor(kit, g, subs, from, to, chains);
      if (terms) return { from, to, integral, terms, chains };
    }
  }
  return null;
}

const isTetrahedron = (g: LineGraph) =>
  g.kinds.length === 4 && g.kinds.every((k) => k === 'quartic') && g.externals.every((e) => e === 1) && g.lines.length === 6 && new Set(g.lines.map(([a, b]) => `${Math.min(a, b)}-${Math.max(a, b)}`)).size === 6;

function zeroSeries<C>(calc: Calculus<C>): LaurentSeries<C> {
  return LaurentSeries.of(calc.ctx.ring, 0, [], Infinity);
}

function seriesOf<C>(calc: Calculus<C>, kit: IntegralKit, m: MomentumIntegral | typeof SCALELESS, order: number): LaurentSeries<C> {
  return m === SCALELESS ? zeroSeries(calc) : integralSeries(calc.ctx, kit, m, order);
}

function withLog<C>(calc: Calculus<C>, f: LaurentSeries<C>, loops: number, ell: bigint, order: number): LaurentSeries<C> {
  if (f.lowest > order) return f;
  return f.mul(logarithmFactor(calc.ctx, loops, q(ell), order - f.lowest));
}

function describeRouting(g: LineGraph, from: number, to: number): string {
  const name = (v: number) => (g.kinds[v] === 'insertion' ? 'the φ² insertion' : g.externals[v] > 0 ? `the vertex with ${g.externals[v]} external leg${g.externals[v] > 1 ? 's' : ''} (#${v + 1})` : `inner vertex #${v + 1}`);
  return `momentum p enters at ${name(from)} and leaves at ${name(to)}; all other external momenta are zero (the pole part after subtraction does not depend on them)`;
}

function describeSubgraph(g: LineGraph, s: Subgraph): string {
  const kind = divergenceOf(s.graph);
  const what = kind === 'selfEnergy' ? 'two-point' : kind === 'insertion' ? 'φ²-insertion' : 'four-point';
  return `${loopsOf(s.graph)}-loop ${what} subgraph on vertices ${s.vertices.map((v) => `#${v + 1}`).join(', ')} (${s.graph.lines.length} lines)`;
}

export function forestPole<C>(calc: Calculus<C>, kit: IntegralKit, g: LineGraph, primitives: Primitives<C>, memo: PoleMemo<C> = new Map(), options: PlanOptions = {}): ForestPole<C> {
  const key = canonicalKey(g);
  const known = memo.get(key);
  if (known) return known;
  const subs = divergentSubgraphs(g);
  const chosen = plan(kit, g, subs, options);
  let result: ForestPole<C>;
  if (chosen) result = subtractWithPlan(calc, kit, g, chosen, primitives, memo);
  else if (isTetrahedron(g) && subs.length === 0) result = tetrahedronPole(calc, kit, primitives);
  else return fail('not-representable', `a ${loopsOf(g)}-loop graph with lines ${g.lines.map(([a, b]) => `${a + 1}–${b + 1}`).join(', ')} does not reduce to one-loop integrals under any momentum routing`);
  memo.set(key, result);
  return result;
}

function tetrahedronPole<C>(calc: Calculus<C>, kit: IntegralKit, primitives: Primitives<C>): ForestPole<C> {
  const { ring } = calc.ctx;
  const gammaS = calc.ctx.gamma(kit.s);
  const residue = ring.scale(ring.mul(ring.mul(gammaS, gammaS), primitives.tetrahedron(kit)), 2n, 3n);
  const pole = LaurentSeries.of(ring, -1, [residue], Infinity);
  return {
    pole,
    laurent: LaurentSeries.of(ring, -1, [residue], -1),
    subtracted: LaurentSeries.of(ring, -1, [residue], -1),
    counterterms: [],
    integralLatex: '\\tfrac{2}{3}\\,\\Gamma(s)^{2}\\,P(s)\\,\\varepsilon^{-1} + O(\\varepsilon^{0})',
    rearrangement: 'no routing reduces the tetrahedron to one-loop bubbles; it has no divergent subgraph, so its pole is its residue (2/3)Γ(s)²P(s)/ε with P(s) the period of the complete graph on four vertices (docs/tetrahedron.md)',
  };
}

/** The infrared counterterm of a chain in units of the loop normalization Γ(s): +2/ε (docs/engine.md, "Three loops"). */
function chainCounterterm<C>(calc: Calculus<C>): LaurentSeries<C> {
  return LaurentSeries.of(calc.ctx.ring, -1, [calc.ctx.ring.fromRational(2n)], Infinity);
}

function subtractWithPlan<C>(calc: Calculus<C>, kit: IntegralKit, g: LineGraph, p: Plan, primitives: Primitives<C>, memo: PoleMemo<C>): ForestPole<C> {
  const order = 0;
  const { ring } = calc.ctx;
  const loops = loopsOf(g);
  const laurent = seriesOf(calc, kit, p.integral, order);
  const counterterms: CountertermTrail<C>[] = [];
  const terms = p.terms.map((t) => {
    const uv = t.subs.reduce((acc, s) => acc.mul(forestPole(calc, kit, s.graph, primitives, memo).pole.neg()), LaurentSeries.constant(ring, ring.one(), Infinity));
    const factor = t.chains.reduce((acc) => acc.mul(chainCounterterm(calc)), uv);
    const removedLoops = t.subs.reduce((n, s) => n + loopsOf(s.graph), 0) + t.chains.length;
    const reduced = seriesOf(calc, kit, t.reduced, order + removedLoops);
    const titles = [...t.subs.map((s) => describeSubgraph(g, s)), ...t.chains.map((c) => describeChain(g, c))];
    counterterms.push({
      title: titles.join(' and '),
      pole: factor.neg(),
      reduced,
      reducedLatex: t.reduced === SCALELESS ? '0\\ \\text{(scaleless)}' : integralLatex(kit, t.reduced),
    });
    return { factor, reduced, reducedLoops: loops - removedLoops };
  });
  const rbarAt = (ell: bigint, upTo: number) =>
    terms.reduce(
      (acc, t) => (t.factor.lowest > upTo || t.reduced.coefficients().length === 0 ? acc : acc.add(t.factor.mul(withLog(calc, t.reduced, t.reducedLoops, ell, upTo - t.factor.lowest)).truncate(upTo))),
      withLog(calc, laurent, loops, ell, upTo).truncate(upTo),
    );
  const subtracted = rbarAt(0n, order);
  const pole = polePart(subtracted);
  const shifted = polePart(rbarAt(1n, -1));
  for (const c of pole.sub(shifted).coefficients()) {
    if (!calc.isNegligible(c)) throw new ConsistencyError(`a ${loops}-loop graph: a ln(p²)/ε term survives the subtraction of subdivergences (non-local divergence)`);
  }
  const infrared = p.chains.length === 0 ? '' : `; the ${p.chains.length === 1 ? 'chain' : 'chains'} ${p.chains.map((c) => describeChain(g, c)).join(', ')} carry (k²)^{−s} and diverge at k → 0: each gets the infrared counterterm 2/ε·δ(k) (R*-operation)`;
  return {
    pole,
    laurent,
    subtracted,
    counterterms,
    integralLatex: p.integral === SCALELESS ? '0' : integralLatex(kit, p.integral),
    rearrangement: describeRouting(g, p.from, p.to) + infrared,
  };
}

function describeChain(g: LineGraph, chain: number): string {
  const lines = g.lines.filter((_, k) => (chain >> k) & 1).map(([a, b]) => `${a + 1}–${b + 1}`);
  return `infrared chain of lines ${lines.join(' and ')}`;
}
