import Decimal from 'decimal.js';
import { alignBody, epsilonPower, monomialTex, seriesTerms, term, type Equation, type Term } from './equations';
import type { NumberStyle } from './numbers';
import { relationTex } from './text';

/** One graph of a flow result's derivation trail (the flow job's `trail`), as far as the export reads it. */
interface TrailGraph {
  graph: string;
  title: string;
  function: string;
  loops: number;
  sign: number;
  symmetryFactor: string;
  labellings: number;
  weight: { monomial: string; projections: Record<string, string> }[];
  integral: string;
  rearrangement?: string;
  laurent: Series;
  counterterms: { subgraph: string; pole: Series; reduced: string }[];
  subtracted: Series;
  pole: Series;
  note?: string;
}
interface Series {
  lowest: number;
  coeffs: string[];
}

const isSeries = (value: unknown): value is Series => typeof value === 'object' && value !== null && typeof (value as Series).lowest === 'number' && Array.isArray((value as Series).coeffs);

export function isTrailGraph(value: unknown): value is TrailGraph {
  const graph = value as TrailGraph;
  return typeof value === 'object' && value !== null && typeof graph.title === 'string' && typeof graph.integral === 'string' && isSeries(graph.laurent) && isSeries(graph.pole) && isSeries(graph.subtracted) && Array.isArray(graph.weight) && Array.isArray(graph.counterterms);
}

const FUNCTION_NAMES: Record<string, string> = {
  vertex: 'four-point vertex',
  selfEnergy: 'self-energy',
  massInsertion: 'φ² insertion',
};

/** "-11/6" → "-\frac{11}{6}" (weights are exact rationals in the trail). */
function fractionTex(text: string): string {
  const match = /^(-?)(\d+)\/(\d+)$/.exec(text.trim());
  if (match) return `${match[1]}\\frac{${match[2]}}{${match[3]}}`;
  return /^-?\d+$/.test(text.trim()) ? text.trim() : `\\text{${text.replace(/[^0-9./ -]/g, '')}}`;
}

/** The weight of a graph: Σ over monomials of its projections, e.g. −(11/6) u² on u; δ_ab projections keep their tensor. */
function weightTex(graph: TrailGraph): string {
  return graph.weight
    .flatMap(({ monomial, projections }) => Object.entries(projections).map(([onto, value]) => `${fractionTex(value)}\\,${monomialTex(monomial)}\\ \\text{on}\\ ${relationTex(onto).math}`))
    .join(',\\quad ');
}

/** Pole part: only negative powers, nothing truncated. */
function poleTerms(series: Series, style: NumberStyle): Term[] {
  return series.coeffs.flatMap((c, k) => term(c, epsilonPower(series.lowest + k), style) ?? []);
}

function graphEquations(graph: TrailGraph, style: NumberStyle): Equation[] {
  const pole = poleTerms(graph.pole, style);
  return [
    { lhs: 'I', terms: [{ negative: false, body: graph.integral }] },
    { lhs: '', terms: seriesTerms(graph.laurent.lowest, graph.laurent.coeffs, style) },
    ...graph.counterterms.map((ct, index): Equation => ({ lhs: `K I_{\\gamma_{${index + 1}}}`, terms: poleTerms(ct.pole, style) })),
    { lhs: '\\bar I', terms: seriesTerms(graph.subtracted.lowest, graph.subtracted.coeffs, style) },
    { lhs: 'K\\bar I', terms: pole.length ? pole : [{ negative: false, body: '0' }] },
  ];
}

/** Text of one graph: what it is, its weight, the subgraphs subtracted, and its equations (caller filters the formulas). */
export function graphSection(
  graph: TrailGraph,
  style: NumberStyle,
  math: { inline(tex: string): string; align(body: string): string },
  text: (t: string) => string,
  sentence: (t: string) => string,
): string {
  const header = `\\subsection*{${text(graph.title.charAt(0).toUpperCase() + graph.title.slice(1))}}`;
  const facts = `${sentence(FUNCTION_NAMES[graph.function] ?? graph.function).slice(0, -1)}, ${graph.loops} loop${graph.loops === 1 ? '' : 's'}; sign ${math.inline(graph.sign < 0 ? '-1' : '+1')}, symmetry factor ${math.inline(fractionTex(graph.symmetryFactor))}, ${graph.labellings} labelling${graph.labellings === 1 ? '' : 's'} of the external legs. Weight: ${math.inline(weightTex(graph))}.`;
  const routing = graph.rearrangement ? `Momentum routing: ${text(graph.rearrangement)}.` : '';
  const subgraphs = graph.counterterms.length
    ? `Subtracted subgraphs: ${graph.counterterms.map((ct, index) => `${math.inline(`\\gamma_{${index + 1}}`)} = ${text(ct.subgraph)}, reduced graph ${math.inline(ct.reduced)}`).join('; ')}.`
    : 'No subdivergence.';
  const note = graph.note ? sentence(graph.note) : '';
  return [header, [facts, routing, subgraphs, note].filter(Boolean).join(' '), math.align(alignBody(graphEquations(graph, style)))].join('\n\n');
}

export interface Residue {
  onto: string;
  monomial: string;
  loops: number;
  value: Decimal;
}

/**
 * The simple-pole residues the graphs of one function give, per projection and monomial: −Σ_G w_G r_G,
 * with w_G the graph's projected weight and r_G the 1/ε coefficient of its pole part K\bar I_G. With
 * Z_φ = 1 (s < 2, docs/physics.md §2) these are a₁⁽ᴸ⁾ of the coupling and the residue of Z_t (§1).
 */
export function simplePoleResidues(graphs: TrailGraph[], fn: string): Residue[] {
  const sums = new Map<string, Residue>();
  for (const graph of graphs.filter((g) => g.function === fn)) {
    const index = -1 - graph.pole.lowest;
    const residue = new Decimal(index >= 0 && index < graph.pole.coeffs.length ? graph.pole.coeffs[index] : 0);
    for (const { monomial, projections } of graph.weight) {
      for (const [onto, weight] of Object.entries(projections)) {
        const [p, q = '1'] = weight.split('/');
        const key = `${onto}|${monomial}`;
        const sum = sums.get(key) ?? { onto, monomial, loops: graph.loops, value: new Decimal(0) };
        sums.set(key, { ...sum, value: sum.value.minus(new Decimal(p).div(q).times(residue)) });
      }
    }
  }
  return [...sums.values()];
}
