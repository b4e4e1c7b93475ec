import { type Q, Q0, q, qAdd, qMul } from '../../../shared/engine/symbolic/rational';

/**
 * Tensor weights of a graph by plain index sums, for tests that hold the engine's contraction
 * (shared/engine/diagrams/weights.ts) against an independent one. A graph is read only as data: its
 * vertices list their leg labels; a label on two legs is a line, a label in `externals` an external leg.
 * Every internal index runs over 0 … n − 1 and the product of the vertex tensors is summed.
 */
export interface PlainGraph {
  vertices: readonly { kind: 'quartic' | 'insertion'; legs: readonly string[] }[];
  externals: readonly string[];
}

/** An integer-valued symmetric tensor with a rational factor: coupling structure = factor × entries. */
export interface Structure {
  factor: Q;
  entry: (indices: readonly number[]) => number;
}

const delta = (i: number, j: number) => (i === j ? 1 : 0);
/** (δδ + δδ + δδ)/3, the O(N) structure of u in V = u/4!·(φ²)². */
export const onStructure: Structure = {
  factor: q(1, 3),
  entry: ([i, j, k, l]) => delta(i, j) * delta(k, l) + delta(i, k) * delta(j, l) + delta(i, l) * delta(j, k),
};
/** δ_ijkl, the structure of v in V = v/4!·Σ φ_i⁴. */
export const cubicStructure: Structure = { factor: q(1), entry: ([i, j, k, l]) => (i === j && j === k && k === l ? 1 : 0) };

/**
 * Σ over internal indices of Π_v tensor_v, with the external legs fixed to `externalIndex`. Each vertex
 * is multiplied in as soon as its last line is given an index, so a zero prunes the rest of the sum.
 */
export function contract(graph: PlainGraph, n: number, tensors: ((indices: readonly number[]) => number)[], externalIndex: Record<string, number>): number {
  const lines = [...new Set(graph.vertices.flatMap((v) => v.legs))].filter((label) => !graph.externals.includes(label));
  const value: Record<string, number> = { ...externalIndex };
  const depthOf = (label: string) => (graph.externals.includes(label) ? -1 : lines.indexOf(label));
  // vertices complete at each depth (−1: only external legs, evaluated once before the sum)
  const completeAt = Array.from({ length: lines.length + 1 }, () => [] as number[]);
  graph.vertices.forEach((v, i) => completeAt[Math.max(...v.legs.map(depthOf)) + 1].push(i));
  const evaluate = (vertices: number[]) => vertices.reduce((product, i) => (product === 0 ? 0 : product * tensors[i](graph.vertices[i].legs.map((l) => value[l]))), 1);
  const visit = (depth: number, product: number): number => {
    if (depth === lines.length) return product;
    let total = 0;
    for (let i = 0; i < n; i++) {
      value[lines[depth]] = i;
      const next = product * evaluate(completeAt[depth + 1]);
      if (next !== 0) total += visit(depth + 1, next);
    }
    return total;
  };
  const start = evaluate(completeAt[0]);
  return start === 0 ? 0 : visit(0, start);
}

/** A polynomial in the couplings: monomial powers joined by "," → rational coefficient. */
export type CouplingPoly = Map<string, Q>;

function addTo(poly: CouplingPoly, key: string, c: Q) {
  poly.set(key, qAdd(poly.get(key) ?? Q0, c));
}

/**
 * The graph's value with λ = Σ_k g_k S_k on every quartic vertex (δ on an insertion vertex), averaged
 * over the given external index assignments, as a polynomial in the couplings g_k.
 */
export function averagedValue(graph: PlainGraph, n: number, structures: Structure[], assignments: number[][]): CouplingPoly {
  const quartic = graph.vertices.map((v, i) => (v.kind === 'quartic' ? i : -1)).filter((i) => i >= 0);
  const out: CouplingPoly = new Map();
  const choice = new Array<number>(quartic.length).fill(0);
  const combinations = structures.length ** quartic.length;
  for (let c = 0; c < combinations; c++) {
    for (let v = 0, rest = c; v < quartic.length; v++, rest = Math.floor(rest / structures.length)) choice[v] = rest % structures.length;
    const tensors = graph.vertices.map((v, i) => (v.kind === 'insertion' ? ([a, b]: readonly number[]) => delta(a, b) : structures[choice[quartic.indexOf(i)]].entry));
    let sum = 0;
    for (const assignment of assignments) sum += contract(graph, n, tensors, Object.fromEntries(graph.externals.map((label, i) => [label, assignment[i]])));
    const powers = structures.map((_, k) => choice.filter((s) => s === k).length);
    const factor = choice.reduce((f, s) => qMul(f, structures[s].factor), q(1, assignments.length));
    addTo(out, powers.join(','), qMul(factor, q(sum)));
  }
  return out;
}

/** The six ways to put indices (0, 0, 1, 1) on four external legs. */
export const PAIRED_ASSIGNMENTS = [[0, 0, 1, 1], [0, 1, 0, 1], [0, 1, 1, 0], [1, 0, 0, 1], [1, 0, 1, 0], [1, 1, 0, 0]];
