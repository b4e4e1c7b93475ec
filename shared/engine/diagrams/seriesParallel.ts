import { type Affine, type Q, affineScale, coefficientOf, evaluateAffine, q, qCompare, qSub, withoutParameter } from '../symbolic';
import { EPS_NAME, type IntegralKit, type MomentumIntegral } from './integrals';
import { type LineGraph } from './lineGraph';

/** A massless integral that vanishes in dimensional regularization (no scale: a tadpole, or no momentum through loops). */
export const SCALELESS = 'scaleless' as const;

interface Edge {
  a: number;
  b: number;
  m: MomentumIntegral;
}

/**
 * Reduce a graph with momentum p entering at `from` and leaving at `to` to nested one-loop
 * bubbles: two lines between the same vertices form a bubble G(a, b); a vertex with two lines and no
 * momentum of its own joins them in series (powers add). `weights[v]` is an extra power carried by a
 * vertex (a two-point counterterm (p²)^{s/2} is the power −s/2). Returns null when the graph is not
 * series-parallel between the two vertices (the tetrahedron), SCALELESS when it vanishes.
 */
export function reduceSeriesParallel(kit: IntegralKit, g: LineGraph, from: number, to: number, weights: ReadonlyMap<number, Affine> = new Map()): MomentumIntegral | typeof SCALELESS | null {
  if (from === to) return g.lines.length === 0 ? { index: affineScale(kit.s, q(0)), bubbles: [], loops: 0 } : SCALELESS;
  let edges: Edge[] = g.lines.map(([a, b]) => ({ a, b, m: kit.propagator() }));
  const terminal = (v: number) => v === from || v === to;
  for (const v of weights.keys()) if (terminal(v)) return null;
  for (;;) {
    if (edges.some((e) => e.a === e.b)) return SCALELESS;
    const parallel = findParallel(edges);
    if (parallel) {
      const [i, j] = parallel;
      const merged: Edge = { a: edges[i].a, b: edges[i].b, m: kit.bubble(edges[i].m, edges[j].m) };
      edges = [...edges.filter((_, k) => k !== i && k !== j), merged];
      continue;
    }
    const degree = new Map<number, number[]>();
    edges.forEach((e, k) => {
      degree.set(e.a, [...(degree.get(e.a) ?? []), k]);
      degree.set(e.b, [...(degree.get(e.b) ?? []), k]);
    });
    const inner = [...degree.entries()].filter(([v]) => !terminal(v));
    if (inner.some(([, ks]) => ks.length === 1)) return SCALELESS; // a line ending at a vertex without momentum carries none
    const series = inner.find(([, ks]) => ks.length === 2);
    if (series) {
      const [v, [i, j]] = series;
      const other = (e: Edge) => (e.a === v ? e.b : e.a);
      const weight = weights.get(v);
      let m = kit.inSeries(edges[i].m, edges[j].m);
      if (weight) m = kit.inSeries(m, { index: weight, bubbles: [], loops: 0 });
      edges = [...edges.filter((_, k) => k !== i && k !== j), { a: other(edges[i]), b: other(edges[j]), m }];
      continue;
    }
    if (inner.length > 0) return null;
    if (edges.length === 1) return edges[0].m;
    return edges.length === 0 ? SCALELESS : null;
  }
}

function findParallel(edges: readonly Edge[]): [number, number] | null {
  for (let i = 0; i < edges.length; i++)
    for (let j = i + 1; j < edges.length; j++) {
      const [x, y] = [edges[i], edges[j]];
      if ((x.a === y.a && x.b === y.b) || (x.a === y.b && x.b === y.a)) return [i, j];
    }
  return null;
}

/**
 * True when no bubble has an infrared pole: every line power a entering G(a, b) stays below d/2 at
 * ε = 0, for the given s or for every s in (0, 2] when s is symbolic (Γ(d/2 − a) is then regular).
 */
export function isInfraredSafe(kit: IntegralKit, m: MomentumIntegral, allowChains = false): boolean {
  const halfD = withoutParameter(affineScale(kit.d, q(1, 2)), EPS_NAME);
  const chain = (x: Affine) => allowChains && isExactlyS(kit, x);
  return m.bubbles.every(([a, b]) => [a, b].every((x) => chain(x) || positiveOnRange(difference(halfD, withoutParameter(x, EPS_NAME)))));
}

/** A line power equal to s with no ε part: two propagators in series (an infrared chain, see forests.ts). */
function isExactlyS(kit: IntegralKit, x: Affine): boolean {
  const diff = difference(x, kit.s);
  return diff.terms.length === 0 && diff.constant.num === 0n;
}

function difference(x: Affine, y: Affine): Affine {
  const names = new Set([...x.terms.map(([n]) => n), ...y.terms.map(([n]) => n)]);
  const terms: [string, Q][] = [...names].map((n) => [n, qSub(coefficientOf(x, n), coefficientOf(y, n))]);
  return { constant: qSub(x.constant, y.constant), terms: terms.filter(([, c]) => c.num !== 0n) };
}

/** f(s) = c·s + k > 0 for every s in (0, 2] (f affine; only the parameter s may appear). */
function positiveOnRange(f: Affine): boolean {
  if (f.terms.length === 0) return qCompare(f.constant, q(0)) > 0;
  if (f.terms.some(([n]) => n !== 's')) return false;
  const atTwo = evaluateAffine(f, { s: q(2) });
  const atZero = f.constant;
  return qCompare(atTwo, q(0)) > 0 && qCompare(atZero, q(0)) >= 0;
}
