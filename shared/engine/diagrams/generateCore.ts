import { permutations } from '../models';

/**
 * Feynman graphs of φ⁴ theory as multigraphs: vertices of degree 4 (quartic) or 2 (the φ²
 * insertion), external legs counted per vertex (unlabelled), lines counted per vertex pair.
 */
export type VertexKind = 'quartic' | 'insertion';

export interface Multigraph {
  kinds: readonly VertexKind[];
  /** External legs at each vertex. */
  externals: readonly number[];
  /** lines[i][j] = lines[j][i]: lines between i and j; lines[i][i]: self-loops at i. */
  lines: readonly (readonly number[])[];
}

const degree = (kind: VertexKind) => (kind === 'quartic' ? 4 : 2);

/** Every way to put `total` unlabelled legs on the vertices, at most caps[i] on vertex i. */
function distributions(total: number, caps: readonly number[], from = 0): number[][] {
  if (from === caps.length) return total === 0 ? [[]] : [];
  const out: number[][] = [];
  for (let k = Math.min(total, caps[from]); k >= 0; k--) for (const rest of distributions(total - k, caps, from + 1)) out.push([k, ...rest]);
  return out;
}

/** Every symmetric line matrix with the given free legs per vertex (self-loops use two legs). */
function lineMatrices(free: readonly number[]): number[][][] {
  const m = free.length;
  const out: number[][][] = [];
  const lines = free.map(() => new Array<number>(m).fill(0));
  const left = [...free];
  const place = (i: number, j: number): void => {
    if (i === m) return void out.push(lines.map((row) => [...row]));
    if (j === m) return left[i] === 0 ? place(i + 1, i + 1) : undefined;
    const max = i === j ? Math.floor(left[i] / 2) : Math.min(left[i], left[j]);
    for (let k = 0; k <= max; k++) {
      const used = i === j ? 2 * k : k;
      lines[i][j] = lines[j][i] = k;
      left[i] -= used;
      if (i !== j) left[j] -= k;
      place(i, j + 1);
      left[i] += used;
      if (i !== j) left[j] += k;
    }
    lines[i][j] = lines[j][i] = 0;
  };
  place(0, 0);
  return out;
}

/** Every multigraph (isomorphic copies included) with these vertices and external legs. */
export function allMultigraphs(kinds: readonly VertexKind[], externalLegs: number): Multigraph[] {
  const caps = kinds.map(degree);
  return distributions(externalLegs, caps).flatMap((externals) =>
    lineMatrices(caps.map((c, i) => c - externals[i])).map((lines) => ({ kinds, externals, lines })),
  );
}

export function permuted(g: Multigraph, order: readonly number[]): Multigraph {
  return {
    kinds: order.map((i) => g.kinds[i]),
    externals: order.map((i) => g.externals[i]),
    lines: order.map((i) => order.map((j) => g.lines[i][j])),
  };
}

function code(g: Multigraph): string {
  const upper = g.lines.flatMap((row, i) => row.slice(i));
  return [g.kinds.map((k) => (k === 'insertion' ? 1 : 0)).join(''), g.externals.join(''), upper.join('')].join('.');
}

/** Vertex orders that list insertions first, then vertices by decreasing number of external legs. */
function sortedOrders(g: Multigraph): number[][] {
  const rank = (i: number) => (g.kinds[i] === 'insertion' ? 100 : 0) + g.externals[i];
  const byRank = g.kinds.map((_, i) => i).sort((i, j) => rank(j) - rank(i) || i - j);
  const groups: number[][] = [];
  byRank.forEach((v, k) => (k > 0 && rank(v) === rank(byRank[k - 1]) ? groups[groups.length - 1].push(v) : groups.push([v])));
  return groups.reduce<number[][]>((orders, group) => orders.flatMap((o) => permutations(group.length).map((p) => [...o, ...p.map((k) => group[k])])), [[]]);
}

/**
 * The vertex order whose code is largest: a canonical form, equal for isomorphic graphs. Codes
 * begin with the kinds and external legs, so only orders sorted by those can be largest.
 */
export function canonical(g: Multigraph): { graph: Multigraph; code: string } {
  let best: { graph: Multigraph; code: string } | null = null;
  for (const order of sortedOrders(g)) {
    const h = permuted(g, order);
    const c = code(h);
    if (!best || c > best.code) best = { graph: h, code: c };
  }
  return best as { graph: Multigraph; code: string };
}

/** One representative per isomorphism class, ordered by code. */
export function distinct(graphs: readonly Multigraph[]): { graph: Multigraph; code: string }[] {
  const seen = new Map<string, { graph: Multigraph; code: string }>();
  for (const g of graphs) {
    const c = canonical(g);
    if (!seen.has(c.code)) seen.set(c.code, c);
  }
  return [...seen.values()].sort((x, y) => (x.code < y.code ? 1 : x.code > y.code ? -1 : 0));
}

// ---- structure ----------------------------------------------------------------------------------

/** Connected components of the vertices not in `removed`, using only lines not in `cut`. */
export function components(g: Multigraph, removed: ReadonlySet<number> = new Set(), cut: [number, number] | null = null): number[][] {
  const m = g.kinds.length;
  const seen = new Set<number>(removed);
  const out: number[][] = [];
  for (let start = 0; start < m; start++) {
    if (seen.has(start)) continue;
    const part = [start];
    seen.add(start);
    for (let k = 0; k < part.length; k++) {
      const i = part[k];
      for (let j = 0; j < m; j++) {
        const isCut = cut !== null && ((cut[0] === i && cut[1] === j) || (cut[0] === j && cut[1] === i));
        if (!seen.has(j) && g.lines[i][j] > 0 && !isCut) {
          seen.add(j);
          part.push(j);
        }
      }
    }
    out.push(part);
  }
  return out;
}

export const lineCount = (g: Multigraph): number => g.lines.reduce((s, row, i) => s + row.slice(i).reduce((a, b) => a + b, 0), 0);

export const loopCount = (g: Multigraph): number => lineCount(g) - g.kinds.length + components(g).length;

export const isConnected = (g: Multigraph): boolean => components(g).length <= 1;

/** Connected, and no single line whose removal disconnects the graph (one-particle irreducible). */
export function isOnePI(g: Multigraph): boolean {
  if (!isConnected(g)) return false;
  for (let i = 0; i < g.kinds.length; i++) for (let j = i + 1; j < g.kinds.length; j++) if (g.lines[i][j] === 1 && components(g, new Set(), [i, j]).length > 1) return false;
  return true;
}

/** Where momentum enters: an external leg, or the φ² insertion (which carries momentum). */
const isSource = (g: Multigraph, i: number) => g.externals[i] > 0 || g.kinds[i] === 'insertion';

/**
 * A massless tadpole: a self-loop, or a part of the graph hanging from a single vertex with no
 * external leg or insertion in it. No external momentum flows into such a part, so its loop
 * integral has no scale and vanishes in dimensional regularization; every graph containing one is
 * zero in the massless theory.
 */
export function hasMasslessTadpole(g: Multigraph): boolean {
  for (let v = 0; v < g.kinds.length; v++) {
    if (g.lines[v][v] > 0) return true;
    const hanging = components(g, new Set([v])).filter((part) => part.some((i) => g.lines[v][i] > 0));
    if (hanging.some((part) => !part.some((i) => isSource(g, i)))) return true;
  }
  return false;
}
