import { EngineError } from '../precision/errors';
import { CouplingPolynomial } from '../models/couplingPolynomial';
import { type ModelSpec, isFamily } from '../models/model';
import { type LaurentSeries } from '../series/laurent';
import { type Calculus } from './calculus';
import { type CatalogueEntry, catalogueUpTo } from './catalogue';
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
  gammaPhi: CouplingPolynomial<C>;
  gammaPhi2: CouplingPolynomial<C> | null;
  gammaPhi2Note?: string;
  /**
   * Anomalous-dimension matrix of the quadratic operators φ_iφ_j (pairs i ≤ j):
   * γ[(kl)][(ij)] = (g·∂) z₁ − 2 z_φ1 δ, from the insertion graphs with the insertion tensor kept.
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
    const sym = symmetryData(entry.graph);
    trail.push({ graph: entry.graph, sign: graphSign(entry.graph), symmetryFactor: sym.symmetryFactor, labellings: sym.labellings, weight, weightNote: note, subtracted });
    const k1 = residue(subtracted.pole, 1);
    const k2 = residue(subtracted.pole, 2);
    const f = entry.graph.function;
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
  const fieldRenormalized = !fieldFirst.isZero() && [...fieldFirst.terms.values()].some((t) => !calc.isNegligible(t.coeff));
  if (fieldRenormalized) {
    const legs = weightPolynomials(calc, legCorrectionWeight(spec), k);
    legs.forEach((p, i) => {
      const a1 = p.scale(ring.scale(sunsetPole, 1n, 2n));
      first[i] = first[i].add(a1);
      beta[i] = beta[i].add(a1.scale(ring.fromRational(2n)));
    });
  }
  // Z_t = Z_2 / Z_φ with Z_2 from the insertion graphs: γ_{φ²} = (g·∂) z_t1.
  const gammaPhi2 = massNote ? null : gammaMassPart.sub(fieldFirst.scale(ring.fromRational(2n)));
  const checks: string[] = [];
  if (loops >= 2) {
    checkPoleConsistency(calc, first, second, oneLoopFirst, { fieldSecond, massFirst: massOneLoop.sub(zero()), massSecond, massNote }, checks);
    if (pairs) checkMatrixConsistency(calc, quadOneLoop, quadSecond, oneLoopFirst, checks);
  }
  const quadratic = pairs
    ? { pairs, gamma: quadGamma.map((row, r) => row.map((p, c) => (r === c ? p.sub(fieldFirst.scale(ring.fromRational(2n))) : p))) }
    : null;
  return { calculus: calc, couplings: spec.couplings, loops, beta, gammaPhi, gammaPhi2, gammaPhi2Note: massNote, quadratic, fieldRenormalized, residues: { first, second }, trail, checks };
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
  extra: { fieldSecond: CouplingPolynomial<C>; massFirst: CouplingPolynomial<C>; massSecond: CouplingPolynomial<C>; massNote?: string },
  checks: string[],
): void {
  const { ring } = calc.ctx;
  const two = ring.fromRational(2n);
  second.forEach((a2, i) => {
    const predicted = first[i].homogeneous(2).along(oneLoop);
    assertVanishes(calc, a2.homogeneous(3).scale(two).sub(predicted), `1/ε² pole of the coupling counterterm ${i + 1} is not fixed by one-loop data`);
  });
  checks.push('coupling counterterms: 1/ε² poles equal the one-loop prediction (g·∂−1)a₂ = (b·∂)a₁');
  assertVanishes(calc, extra.fieldSecond, 'the two-loop self-energy has a 1/ε² pole');
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
