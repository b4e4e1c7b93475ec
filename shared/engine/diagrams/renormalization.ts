import { EngineError, fail } from '../precision';
import { type ModelSpec, type QuarticModel, CouplingPolynomial, isFamily } from '../models';
import { type LaurentSeries } from '../series';
import { type Calculus } from './calculus';
import { type CatalogueEntry, catalogueUpTo } from './catalogue';
import { explainLegCorrection, fieldPairLabels, selfEnergyMatrixWeight } from './fieldWeights';
import { deriveFlowByForests } from './forestFlow';
import { type Graph, graphSign, symmetryData } from './graphs';
import { integralKit } from './integrals';
import { ConsistencyError, type SubtractedGraph, subtractGraph } from './subtraction';
import { type GraphWeight, graphWeight, insertionMatrixWeight, legCorrectionWeight, quadraticPairs } from './weights';

/** One line of the derivation trail: a graph, its weight, its integral and its poles. */
export interface TrailEntry<C> {
  graph: Graph;
  sign: 1 | -1;
  symmetryFactor: [number, number];
  labellings: number;
  weight: GraphWeight | null;
  /** Names of the weight's values when they are not one per coupling or δ_ab (a field matrix: "(1,2)", …). */
  weightLabels?: string[];
  weightNote?: string;
  subtracted: SubtractedGraph<C>;
}

/**
 * The renormalization-group functions in minimal subtraction at fixed s:
 *   β_k(g) = −ε g_k + beta[k](g),   η = 2 − s + 2γ_φ(g*),   1/ν = s − γ_{φ²}(g*).
 */
export interface DerivedFlow<C> {
  calculus: Calculus<C>;
  couplings: readonly string[];
  loops: number;
  beta: CouplingPolynomial<C>[];
  /** γ_φ on every field; when gammaPhiMatrix is set, tr γ_φ / n (the value of each field only where the matrix is ∝ δ). */
  gammaPhi: CouplingPolynomial<C>;
  /**
   * γ_φ as a symmetric n×n matrix of coupling polynomials when the field renormalization is not
   * proportional to δ_ab (s = 2, anisotropic models; Z_φ is then a matrix, φ₀ = Z_φ^{1/2} φ).
   * Null or absent when γ_φ = gammaPhi·δ. Per-direction γ_φ at a fixed point: exponents/fieldMatrix.ts.
   */
  gammaPhiMatrix?: CouplingPolynomial<C>[][] | null;
  gammaPhi2: CouplingPolynomial<C> | null;
  gammaPhi2Note?: string;
  /**
   * Anomalous-dimension matrix of the quadratic operators φ_iφ_j (pairs i ≤ j):
   * γ[(kl)][(ij)] = (g·∂) z₁ + (γ_φ t + t γ_φ) in the coordinates t_ij, from the insertion graphs with
   * the insertion tensor kept (γ_φ t + t γ_φ = 2γ_φ t when γ_φ ∝ δ; see quadraticWithField).
   * Null for symbolic N (the matrix size depends on N).
   */
  quadratic: QuadraticMatrix<C> | null;
  /** True when the self-energy has a pole (field renormalization; s = 2). */
  fieldRenormalized: boolean;
  /** 1/ε and 1/ε² residues of the coupling counterterms, per coupling. */
  residues: { first: CouplingPolynomial<C>[]; second: CouplingPolynomial<C>[] };
  trail: TrailEntry<C>[];
  checks: string[];
}

export interface QuadraticMatrix<C> {
  pairs: [number, number][];
  /** γ as a matrix of coupling polynomials, acting on the coordinates t_ij of the insertion. */
  gamma: CouplingPolynomial<C>[][];
}

export const MIXING_NOTE = 'φ_aφ_a mixes with the other quadratic operators: the field renormalization γ_φ is a matrix not proportional to δ_ab (see the quadratic-operator matrix)';

/** Largest number of fields for which the quadratic-operator matrix is built (21 operators). */
export const MAX_QUADRATIC_FIELDS = 6;

function weightPolynomials<C>(calc: Calculus<C>, w: GraphWeight, width: number): CouplingPolynomial<C>[] {
  const { ring } = calc.ctx;
  const variables = w.terms[0]?.powers.length ?? 0;
  return Array.from({ length: width }, (_, k) => new CouplingPolynomial(ring, variables, w.terms.map((t) => ({ powers: t.powers, coeff: calc.fromPoly(t.values[k]) }))));
}

const residue = <C>(pole: LaurentSeries<C>, k: number): C => (pole.lowest <= -k ? pole.coefficient(-k) : pole.ring.zero());

function tryWeight(spec: ModelSpec, entry: CatalogueEntry): { weight: GraphWeight | null; note?: string } {
  try {
    return { weight: graphWeight(spec, entry.graph) };
  } catch (e) {
    if (e instanceof EngineError && entry.graph.function !== 'vertex') return { weight: null, note: e.message };
    throw e;
  }
}

function assertVanishes<C>(calc: Calculus<C>, p: CouplingPolynomial<C>, message: string): void {
  for (const t of p.terms.values()) if (!calc.isNegligible(t.coeff)) throw new ConsistencyError(message);
}

export function deriveFlow<C>(spec: ModelSpec, calc: Calculus<C>, loops: number): DerivedFlow<C> {
  if (loops >= 3) return deriveFlowByForests(spec, calc, loops, { tetrahedron: (kit) => calc.ctx.tetrahedron(kit.s) });
  const { ring } = calc.ctx;
  const k = spec.couplings.length;
  const zero = () => new CouplingPolynomial<C>(ring, k);
  const kit = integralKit(calc.s);
  const first = spec.couplings.map(zero);
  const second = spec.couplings.map(zero);
  const oneLoopFirst = spec.couplings.map(zero);
  const beta = spec.couplings.map(zero);
  let fieldFirst = zero();
  let fieldSecond = zero();
  let massFirst = zero();
  let massSecond = zero();
  let massOneLoop = zero();
  let gammaPhi = zero();
  let gammaMassPart = zero();
  let massNote: string | undefined;
  let sunsetPole: C = ring.zero();
  let fieldMatrix: FieldMatrixResidues<C> | null = null;
  const trail: TrailEntry<C>[] = [];
  const pairs = !isFamily(spec) && spec.fields <= MAX_QUADRATIC_FIELDS ? quadraticPairs(spec.fields) : null;
  const P = pairs?.length ?? 0;
  const zeroMatrix = () => Array.from({ length: P }, () => Array.from({ length: P }, zero));
  const quadFirst = zeroMatrix();
  const quadOneLoop = zeroMatrix();
  const quadSecond = zeroMatrix();
  const quadGamma = zeroMatrix();
  for (const entry of catalogueUpTo(loops)) {
    const subtracted = subtractGraph(calc, kit, entry);
    const { weight, note } = tryWeight(spec, entry);
    const f = entry.graph.function;
    const matrixWeight = !weight && f === 'selfEnergy' && !isFamily(spec) ? selfEnergyMatrixWeight(spec) : null;
    const sym = symmetryData(entry.graph);
    const shown = matrixWeight
      ? { weight: matrixWeight, weightLabels: fieldPairLabels((spec as QuarticModel).fields), weightNote: 'not proportional to δ_ab: the weight is the matrix W_ab, entries (a,b) with a ≤ b' }
      : { weight, weightNote: note };
    trail.push({ graph: entry.graph, sign: graphSign(entry.graph), symmetryFactor: sym.symmetryFactor, labellings: sym.labellings, ...shown, subtracted });
    const k1 = residue(subtracted.pole, 1);
    const k2 = residue(subtracted.pole, 2);
    if (f === 'massInsertion' && pairs && !isFamily(spec)) {
      const mw = insertionMatrixWeight(spec, entry.graph);
      const polys = weightPolynomials(calc, mw, P * P);
      const degree = mw.degree;
      for (let r = 0; r < P; r++) for (let c = 0; c < P; c++) {
        const p = polys[r * P + c];
        const z1 = p.scale(ring.neg(k1));
        quadFirst[r][c] = quadFirst[r][c].add(z1);
        if (entry.graph.loops === 1) quadOneLoop[r][c] = quadOneLoop[r][c].add(z1);
        quadSecond[r][c] = quadSecond[r][c].add(p.scale(ring.neg(k2)));
        quadGamma[r][c] = quadGamma[r][c].add(z1.scale(ring.fromRational(BigInt(degree))));
      }
    }
    if (f === 'selfEnergy') sunsetPole = k1;
    if (matrixWeight) {
      fieldMatrix = fieldMatrixResidues(calc, matrixWeight, (spec as QuarticModel).fields, k1, k2);
      continue;
    }
    if (!weight) {
      if (f === 'massInsertion') massNote = note;
      else if (!calc.isNegligible(k1)) throw new EngineError('not-representable', `field renormalization for this model is a matrix not proportional to the identity (${note})`);
      continue;
    }
    const degree = weight.degree;
    const width = f === 'vertex' ? k : 1;
    const w = weightPolynomials(calc, weight, width);
    const counterterm = (c: C) => w.map((p) => p.scale(ring.neg(c)));
    if (f === 'vertex') {
      counterterm(k1).forEach((p, i) => {
        first[i] = first[i].add(p);
        beta[i] = beta[i].add(p.scale(ring.fromRational(BigInt(degree - 1))));
        if (entry.graph.loops === 1) oneLoopFirst[i] = oneLoopFirst[i].add(p);
      });
      counterterm(k2).forEach((p, i) => (second[i] = second[i].add(p)));
    } else if (f === 'selfEnergy') {
      const z1 = counterterm(k1)[0];
      fieldFirst = fieldFirst.add(z1);
      fieldSecond = fieldSecond.add(counterterm(k2)[0]);
      gammaPhi = gammaPhi.add(z1.scale(ring.fromRational(-BigInt(degree), 2n)));
    } else {
      const z1 = counterterm(k1)[0];
      massFirst = massFirst.add(z1);
      massSecond = massSecond.add(counterterm(k2)[0]);
      gammaMassPart = gammaMassPart.add(z1.scale(ring.fromRational(BigInt(degree))));
      if (entry.graph.loops === 1) massOneLoop = massOneLoop.add(z1);
    }
  }
  const gammaPhiMatrix = fieldMatrix && fieldMatrix.first.some((row) => row.some((p) => !isNegligiblePolynomial(calc, p))) ? fieldMatrix.gamma : null;
  if (fieldMatrix && gammaPhiMatrix) {
    fieldFirst = traceOverN(fieldMatrix.first);
    gammaPhi = traceOverN(gammaPhiMatrix);
  }
  const fieldRenormalized = gammaPhiMatrix !== null || (!fieldFirst.isZero() && [...fieldFirst.terms.values()].some((t) => !calc.isNegligible(t.coeff)));
  if (fieldRenormalized) {
    const legs = weightPolynomials(calc, legCorrectionFor(spec), k);
    legs.forEach((p, i) => {
      const a1 = p.scale(ring.scale(sunsetPole, 1n, 2n));
      first[i] = first[i].add(a1);
      beta[i] = beta[i].add(a1.scale(ring.fromRational(2n)));
    });
  }
  // Z_t = Z_2 / Z_φ with Z_2 from the insertion graphs: γ_{φ²} = (g·∂) z_t1. With a matrix Z_φ,
  // φ_aφ_a is not multiplicatively renormalized (γ_φ δ + δ γ_φ is not ∝ δ): only the matrix remains.
  if (gammaPhiMatrix && !massNote) massNote = MIXING_NOTE;
  const gammaPhi2 = massNote ? null : gammaMassPart.sub(fieldFirst.scale(ring.fromRational(2n)));
  const checks: string[] = [];
  if (loops >= 2) {
    const fieldSecondAll = fieldMatrix ? fieldMatrix.second.flat() : [fieldSecond];
    checkPoleConsistency(calc, first, second, oneLoopFirst, { fieldSecond: fieldSecondAll, massFirst: massOneLoop.sub(zero()), massSecond, massNote }, checks);
    if (pairs) checkMatrixConsistency(calc, quadOneLoop, quadSecond, oneLoopFirst, checks);
  }
  const quadratic = pairs ? { pairs, gamma: quadraticWithField(quadGamma, pairs, gammaPhiMatrix, fieldFirst) } : null;
  return { calculus: calc, couplings: spec.couplings, loops, beta, gammaPhi, gammaPhiMatrix, gammaPhi2, gammaPhi2Note: massNote, quadratic, fieldRenormalized, residues: { first, second }, trail, checks };
}

/** Residues of the matrix Z_φ = 1 + z₁/ε + z₂/ε² (n×n, symmetric) and γ_φ = −(g·∂) z₁/2. */
interface FieldMatrixResidues<C> {
  first: CouplingPolynomial<C>[][];
  second: CouplingPolynomial<C>[][];
  gamma: CouplingPolynomial<C>[][];
}

function fieldMatrixResidues<C>(calc: Calculus<C>, w: GraphWeight, n: number, k1: C, k2: C): FieldMatrixResidues<C> {
  const { ring } = calc.ctx;
  const pairs = quadraticPairs(n);
  const polys = weightPolynomials(calc, w, pairs.length);
  const at = (a: number, b: number) => polys[pairs.findIndex(([i, j]) => i === Math.min(a, b) && j === Math.max(a, b))];
  const matrix = (c: C) => Array.from({ length: n }, (_, a) => Array.from({ length: n }, (_, b) => at(a, b).scale(ring.neg(c))));
  const first = matrix(k1);
  return { first, second: matrix(k2), gamma: first.map((row) => row.map((z) => z.scale(ring.fromRational(-BigInt(w.degree), 2n)))) };
}

export function traceOverN<C>(m: CouplingPolynomial<C>[][]): CouplingPolynomial<C> {
  const { ring } = m[0][0];
  return m.reduce((sum, row, a) => sum.add(row[a]), m[0][0].sub(m[0][0])).scale(ring.fromRational(1n, BigInt(m.length)));
}

function isNegligiblePolynomial<C>(calc: Calculus<C>, p: CouplingPolynomial<C>): boolean {
  return [...p.terms.values()].every((t) => calc.isNegligible(t.coeff));
}

/** The leg-correction weight, or an error naming the quartic structure it generates outside the couplings. */
function legCorrectionFor(spec: ModelSpec): GraphWeight {
  try {
    return legCorrectionWeight(spec);
  } catch (e) {
    const why = e instanceof EngineError && !isFamily(spec) ? explainLegCorrection(spec) : null;
    if (why) fail('invalid', why);
    throw e;
  }
}

/**
 * The quadratic-operator matrix with the field renormalization. The insertion ½ t₀ φ₀φ₀ with
 * φ₀ = Z_φ^{1/2} φ and Γ⁽²'¹⁾ made finite by Z_2[t] = Z_φ^{1/2} Z_t[t] Z_φ^{1/2} gives, at one pole,
 * z_t1[t] = z_21[t] − ½ (z_φ1 t + t z_φ1), hence γ_t[t] = (g·∂) z_21[t] + γ_φ t + t γ_φ
 * (γ_φ = −(g·∂) z_φ1/2). In the coordinates t_ij (i ≤ j) the field part is
 *   F[(kl)][(ij)] = Σ_e γ_ke [{e,l} = {i,j}] + γ_el [{k,e} = {i,j}],
 * which is 2γ_φ δ when γ_φ ∝ δ (the scalar case keeps its exact former form −2 z_φ1 δ).
 */
export function quadraticWithField<C>(z: CouplingPolynomial<C>[][], pairs: [number, number][], gammaPhiMatrix: CouplingPolynomial<C>[][] | null, fieldFirst: CouplingPolynomial<C>): CouplingPolynomial<C>[][] {
  if (!gammaPhiMatrix) return z.map((row, r) => row.map((p, c) => (r === c ? p.sub(fieldFirst.scale(p.ring.fromRational(2n))) : p)));
  const n = gammaPhiMatrix.length;
  const same = (x: number, y: number, [i, j]: [number, number]) => Math.min(x, y) === i && Math.max(x, y) === j;
  return z.map((row, r) => row.map((p, c) => {
    const [k, l] = pairs[r];
    let sum = p;
    for (let e = 0; e < n; e++) {
      if (same(e, l, pairs[c])) sum = sum.add(gammaPhiMatrix[k][e]);
      if (same(k, e, pairs[c])) sum = sum.add(gammaPhiMatrix[e][l]);
    }
    return sum;
  }));
}

/**
 * Renormalizability fixes every 1/ε² pole from one-loop data (RG equation for the counterterms):
 *   couplings:      (g·∂ − 1) a₂ = (b·∂) a₁  with b = (g·∂ − 1) a₁;
 *   φ² insertion:   (g·∂) ζ₂ = (b·∂) ζ₁  for ln Z_t = ζ₁/ε + ζ₂/ε²;
 *   self-energy:    no 1/ε² at two loops.
 * A violation means a wrong weight, integral or subtraction, so it throws.
 */
function checkPoleConsistency<C>(
  calc: Calculus<C>,
  first: CouplingPolynomial<C>[],
  second: CouplingPolynomial<C>[],
  oneLoop: CouplingPolynomial<C>[],
  extra: { fieldSecond: CouplingPolynomial<C>[]; massFirst: CouplingPolynomial<C>; massSecond: CouplingPolynomial<C>; massNote?: string },
  checks: string[],
): void {
  const { ring } = calc.ctx;
  const two = ring.fromRational(2n);
  second.forEach((a2, i) => {
    const predicted = first[i].homogeneous(2).along(oneLoop);
    assertVanishes(calc, a2.homogeneous(3).scale(two).sub(predicted), `1/ε² pole of the coupling counterterm ${i + 1} is not fixed by one-loop data`);
  });
  checks.push('coupling counterterms: 1/ε² poles equal the one-loop prediction (g·∂−1)a₂ = (b·∂)a₁');
  for (const p of extra.fieldSecond) assertVanishes(calc, p, 'the two-loop self-energy has a 1/ε² pole');
  checks.push('self-energy: no 1/ε² pole at two loops');
  if (!extra.massNote) {
    const zeta2 = extra.massSecond.homogeneous(2).sub(extra.massFirst.mul(extra.massFirst).scale(ring.fromRational(1n, 2n)));
    const predicted = extra.massFirst.along(oneLoop);
    assertVanishes(calc, zeta2.scale(two).sub(predicted), '1/ε² pole of the φ² insertion is not fixed by one-loop data');
    checks.push('φ² insertion: 1/ε² poles equal the one-loop prediction (g·∂)ζ₂ = (b·∂)ζ₁');
  }
  checks.push('no ln(p²)/ε terms after subtraction of subdivergences (every graph)');
}

/**
 * The matrix form of the φ² condition: Z = 1 + z₁/ε + z₂/ε² with Z⁻¹(β·∂)Z finite gives at
 * 1/ε (two loops) 2 z₂ = (b·∂) z₁ + z₁ z₁ (z₁ the one-loop residue matrix).
 */
function checkMatrixConsistency<C>(calc: Calculus<C>, z1: CouplingPolynomial<C>[][], z2: CouplingPolynomial<C>[][], oneLoop: CouplingPolynomial<C>[], checks: string[]): void {
  const { ring } = calc.ctx;
  const P = z1.length;
  for (let r = 0; r < P; r++) for (let c = 0; c < P; c++) {
    let square = z1[r][0].sub(z1[r][0]);
    for (let m = 0; m < P; m++) if (!z1[r][m].isZero() && !z1[m][c].isZero()) square = square.add(z1[r][m].mul(z1[m][c]));
    const residual = z2[r][c].homogeneous(2).scale(ring.fromRational(2n)).sub(z1[r][c].along(oneLoop)).sub(square);
    assertVanishes(calc, residual, `1/ε² pole of the quadratic-operator matrix entry (${r + 1}, ${c + 1}) is not fixed by one-loop data`);
  }
  checks.push('quadratic-operator matrix: 1/ε² poles equal the one-loop prediction 2z₂ = (b·∂)z₁ + z₁²');
}

export const describeModelKind = (spec: ModelSpec): string => (isFamily(spec) ? `${spec.label}, symbolic N` : spec.label);
