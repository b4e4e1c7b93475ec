import { permutations } from '../models';
import { type Graph, type GraphVertex } from './graphs';

/**
 * A graph as a list of lines between numbered vertices: the form in which subgraphs are found,
 * contracted and reduced to one-loop integrals. `externals[v]` counts every leg of v that is not a
 * line of this graph (the external legs of a 1PI function, or the lines of a bigger graph that
 * attach to a subgraph).
 */
export interface LineGraph {
  kinds: ReadonlyArray<GraphVertex['kind']>;
  externals: readonly number[];
  lines: ReadonlyArray<readonly [number, number]>;
}

export const valence = (kind: GraphVertex['kind']): number => (kind === 'quartic' ? 4 : 2);

export function lineGraphOf(g: Graph): LineGraph {
  const ends = new Map<string, number[]>();
  g.vertices.forEach((v, i) => v.legs.forEach((l) => !g.externals.includes(l) && ends.set(l, [...(ends.get(l) ?? []), i])));
  const lines = [...ends.values()].map(([a, b]) => [a, b] as const);
  return { kinds: g.vertices.map((v) => v.kind), externals: g.vertices.map((v) => v.legs.filter((l) => g.externals.includes(l)).length), lines };
}

export const loopsOf = (g: LineGraph): number => (g.lines.length === 0 ? 0 : g.lines.length - g.kinds.length + 1);

function connectedWithout(g: LineGraph, skip: number): boolean {
  const n = g.kinds.length;
  if (n === 0) return true;
  const seen = new Array<boolean>(n).fill(false);
  const stack = [0];
  seen[0] = true;
  while (stack.length > 0) {
    const v = stack.pop()!;
    g.lines.forEach(([a, b], k) => {
      if (k === skip) return;
      const w = a === v ? b : b === v ? a : -1;
      if (w >= 0 && !seen[w]) {
        seen[w] = true;
        stack.push(w);
      }
    });
  }
  return seen.every(Boolean);
}

/** Connected, and still connected after removing any one line. */
export function isOnePIGraph(g: LineGraph): boolean {
  return connectedWithout(g, -1) && g.lines.every((_, k) => connectedWithout(g, k));
}

/** The subgraph formed by a set of lines and their end vertices; `vertexMap[v]` is v's number inside it. */
export interface Subgraph {
  lineSet: number;
  graph: LineGraph;
  vertices: number[];
}

export function subgraphOf(g: LineGraph, lineSet: number): Subgraph {
  const chosen = g.lines.map((_, k) => k).filter((k) => (lineSet >> k) & 1);
  const vertices = [...new Set(chosen.flatMap((k) => g.lines[k]))].sort((a, b) => a - b);
  const index = (v: number) => vertices.indexOf(v);
  const lines = chosen.map((k) => [index(g.lines[k][0]), index(g.lines[k][1])] as const);
  const inner = vertices.map(() => 0);
  for (const [a, b] of lines) {
    inner[a]++;
    inner[b]++;
  }
  const kinds = vertices.map((v) => g.kinds[v]);
  return { lineSet, vertices, graph: { kinds, externals: kinds.map((k, i) => valence(k) - inner[i]), lines } };
}

/** Which kind of divergence a 1PI graph has (d = 2s, ε → 0), or null when it is convergent by power counting. */
export type Divergence = 'vertex' | 'insertion' | 'selfEnergy';

export function divergenceOf(g: LineGraph): Divergence | null {
  const legs = g.externals.reduce((a, b) => a + b, 0);
  const insertions = g.kinds.filter((k) => k === 'insertion').length;
  if (insertions === 0 && legs === 4) return 'vertex';
  if (insertions === 1 && legs === 2) return 'insertion';
  if (insertions === 0 && legs === 2) return 'selfEnergy';
  return null;
}

/** The proper 1PI subgraphs with at least one loop that diverge by power counting. */
export function divergentSubgraphs(g: LineGraph): Subgraph[] {
  const all = (1 << g.lines.length) - 1;
  const out: Subgraph[] = [];
  for (let set = 1; set < all; set++) {
    const sub = subgraphOf(g, set);
    if (loopsOf(sub.graph) < 1 || !isOnePIGraph(sub.graph) || divergenceOf(sub.graph) === null) continue;
    out.push(sub);
  }
  return out;
}

/** Sets of pairwise vertex-disjoint subgraphs (non-empty), as index lists into `subs`. */
export function disjointFamilies(subs: readonly Subgraph[]): number[][] {
  const out: number[][] = [];
  const grow = (chosen: number[], from: number, used: Set<number>): void => {
    for (let i = from; i < subs.length; i++) {
      if (subs[i].vertices.some((v) => used.has(v))) continue;
      const next = [...chosen, i];
      out.push(next);
      grow(next, i + 1, new Set([...used, ...subs[i].vertices]));
    }
  };
  grow([], 0, new Set());
  return out;
}

/** G with each subgraph shrunk to a point: the lines of the subgraphs go, their vertices merge. */
export interface Contracted {
  graph: LineGraph;
  /** New number of each old vertex. */
  map: number[];
  /** New vertices that replace a two-point subgraph (they carry its counterterm, ∝ (p²)^{s/2}). */
  twoPoint: number[];
}

/** `deleted`: lines removed outright (infrared counterterms set their momentum to zero). */
export function contract(g: LineGraph, subs: readonly Subgraph[], deleted = 0): Contracted {
  const owner = g.kinds.map((_, v) => subs.findIndex((s) => s.vertices.includes(v)));
  const map = new Array<number>(g.kinds.length).fill(-1);
  const kinds: GraphVertex['kind'][] = [];
  const externals: number[] = [];
  const twoPoint: number[] = [];
  subs.forEach((s) => {
    kinds.push(s.vertices.some((v) => g.kinds[v] === 'insertion') ? 'insertion' : 'quartic');
    externals.push(s.vertices.reduce((sum, v) => sum + g.externals[v], 0));
    if (divergenceOf(s.graph) === 'selfEnergy') twoPoint.push(kinds.length - 1);
  });
  g.kinds.forEach((k, v) => {
    if (owner[v] >= 0) map[v] = owner[v];
    else {
      map[v] = kinds.length;
      kinds.push(k);
      externals.push(g.externals[v]);
    }
  });
  const removed = subs.reduce((m, s) => m | s.lineSet, deleted);
  const lines = g.lines.filter((_, k) => !((removed >> k) & 1)).map(([a, b]) => [map[a], map[b]] as const);
  return { graph: { kinds, externals, lines }, map, twoPoint };
}

/** A key equal for isomorphic graphs (at most 7 vertices: the search tries every vertex order). */
export function canonicalKey(g: LineGraph): string {
  let best: string | null = null;
  for (const order of permutations(g.kinds.length)) {
    const at = new Array<number>(order.length);
    order.forEach((v, i) => (at[v] = i));
    const vertices = order.map((v) => `${g.kinds[v][0]}${g.externals[v]}`).join(',');
    const lines = g.lines.map(([a, b]) => (at[a] <= at[b] ? `${at[a]}-${at[b]}` : `${at[b]}-${at[a]}`)).sort().join(',');
    const key = `${vertices}|${lines}`;
    if (best === null || key < best) best = key;
  }
  return best ?? '';
}
