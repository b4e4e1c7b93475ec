import { fail } from '../precision';
import { type Graph, type GraphFunction, type GraphVertex } from './graphs';
import { type Multigraph, type VertexKind, allMultigraphs, components, distinct, hasMasslessTadpole, isConnected, isOnePI, loopCount } from './generateCore';

/**
 * Which graphs an enumeration keeps: `massless` the 1PI graphs without massless tadpoles (the ones
 * that contribute in dimensional regularization), `onePI` all 1PI graphs, `connected`, or `all`
 * (disconnected graphs and vacuum parts included).
 */
export type GraphFilter = 'massless' | 'onePI' | 'connected' | 'all';

export interface DiagramQuery {
  quartic: number;
  /** External legs (at most four); each ends on a vertex (a line joining two external legs directly is not a graph here). */
  externalLegs: number;
  insertion: boolean;
  filter: GraphFilter;
}

/** A generated graph without a 1PI function (vacuum and disconnected graphs have none). */
export type Diagram = Omit<Graph, 'function'> & { components: number };

const EXTERNAL_LABELS = 'abcd';
const LOOP_WORDS = ['zero', 'one', 'two', 'three', 'four', 'five', 'six'];
const loopWord = (n: number) => LOOP_WORDS[n] ?? String(n);

const lineLabel = (k: number) => (k < 22 ? String.fromCharCode('e'.charCodeAt(0) + k) : `l${k}`);

const keep: Record<GraphFilter, (g: Multigraph) => boolean> = {
  massless: (g) => isOnePI(g) && !hasMasslessTadpole(g),
  onePI: isOnePI,
  connected: isConnected,
  all: () => true,
};

/**
 * Vertex order for the output: the canonical first vertex, then repeatedly the vertex with most
 * lines to those already placed, so that tensor contractions in this order stay narrow.
 */
function outputOrder(g: Multigraph): number[] {
  if (g.kinds.length === 0) return [];
  const order = [0];
  const rest = g.kinds.map((_, i) => i).slice(1);
  while (rest.length > 0) {
    const links = (i: number) => order.reduce((s, j) => s + g.lines[i][j], 0);
    const next = rest.reduce((best, i) => (links(i) > links(best) ? i : best), rest[0]);
    order.push(next);
    rest.splice(rest.indexOf(next), 1);
  }
  return order;
}

/** Leg labels per vertex: externals a, b, c, d in vertex order, then one label per line. */
function labelLegs(g: Multigraph, order: readonly number[]): { vertices: GraphVertex[]; externals: string[] } {
  const legs = order.map(() => [] as string[]);
  const externals: string[] = [];
  order.forEach((v, i) => {
    for (let k = 0; k < g.externals[v]; k++) {
      const label = EXTERNAL_LABELS[externals.length];
      externals.push(label);
      legs[i].push(label);
    }
  });
  let nextLine = 0;
  order.forEach((u, i) =>
    order.forEach((v, j) => {
      if (j < i) return;
      for (let k = 0; k < g.lines[u][v]; k++) {
        const label = lineLabel(nextLine++);
        legs[i].push(label);
        legs[j].push(label);
      }
    }),
  );
  return { vertices: order.map((v, i) => ({ kind: g.kinds[v], legs: legs[i] })), externals };
}

interface Generated {
  code: string;
  loops: number;
  components: number;
  description: string;
  vertices: GraphVertex[];
  externals: string[];
}

function generate(query: DiagramQuery): Generated[] {
  const count = (n: number, max: number) => Number.isInteger(n) && n >= 0 && n <= max;
  if (!count(query.quartic, 5) || !count(query.externalLegs, EXTERNAL_LABELS.length)) fail('invalid', `graphs with ${query.quartic} quartic vertices and ${query.externalLegs} external legs are not generated (at most 5 and 4)`);
  const kinds: VertexKind[] = [...(query.insertion ? (['insertion'] as const) : []), ...new Array<VertexKind>(query.quartic).fill('quartic')];
  return distinct(allMultigraphs(kinds, query.externalLegs))
    .filter(({ graph }) => keep[query.filter](graph))
    .map(({ graph, code }) => {
      const order = outputOrder(graph);
      return { code, loops: loopCount(graph), components: components(graph).length, description: describe(graph, order), ...labelLegs(graph, order) };
    });
}

/** Graphs with these vertices and external legs, one per isomorphism class (external legs unlabelled). */
export function enumerateDiagrams(query: DiagramQuery): Diagram[] {
  return generate(query).map((d) => ({
    id: `${query.filter}-${d.code}`,
    title: `${loopWord(d.loops)}-loop graph: ${d.description}`,
    loops: d.loops,
    components: d.components,
    vertices: d.vertices,
    externals: d.externals,
  }));
}

const FUNCTION_WORDS: Record<GraphFunction, string> = { vertex: 'four-point', selfEnergy: 'self-energy', massInsertion: 'φ² insertion' };

/** The graph query for a 1PI function at a loop order (V quartic vertices, loops = lines − V + 1). */
export function diagramQueryFor(fn: GraphFunction, loops: number, filter: GraphFilter = 'massless'): DiagramQuery {
  if (fn === 'vertex') return { quartic: loops + 1, externalLegs: 4, insertion: false, filter };
  return { quartic: loops, externalLegs: 2, insertion: fn === 'massInsertion', filter };
}

/**
 * The 1PI graphs of a function at one loop order, one per topology with unlabelled external legs
 * (as in the catalogue: weights sum over the orderings of the external labels).
 */
export function generateGraphs(fn: GraphFunction, loops: number, filter: 'massless' | 'onePI' = 'massless'): Graph[] {
  return generate(diagramQueryFor(fn, loops, filter)).map((d) => ({
    id: `${fn}${loops}-${d.code}`,
    title: `${loopWord(loops)}-loop ${FUNCTION_WORDS[fn]}: ${d.description}`,
    function: fn,
    loops: d.loops,
    vertices: d.vertices,
    externals: d.externals,
  }));
}

/** Massless 1PI graphs of the four-point function, the self-energy and the φ² insertion, 1…loops. */
export function generatedGraphsUpTo(loops: number): Graph[] {
  const fns: GraphFunction[] = ['vertex', 'selfEnergy', 'massInsertion'];
  return Array.from({ length: loops }, (_, i) => i + 1).flatMap((l) => fns.flatMap((fn) => generateGraphs(fn, l)));
}

// ---- titles -------------------------------------------------------------------------------------

const MULTIPLE = ['', '', 'double ', 'triple ', 'quadruple '];

/** Vertex names: their external legs (ab), φ² for the insertion, x, y, z, w for the others. */
function vertexNames(g: Multigraph, order: readonly number[]): string[] {
  const names = new Array<string>(g.kinds.length);
  let nextExternal = 0;
  let nextInner = 0;
  for (const v of order) {
    const legs = EXTERNAL_LABELS.slice(nextExternal, (nextExternal += g.externals[v]));
    names[v] = g.kinds[v] === 'insertion' ? `φ²${legs}` : legs || ('xyzw'[nextInner++] ?? `v${nextInner}`);
  }
  return names;
}

function describeLines(g: Multigraph, order: readonly number[]): string {
  const names = vertexNames(g, order);
  const parts: string[] = [];
  order.forEach((u, i) =>
    order.slice(i).forEach((v) => {
      const n = g.lines[u][v];
      if (n === 0) return;
      if (u === v) parts.push(n === 1 ? `a self-loop at ${names[u]}` : `${n} self-loops at ${names[u]}`);
      else parts.push(`${MULTIPLE[n] ?? `${n}-fold `}line ${names[u]}–${names[v]}`);
    }),
  );
  return parts.length === 0 ? 'no lines' : parts.join(', ');
}

/** Vertices joined in a path by double lines only (the ends carry the external legs or the insertion). */
function bubbleChainLength(g: Multigraph, order: readonly number[]): number | null {
  const m = order.length;
  for (let i = 0; i < m; i++) for (let j = i; j < m; j++) {
    const expected = j === i + 1 ? 2 : 0;
    if (g.lines[order[i]][order[j]] !== expected) return null;
  }
  return m - 1;
}

const isTetrahedron = (g: Multigraph) => g.kinds.length === 4 && g.externals.every((e) => e === 1) && g.lines.every((row, i) => row.every((n, j) => n === (i === j ? 0 : 1)));

/** Two quartic vertices without external legs joined by a triple line: a sunset inserted in a line. */
function sunsetInLine(g: Multigraph): [number, number] | null {
  const m = g.kinds.length;
  for (let x = 0; x < m; x++) for (let y = x + 1; y < m; y++) {
    const bare = (v: number) => g.kinds[v] === 'quartic' && g.externals[v] === 0;
    if (g.lines[x][y] === 3 && bare(x) && bare(y) && m > 2) return [x, y];
  }
  return null;
}

/** The graph with the sunset between x and y replaced by one line (vertex order kept). */
function withoutSunset(g: Multigraph, [x, y]: [number, number]): { graph: Multigraph; kept: number[] } {
  const kept = g.kinds.map((_, i) => i).filter((i) => i !== x && i !== y);
  const end = (v: number, other: number) => g.lines[v].findIndex((n, j) => n > 0 && j !== other);
  const [p, q] = [end(x, y), end(y, x)];
  const lines = kept.map((i) => kept.map((j) => g.lines[i][j] + ((i === p && j === q) || (i === q && j === p) ? 1 : 0)));
  return { graph: { kinds: kept.map((i) => g.kinds[i]), externals: kept.map((i) => g.externals[i]), lines }, kept };
}

/** A short name for a familiar shape, or null. */
function shapeName(g: Multigraph, order: readonly number[]): string | null {
  const chain = bubbleChainLength(g, order);
  if (chain !== null && chain > 0) return chain === 1 ? 'bubble' : `chain of ${loopWord(chain)} bubbles`;
  if (g.kinds.length === 2 && g.lines[0][1] === 3) return 'sunset';
  if (isTetrahedron(g)) return 'tetrahedron, one external leg per vertex';
  const sunset = sunsetInLine(g);
  if (sunset === null) return null;
  const { graph, kept } = withoutSunset(g, sunset);
  const reduced = shapeName(graph, order.filter((v) => kept.includes(v)).map((v) => kept.indexOf(v)));
  return `${reduced ?? 'graph'} with a sunset inserted in one line`;
}

/** The familiar name, if any, and the lines in words. */
function describe(g: Multigraph, order: readonly number[]): string {
  const name = shapeName(g, order);
  const lines = describeLines(g, order);
  return name === null ? lines : `${name} (${lines})`;
}
