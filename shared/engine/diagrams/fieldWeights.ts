import { EngineError, fail } from '../precision';
import { type QuarticModel, type Tensor, addTensors, contract, forEachIndex, permuteSlots, projectOntoCouplings, solveRational } from '../models';
import { type Q, Q0, polyConstant, q, qAdd, qIsZero, qMul, qSub } from '../symbolic';
import { type Graph, SUNSET } from './graphs';
import { type GraphWeight, couplingTuples, powersOf, prefactor, quadraticPairs, summedOverLabellings } from './weights';

/**
 * Field renormalization as a matrix: the two-point graphs' tensor weight W_ab kept whole (not
 * projected onto δ_ab), and the check that W acting on the four legs of λ stays in the model's
 * coupling space.
 */

/** A tensor entry as an exact rational, whatever the tensor layer stores (numbers today). */
function entryOf(t: Tensor, flat: number): Q {
  const v: unknown = t.data[flat];
  if (typeof v === 'number' || typeof v === 'bigint') return q(v);
  return v as Q;
}

/** Labels of the entries of a symmetric field matrix in the order of `quadraticPairs`: "(1,1)", "(1,2)", … */
export function fieldPairLabels(n: number): string[] {
  return quadraticPairs(n).map(([a, b]) => `(${a + 1},${b + 1})`);
}

/**
 * Weight of a self-energy graph (the sunset by default) as a symmetric matrix W_ab (sign and 1/|Aut|
 * included, summed over the two labellings), one value per pair a ≤ b in the order of
 * `quadraticPairs` — for models whose W is not proportional to δ_ab. For the O(N) tensor the sunset
 * has W = −(N+2)/18 δ.
 */
export function selfEnergyMatrixWeight(model: QuarticModel, graph: Graph = SUNSET): GraphWeight {
  const k = model.couplings.length;
  const n = model.fields;
  const pairs = quadraticPairs(n);
  const degree = quarticVertices(graph);
  const terms = new Map<string, { powers: number[]; values: Q[] }>();
  for (const tuple of couplingTuples(k, degree)) {
    const x = summedOverLabellings(model, graph, tuple);
    const f = prefactor(model, graph, tuple);
    const values = pairs.map(([a, b]) => qMul(entryOf(x, a * n + b), f));
    const powers = powersOf(tuple, k);
    const key = powers.join(',');
    const prev = terms.get(key);
    if (prev) prev.values = prev.values.map((v, i) => qAdd(v, values[i]));
    else terms.set(key, { powers, values });
  }
  return { id: `${graph.id}:matrix`, degree, terms: [...terms.values()].map((t) => ({ powers: t.powers, values: t.values.map(polyConstant) })) };
}

const quarticVertices = (graph: Graph) => graph.vertices.filter((v) => v.kind === 'quartic').length;

/**
 * A self-energy graph's matrix W acting on the four legs of each coupling's structure, projected
 * back onto the couplings: values[j·k + i] is the coefficient of coupling i in Σ_legs W ∘ (scale_j
 * basis_j), one term per monomial of the graph's own couplings. With F = Σ_graphs (−pole)·W the
 * field renormalization, Σ_legs F ∘ λ' for any λ' = Σ_j t_j scale_j basis_j is Σ_j t_j Φ_j — the
 * bilinear form the three-loop bare couplings need (diagrams/forestFlow.ts). The tensors of one
 * monomial are summed before projecting (only their sum has to stay in the coupling space).
 */
export function legCorrectionWeights(model: QuarticModel, graph: Graph): GraphWeight {
  const k = model.couplings.length;
  const byMonomial = new Map<string, { tuple: number[]; tensor: Tensor }>();
  for (const tuple of couplingTuples(k, quarticVertices(graph))) {
    const key = powersOf(tuple, k).join(',');
    const x = summedOverLabellings(model, graph, tuple);
    const prev = byMonomial.get(key);
    byMonomial.set(key, { tuple: prev?.tuple ?? tuple, tensor: prev ? addTensors(prev.tensor, x) : x });
  }
  const terms = [...byMonomial.values()].map(({ tuple, tensor }) => {
    const f = prefactor(model, graph, tuple);
    const values = model.basis.flatMap((b, j) => projectedLegSum(model, graph, tensor, b, j).map((c) => polyConstant(qMul(qMul(c, f), model.scales[j]))));
    return { powers: powersOf(tuple, k), values };
  });
  return { id: `${graph.id}:legs`, degree: quarticVertices(graph) + 1, terms };
}

function projectedLegSum(model: QuarticModel, graph: Graph, selfEnergy: Tensor, vertex: Tensor, j: number): Q[] {
  try {
    return projectOntoCouplings(model, legSum(selfEnergy, vertex), 'field renormalization');
  } catch (e) {
    if (!(e instanceof EngineError)) throw e;
    const outside = legCorrectionOutside(model, selfEnergy, vertex);
    return fail('invalid', `the field renormalization γ_φ (a matrix for this model) acting on the legs of the quartic vertex generates ${outside.join(', ')} outside the couplings ${model.couplings.join(', ')} of ${model.label} (self-energy graph ${graph.id} on the legs of ${model.couplings[j]}); add a coupling for ${outside.length === 1 ? 'it' : 'these'}`);
  }
}

/** Σ over the four legs of W_{aa'} λ_{a'bcd}. */
function legSum(selfEnergy: Tensor, vertex: Tensor): Tensor {
  const y = contract([{ tensor: selfEnergy, labels: ['a', 'x'] }, { tensor: vertex, labels: ['x', 'b', 'c', 'd'] }], ['a', 'b', 'c', 'd']);
  let legs = y;
  for (const swap of [[1, 0, 2, 3], [2, 1, 0, 3], [3, 1, 2, 0]]) legs = addTensors(legs, permuteSlots(y, swap));
  return legs;
}

function innerProductQ(a: Tensor, b: Tensor): Q {
  let s = Q0;
  for (let i = 0; i < a.data.length; i++) {
    const x = entryOf(a, i);
    if (!qIsZero(x)) s = qAdd(s, qMul(x, entryOf(b, i)));
  }
  return s;
}

/** "phi1^3*phi2" for the index multiset of a sorted multi-index. */
function monomialName(indices: readonly number[]): string {
  const counts = new Map<number, number>();
  for (const i of indices) counts.set(i, (counts.get(i) ?? 0) + 1);
  return [...counts.entries()].map(([i, c]) => (c === 1 ? `phi${i + 1}` : `phi${i + 1}^${c}`)).join('*');
}

/**
 * Quartic monomials of Σ_legs W λ that no combination of the model's structures reproduces: the
 * remainder of the exact least-squares projection onto the coupling tensors, named by field
 * monomial. Empty when the leg correction stays in the coupling space.
 */
export function legCorrectionOutside(model: QuarticModel, selfEnergy: Tensor, vertex: Tensor): string[] {
  const x = legSum(selfEnergy, vertex);
  const basis = model.basis.map((b, k) => ({ b, scale: model.scales[k] }));
  const gram = basis.map((bi) => basis.map((bj) => qMul(qMul(bi.scale, bj.scale), innerProductQ(bi.b, bj.b))));
  const rhs = basis.map((bi) => qMul(bi.scale, innerProductQ(bi.b, x)));
  const c = solveRational(gram, rhs) ?? basis.map(() => Q0);
  const names: string[] = [];
  forEachIndex(x.n, 4, (indices, flat) => {
    if (indices.some((v, i) => i > 0 && v < indices[i - 1])) return;
    let fitted = Q0;
    basis.forEach(({ b, scale }, k) => (fitted = qAdd(fitted, qMul(qMul(c[k], scale), entryOf(b, flat)))));
    if (!qIsZero(qSub(entryOf(x, flat), fitted))) names.push(monomialName(indices));
  });
  return names;
}

/**
 * Why the leg correction of the β-functions leaves the coupling space, or null when it does not:
 * the first product of couplings (two in the sunset, one on the legs) whose Σ_legs W λ has a
 * remainder, and the monomials a new coupling would have to multiply.
 */
export function explainLegCorrection(model: QuarticModel): string | null {
  const k = model.couplings.length;
  for (const tuple of couplingTuples(k, 3)) {
    const selfEnergy = summedOverLabellings(model, SUNSET, tuple.slice(0, 2));
    const outside = legCorrectionOutside(model, selfEnergy, model.basis[tuple[2]]);
    if (outside.length === 0) continue;
    const [a, b, c] = tuple.map((i) => model.couplings[i]);
    return `the field renormalization γ_φ (a matrix for this model) acting on the legs of the quartic vertex generates ${outside.join(', ')} outside the couplings ${model.couplings.join(', ')} of ${model.label} (sunset ${a}·${b} on the legs of ${c}); add a coupling for ${outside.length === 1 ? 'it' : 'these'}`;
  }
  return null;
}
