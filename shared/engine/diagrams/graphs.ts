import { permutations } from '../models';

/** Which 1PI function a graph contributes to. */
export type GraphFunction = 'vertex' | 'selfEnergy' | 'massInsertion';

/** A quartic vertex λ, or the quadratic-operator insertion (φ_a φ_b / 2 with source m_ab). */
export interface GraphVertex {
  kind: 'quartic' | 'insertion';
  /** Leg labels: externals (a, b, c, d) or internal lines (each internal label appears twice). */
  legs: readonly string[];
}

export interface Graph {
  id: string;
  title: string;
  function: GraphFunction;
  loops: number;
  vertices: readonly GraphVertex[];
  externals: readonly string[];
}

export const quartic = (...legs: string[]): GraphVertex => ({ kind: 'quartic', legs });
export const insertion = (...legs: string[]): GraphVertex => ({ kind: 'insertion', legs });

export const quarticVertexCount = (g: Graph): number => g.vertices.filter((v) => v.kind === 'quartic').length;

/**
 * Sign from e^{−S}: each quartic vertex brings −1; Γ⁽⁴⁾ and Γ⁽²⁾ are minus the amputated
 * connected functions, while the insertion (∂Γ⁽²⁾/∂t) flips once more.
 */
export function graphSign(g: Graph): 1 | -1 {
  const v = quarticVertexCount(g) + (g.function === 'massInsertion' ? 0 : 1);
  return v % 2 === 0 ? 1 : -1;
}

interface Adjacency {
  lines: number[][]; // lines[i][j]: internal lines between vertices i and j (i = j: self-loops)
  externalsAt: string[][];
}

function adjacency(g: Graph): Adjacency {
  const m = g.vertices.length;
  const lines = Array.from({ length: m }, () => new Array<number>(m).fill(0));
  const externalsAt = g.vertices.map((v) => v.legs.filter((l) => g.externals.includes(l)));
  const ends = new Map<string, number[]>();
  g.vertices.forEach((v, i) => v.legs.forEach((l) => !g.externals.includes(l) && ends.set(l, [...(ends.get(l) ?? []), i])));
  for (const [label, at] of ends) {
    if (at.length !== 2) throw new Error(`graph ${g.id}: internal line ${label} must have two ends`);
    const [i, j] = at;
    lines[i][j]++;
    if (i !== j) lines[j][i]++;
  }
  return { lines, externalsAt };
}

function factorial(k: number): number {
  return k <= 1 ? 1 : k * factorial(k - 1);
}

/** Permutations of lines and legs that leave every vertex's connections unchanged. */
function lineAndLegPermutations(adj: Adjacency, freeExternals: boolean): number {
  let count = 1;
  const m = adj.lines.length;
  for (let i = 0; i < m; i++) {
    for (let j = i + 1; j < m; j++) count *= factorial(adj.lines[i][j]);
    count *= factorial(adj.lines[i][i]) * 2 ** adj.lines[i][i];
    if (freeExternals) count *= factorial(adj.externalsAt[i].length);
  }
  return count;
}

/**
 * Order of the automorphism group. With `freeExternals` the external legs may be permuted
 * (used with the sum over all labellings); otherwise external labels stay fixed, and
 * 1/|Aut| is the usual symmetry factor of the labelled graph.
 */
export function automorphismCount(g: Graph, freeExternals: boolean): number {
  const adj = adjacency(g);
  const m = g.vertices.length;
  let vertexMaps = 0;
  for (const sigma of permutations(m)) {
    let ok = true;
    for (let i = 0; i < m && ok; i++) {
      if (g.vertices[i].kind !== g.vertices[sigma[i]].kind) ok = false;
      const own = adj.externalsAt[i];
      const image = adj.externalsAt[sigma[i]];
      if (freeExternals ? own.length !== image.length : own.join() !== image.join()) ok = false;
      for (let j = 0; j < m && ok; j++) if (adj.lines[i][j] !== adj.lines[sigma[i]][sigma[j]]) ok = false;
    }
    if (ok) vertexMaps++;
  }
  return vertexMaps * lineAndLegPermutations(adj, freeExternals);
}

/** Symmetry factor 1/|Aut| of the labelled graph and the number of distinct labellings. */
export function symmetryData(g: Graph): { symmetryFactor: [number, number]; labellings: number } {
  const fixed = automorphismCount(g, false);
  const free = automorphismCount(g, true);
  return { symmetryFactor: [1, fixed], labellings: (factorial(g.externals.length) * fixed) / free };
}

// ---- the catalogue ------------------------------------------------------------------------------

const FOUR = ['a', 'b', 'c', 'd'];
const TWO = ['a', 'b'];

export const BUBBLE: Graph = { id: 'bubble', title: 'one-loop bubble', function: 'vertex', loops: 1, externals: FOUR, vertices: [quartic('a', 'b', 'e', 'f'), quartic('e', 'f', 'c', 'd')] };
export const CHAIN: Graph = {
  id: 'chain',
  title: 'chain of two bubbles',
  function: 'vertex',
  loops: 2,
  externals: FOUR,
  vertices: [quartic('a', 'b', 'e', 'f'), quartic('e', 'f', 'g', 'h'), quartic('g', 'h', 'c', 'd')],
};
export const VERTEX_CORRECTED: Graph = {
  id: 'vertexCorrected',
  title: 'bubble inserted in a line of a bubble',
  function: 'vertex',
  loops: 2,
  externals: FOUR,
  vertices: [quartic('a', 'b', 'e', 'f'), quartic('c', 'e', 'g', 'h'), quartic('d', 'f', 'g', 'h')],
};
export const SUNSET: Graph = { id: 'sunset', title: 'two-loop self-energy (sunset)', function: 'selfEnergy', loops: 2, externals: TWO, vertices: [quartic('a', 'e', 'f', 'g'), quartic('b', 'e', 'f', 'g')] };
export const MASS_BUBBLE: Graph = { id: 'massBubble', title: 'φ² insertion, one loop', function: 'massInsertion', loops: 1, externals: TWO, vertices: [insertion('e', 'f'), quartic('e', 'f', 'a', 'b')] };
export const MASS_CHAIN: Graph = {
  id: 'massChain',
  title: 'φ² insertion, chain of two bubbles',
  function: 'massInsertion',
  loops: 2,
  externals: TWO,
  vertices: [insertion('e', 'f'), quartic('e', 'f', 'g', 'h'), quartic('g', 'h', 'a', 'b')],
};
export const MASS_VERTEX: Graph = {
  id: 'massVertex',
  title: 'φ² insertion on a line of the sunset',
  function: 'massInsertion',
  loops: 2,
  externals: TWO,
  vertices: [insertion('e', 'f'), quartic('a', 'e', 'g', 'h'), quartic('b', 'f', 'g', 'h')],
};

export const GRAPHS: readonly Graph[] = [BUBBLE, CHAIN, VERTEX_CORRECTED, SUNSET, MASS_BUBBLE, MASS_CHAIN, MASS_VERTEX];

export function graphsUpTo(loops: number): Graph[] {
  return GRAPHS.filter((g) => g.loops <= loops);
}
