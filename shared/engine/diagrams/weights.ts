import { fail } from '../precision';
import { type LabelledTensor, type ModelSpec, type QuarticModel, type Tensor, addTensors, contract, isFamily, kronecker, permutations, permuteSlots, projectOntoCouplings, projectOntoIdentity } from '../models';
import { type Poly, type Q, Q0, polyAdd, polyConstant, polyConstantValue, polyEvaluate, polyMul, polyScale, polyVariable, q, qAdd, qDiv, qEquals, qMul } from '../symbolic';
import { type Graph, SUNSET, automorphismCount, graphSign } from './graphs';

/**
 * Tensor weight of a graph as a polynomial in the couplings: for each monomial, one value per
 * coupling (four-point functions, projected onto the model's structures) or a single value
 * (two-point functions, the coefficient of δ_ab). Values are exact polynomials in N for a
 * symbolic-N family and rational constants otherwise. Sign and symmetry factor are included.
 */
export interface WeightTerm {
  powers: number[];
  values: Poly[];
}
export interface GraphWeight {
  id: string;
  degree: number;
  terms: WeightTerm[];
}

type RationalTerms = Map<string, { powers: number[]; values: Q[] }>;

function accumulate(terms: RationalTerms, powers: number[], values: Q[]): void {
  const key = powers.join(',');
  const prev = terms.get(key);
  if (prev) prev.values = prev.values.map((v, i) => qAdd(v, values[i]));
  else terms.set(key, { powers, values });
}

export function couplingTuples(couplings: number, length: number): number[][] {
  if (length === 0) return [[]];
  return couplingTuples(couplings, length - 1).flatMap((t) => Array.from({ length: couplings }, (_, k) => [...t, k]));
}

export const powersOf = (tuple: number[], couplings: number) => Array.from({ length: couplings }, (_, k) => tuple.filter((i) => i === k).length);

/** Σ over all orderings of the external labels of the contracted graph. */
export function summedOverLabellings(model: QuarticModel, graph: Graph, tuple: number[]): Tensor {
  let next = 0;
  const factors: LabelledTensor[] = graph.vertices.map((v) => ({ tensor: v.kind === 'insertion' ? kronecker(model.fields) : model.basis[tuple[next++]], labels: v.legs }));
  const contracted = contract(factors, graph.externals);
  let sum: Tensor | null = null;
  for (const perm of permutations(graph.externals.length)) {
    const p = permuteSlots(contracted, perm);
    sum = sum ? addTensors(sum, p) : p;
  }
  return sum as Tensor;
}

export function prefactor(model: QuarticModel, graph: Graph, tuple: number[]): Q {
  let f = q(graphSign(graph), automorphismCount(graph, true));
  for (const i of tuple) f = qMul(f, model.scales[i]);
  return f;
}

function rationalWeight(model: QuarticModel, graph: Graph): RationalTerms {
  const k = model.couplings.length;
  const order = graph.vertices.filter((v) => v.kind === 'quartic').length;
  const terms: RationalTerms = new Map();
  for (const tuple of couplingTuples(k, order)) {
    const x = summedOverLabellings(model, graph, tuple);
    const f = prefactor(model, graph, tuple);
    const what = `graph ${graph.id}`;
    const values = graph.function === 'vertex' ? projectOntoCouplings(model, x, what).map((c) => qMul(c, f)) : [qMul(projectOntoIdentity(x, what), f)];
    accumulate(terms, powersOf(tuple, k), values);
  }
  return terms;
}

/**
 * Field renormalization acting on the four external legs: Σ_legs Σ_{aa'} λ_{a'bcd} with Σ the
 * sunset weight (sign and symmetry factor included), projected onto the couplings.
 */
function rationalLegCorrection(model: QuarticModel): RationalTerms {
  const k = model.couplings.length;
  const terms: RationalTerms = new Map();
  for (const tuple of couplingTuples(k, 3)) {
    const selfEnergy = summedOverLabellings(model, SUNSET, tuple.slice(0, 2));
    const y = contract([{ tensor: selfEnergy, labels: ['a', 'x'] }, { tensor: model.basis[tuple[2]], labels: ['x', 'b', 'c', 'd'] }], ['a', 'b', 'c', 'd']);
    let legs = y;
    for (const swap of [[1, 0, 2, 3], [2, 1, 0, 3], [3, 1, 2, 0]]) legs = addTensors(legs, permuteSlots(y, swap));
    const f = qMul(prefactor(model, SUNSET, tuple.slice(0, 2)), model.scales[tuple[2]]);
    accumulate(terms, powersOf(tuple, k), projectOntoCouplings(model, legs, 'field renormalization').map((c) => qMul(c, f)));
  }
  return terms;
}

export const LEG_CORRECTION_ID = 'legCorrection';

function asPolynomials(id: string, degree: number, terms: RationalTerms): GraphWeight {
  return { id, degree, terms: [...terms.values()].map((t) => ({ powers: t.powers, values: t.values.map(polyConstant) })) };
}

function degreeOf(graph: Graph): number {
  return graph.vertices.filter((v) => v.kind === 'quartic').length;
}

/** Degree in N that a weight may have at most (checked at one further member). */
const FIT_DEGREE = 3;

/** Interpolating polynomial in N through (x_i, y_i), exact over Q (Lagrange form). */
export function interpolate(points: readonly number[], values: readonly Q[]): Poly {
  let sum = polyConstant(Q0);
  points.forEach((xi, i) => {
    let basis = polyConstant(q(1));
    points.forEach((xj, j) => {
      if (j === i) return;
      basis = polyMul(polyScale(basis, qDiv(q(1), q(xi - xj))), polyAdd(polyVariable('N'), polyConstant(q(-xj))));
    });
    sum = polyAdd(sum, polyScale(basis, values[i]));
  });
  return sum;
}

/** Weights of a family: computed at N = N0 … N0+FIT_DEGREE, fitted, verified at one more N. */
function familyWeight(spec: ModelSpec, compute: (m: QuarticModel) => RationalTerms, id: string, degree: number): GraphWeight {
  if (!isFamily(spec)) {
    if (spec.atN) fail('invalid', `${spec.label} has no explicit tensors: its flow is the family's evaluated at N (flows/family.ts)`);
    return asPolynomials(id, degree, compute(spec));
  }
  const points = Array.from({ length: FIT_DEGREE + 2 }, (_, i) => spec.smallestMember + i);
  const samples = points.map((N) => compute(spec.member(N)));
  const fitPoints = points.slice(0, -1);
  const check = points[points.length - 1];
  const keys = new Set(samples.flatMap((s) => [...s.keys()]));
  const terms: WeightTerm[] = [];
  for (const key of keys) {
    const powers = key.split(',').map(Number);
    const width = (samples.find((s) => s.has(key)) as RationalTerms).get(key)?.values.length ?? 1;
    const values: Poly[] = [];
    for (let c = 0; c < width; c++) {
      const ys = samples.map((s) => s.get(key)?.values[c] ?? Q0);
      const poly = interpolate(fitPoints, ys.slice(0, -1));
      if (!qEquals(polyEvaluate(poly, { N: q(check) }), ys[ys.length - 1])) fail('invalid', `weight of ${id} is not a polynomial of degree ≤ ${FIT_DEGREE} in N`);
      values.push(poly);
    }
    terms.push({ powers, values });
  }
  return { id, degree, terms };
}

export function graphWeight(spec: ModelSpec, graph: Graph): GraphWeight {
  return familyWeight(spec, (m) => rationalWeight(m, graph), graph.id, degreeOf(graph));
}

export function legCorrectionWeight(spec: ModelSpec): GraphWeight {
  return familyWeight(spec, rationalLegCorrection, LEG_CORRECTION_ID, 3);
}

/** The weight of one monomial as text, e.g. "(N+8)/6" — for the derivation trail. */
export function constantWeight(p: Poly): Q | null {
  return polyConstantValue(p);
}



// ---- quadratic operators φ_aφ_b ------------------------------------------------------------------

/** The symmetric pairs (i ≤ j) labelling the quadratic operators φ_iφ_j, in lexicographic order. */
export function quadraticPairs(n: number): [number, number][] {
  const pairs: [number, number][] = [];
  for (let i = 0; i < n; i++) for (let j = i; j < n; j++) pairs.push([i, j]);
  return pairs;
}

/**
 * Insertion graphs with the tensor structure of the insertion kept: the insertion legs are left
 * open, W_{ab,ef} = Σ (quartic vertices), symmetrized in the external legs. With the insertion
 * t = E^{(ij)} (E_{ef} = 1 iff {e,f} = {i,j}) the graph gives X_{kl} = M[(kl)][(ij)] t_{ij}, so
 * X(t) = M t in the coordinates t_{ij}, i ≤ j. Values are M flattened row by row.
 */
function rationalInsertionMatrix(model: QuarticModel, graph: Graph): RationalTerms {
  const k = model.couplings.length;
  const n = model.fields;
  const pairs = quadraticPairs(n);
  const insertionLegs = graph.vertices.find((v) => v.kind === 'insertion')?.legs ?? [];
  if (insertionLegs.length !== 2) fail('invalid', `graph ${graph.id} has no quadratic insertion`);
  const terms: RationalTerms = new Map();
  for (const tuple of couplingTuples(k, degreeOf(graph))) {
    let next = 0;
    const factors: LabelledTensor[] = graph.vertices.filter((v) => v.kind === 'quartic').map((v) => ({ tensor: model.basis[tuple[next++]], labels: v.legs }));
    const w = contract(factors, [...graph.externals, ...insertionLegs]);
    const sym = addTensors(w, permuteSlots(w, [1, 0, 2, 3]));
    const f = prefactor(model, graph, tuple);
    const at = (a: number, b: number, e: number, g: number) => sym.data[((a * n + b) * n + e) * n + g];
    const values: Q[] = [];
    for (const [kk, l] of pairs) for (const [i, j] of pairs) values.push(qMul(q(at(kk, l, i, j) + (i === j ? 0n : at(kk, l, j, i))), f));
    accumulate(terms, powersOf(tuple, k), values);
  }
  return terms;
}

/** Weight matrix of an insertion graph on the quadratic operators (numeric N only: its size is N(N+1)/2). */
export function insertionMatrixWeight(model: QuarticModel, graph: Graph): GraphWeight {
  return asPolynomials(`${graph.id}:matrix`, degreeOf(graph), rationalInsertionMatrix(model, graph));
}
