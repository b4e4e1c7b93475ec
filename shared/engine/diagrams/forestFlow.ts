import { EngineError, fail } from '../precision';
import { type ModelSpec, type QuarticModel, CouplingPolynomial, isFamily } from '../models';
import { type LaurentSeries } from '../series';
import { type Calculus } from './calculus';
import { type CatalogueEntry } from './catalogue';
import { fieldPairLabels, legCorrectionWeights, selfEnergyMatrixWeight } from './fieldWeights';
import { type ForestPole, type PoleMemo, type Primitives, forestPole } from './forests';
import { generateGraphs } from './generate';
import { type Graph, type GraphFunction, graphSign, symmetryData } from './graphs';
import { type IntegralKit, integralKit } from './integrals';
import { lineGraphOf } from './lineGraph';
import { ConsistencyError, type SubtractedGraph } from './subtraction';
import { type DerivedFlow, type TrailEntry, MAX_QUADRATIC_FIELDS, MIXING_NOTE, quadraticWithField, traceOverN } from './renormalization';
import { type GraphWeight, graphWeight, insertionMatrixWeight, quadraticPairs } from './weights';

/**
 * The RG functions from the generated graphs of every order up to `loops` (docs/engine.md, "Three
 * loops"): K R̄ of each graph by its forests, weights by contraction, then
 *   g₀ = μ^ε (g + D(g, ε)) Z_φ^{−2},  Z_φ = 1 + F(g, ε),  Z₂ = 1 + M(g, ε),  Z_t = Z₂ / Z_φ,
 * with D, F, M the weighted pole parts of the four-point, self-energy and φ²-insertion graphs. With
 * g₀ = μ^ε(g + Σ a_n/ε^n): β = −εg + (g·∂ − 1)a₁, γ_φ = −½(g·∂) ln Z_φ|₁, γ_{φ²} = (g·∂) ln Z_t|₁, and
 * every higher pole is checked against the RG pole equations (g·∂ − 1)a_{n+1} = (β̂·∂)a_n and
 * (g·∂)ζ_{n+1} = (β̂·∂)ζ_n for ζ = ln Z_φ, ln Z_t.
 *
 * When a self-energy graph's weight is a matrix W_ab not ∝ δ_ab (s = 2, anisotropic models) Z_φ is
 * the matrix 1 + F and each leg of the bare vertex carries Z_φ^{−1/2}:
 *   λ₀ = μ^ε (Z_φ^{−1/2})^{⊗4} (λ + D) = μ^ε (λ + D − ½ Σ_legs F ∘ (λ + D)) + (coupling degree ≥ 5),
 * exact to three loops since F starts at degree 2. γ_φ = −½ (g·∂) F₁ (F² is degree 4), its pole
 * equations (g·∂)F_{n+1} = (β̂·∂)F_n entry by entry, and φ_aφ_a then mixes with the other quadratic
 * operators (no scalar γ_{φ²}; the quadratic-operator matrix takes γ_φ t + t γ_φ).
 */
export function deriveFlowByForests<C>(spec: ModelSpec, calc: Calculus<C>, loops: number, primitives: Primitives<C>): DerivedFlow<C> {
  const { ring } = calc.ctx;
  const k = spec.couplings.length;
  const kit = integralKit(calc.s);
  const memo: PoleMemo<C> = new Map();
  const zero = () => new CouplingPolynomial<C>(ring, k);
  const poles = (width: number) => Array.from({ length: loops + 1 }, () => Array.from({ length: width }, zero));
  const vertex = poles(k);
  const field = poles(1);
  const mass = poles(1);
  let massNote: string | undefined;
  const trail: TrailEntry<C>[] = [];
  // the quadratic operators φ_iφ_j (i ≤ j): γ = (g·∂) of the 1/ε residue matrix of their insertions
  const pairs = !isFamily(spec) && spec.fields <= MAX_QUADRATIC_FIELDS ? quadraticPairs(spec.fields) : null;
  const P = pairs?.length ?? 0;
  // residues of the insertion matrix Z₂ = 1 + Σ_n quadPoles[n]/ε^n on the coordinates t_ij
  const quadPoles = Array.from({ length: loops + 1 }, () => Array.from({ length: P }, () => Array.from({ length: P }, zero)));
  const fieldMatrix = needsFieldMatrix(spec, calc, kit, loops, primitives, memo) ? fieldMatrixPoles(calc, (spec as QuarticModel), loops) : null;
  for (let L = 1; L <= loops; L++) {
    for (const fn of ['vertex', 'selfEnergy', 'massInsertion'] as GraphFunction[]) {
      for (const graph of generateGraphs(fn, L)) {
        const fp = forestPole(calc, kit, lineGraphOf(graph), primitives, memo);
        const sym = symmetryData(graph);
        const entry = { graph, sign: graphSign(graph), symmetryFactor: sym.symmetryFactor, labellings: sym.labellings, subtracted: asSubtracted(graph, fp) };
        if (fn === 'selfEnergy' && fieldMatrix) {
          trail.push({ ...entry, ...fieldMatrix.add(graph, fp.pole) });
          continue;
        }
        const { weight, note } = tryWeight(spec, graph);
        trail.push({ ...entry, weight, weightNote: note });
        const hasPole = fp.pole.coefficients().some((c) => !calc.isNegligible(c));
        if (fn === 'massInsertion' && pairs) {
          const matrixWeight = insertionMatrixWeight(spec as QuarticModel, graph);
          const polys = weightPolynomials(calc, matrixWeight, P * P);
          for (let n = 1; n <= L; n++) {
            const c = fp.pole.lowest <= -n ? fp.pole.coefficient(-n) : ring.zero();
            if (calc.isNegligible(c)) continue;
            for (let r = 0; r < P; r++) for (let col = 0; col < P; col++) quadPoles[n][r][col] = quadPoles[n][r][col].add(polys[r * P + col].scale(ring.neg(c)));
          }
        }
        if (!weight) {
          if (fn === 'massInsertion') massNote = note;
          else if (hasPole) fail('not-representable', `the field renormalization of this symbolic-N family is not proportional to the identity (${note}); give N as a number`);
          continue;
        }
        const w = weightPolynomials(calc, weight, fn === 'vertex' ? k : 1);
        const target = fn === 'vertex' ? vertex : fn === 'selfEnergy' ? field : mass;
        for (let n = 1; n <= L; n++) {
          const c = fp.pole.lowest <= -n ? fp.pole.coefficient(-n) : ring.zero();
          w.forEach((p, i) => (target[n][i] = target[n][i].add(p.scale(ring.neg(c)))));
        }
      }
    }
  }
  const maxDegree = loops + 1;
  const alg = poleAlgebra(calc, k, maxDegree);
  const zPhi = alg.unitPlus(field.map((row) => row[0]));
  const lnZPhi = alg.log(zPhi);
  const factorPhi = alg.power(zPhi, -2);
  const plain = spec.couplings.map((_, i) => alg.mul(alg.unitPlus(vertex.map((row) => row[i]), CouplingPolynomial.coupling(ring, k, i)), factorPhi));
  const bare = fieldMatrix ? withLegCorrection(alg, plain, fieldMatrix, zero) : plain;
  const a = (n: number) => bare.map((series) => series[n] ?? zero());
  const betaHat = a(1).map((p) => alg.gDotMinusOne(p));
  const checks: string[] = [];
  for (let n = 1; n < loops; n++) {
    a(n + 1).forEach((next, i) => {
      const residual = alg.gDotMinusOne(next).sub(alg.truncate(a(n)[i].along(betaHat)));
      assertVanishes(calc, residual, `1/ε^${n + 1} pole of the coupling counterterm ${i + 1} is not fixed by lower orders (RG pole equation)`);
    });
  }
  if (loops >= 2) checks.push(`coupling counterterms: every 1/ε^n pole (n = 2…${loops}) equals the prediction of the RG pole equations (g·∂−1)a_{n+1} = (β̂·∂)a_n`);
  if (fieldMatrix) fieldMatrix.checkPoles(betaHat, checks);
  else checkLogPoles(calc, alg, lnZPhi, betaHat, loops, 'self-energy (ln Z_φ)', checks);
  if (fieldMatrix && !massNote) massNote = MIXING_NOTE;
  if (pairs) checkInsertionMatrixPoles(calc, alg, quadPoles, fieldMatrix ? { matrix: fieldMatrix.poles(), pairs } : { inverseZPhi: alg.power(zPhi, -1) }, betaHat, loops, checks);
  const lnZt = massNote ? null : alg.sub(alg.log(alg.unitPlus(mass.map((row) => row[0]))), lnZPhi);
  if (lnZt) checkLogPoles(calc, alg, lnZt, betaHat, loops, 'φ² insertion (ln Z_t = ln Z₂ − ln Z_φ)', checks);
  checks.push('no ln(p²)/ε terms after subtraction of subdivergences (every graph)');
  const gammaPhiMatrix = fieldMatrix?.gamma() ?? null;
  const gammaPhi = gammaPhiMatrix ? traceOverN(gammaPhiMatrix) : upToDegree(alg.gDot(lnZPhi[1]).scale(ring.fromRational(-1n, 2n)), loops);
  const fieldRenormalized = gammaPhiMatrix !== null || (!lnZPhi[1].isZero() && [...lnZPhi[1].terms.values()].some((t) => !calc.isNegligible(t.coeff)));
  return {
    calculus: calc,
    couplings: spec.couplings,
    loops,
    beta: betaHat,
    gammaPhi,
    gammaPhiMatrix,
    gammaPhi2: lnZt ? upToDegree(alg.gDot(lnZt[1]), loops) : null,
    gammaPhi2Note: massNote,
    // the field part γ_φ t + t γ_φ
    quadratic: pairs ? { pairs, gamma: quadraticWithField(quadPoles[1].map((row) => row.map(gDot)), pairs, gammaPhiMatrix ?? diagonalOf(gammaPhi, (spec as QuarticModel).fields), zero()) } : null,
    fieldRenormalized,
    residues: { first: a(1), second: a(2) },
    trail,
    checks,
  };
}

/**
 * The quadratic-operator matrix Z_t acting on t (t₀ = Z_t t): Z_t = Z₂/Z_φ for a scalar Z_φ, and
 * Z_t = (1 − ½Φ(F))∘Z₂ through three loops for a matrix Z_φ = 1 + F, with Φ(F)t = Ft + tF (from
 * Z₂[t] = Z_φ^{1/2} Z_t[t] Z_φ^{1/2}, F² being degree 4). Z_t⁻¹ (μ d/dμ) Z_t finite gives, at each
 * 1/ε^n (n ≥ 1), (g·∂) z_{n+1} = (β̂·∂) z_n + z_n (g·∂) z₁ — with the products in this order.
 */
function checkInsertionMatrixPoles<C>(
  calc: Calculus<C>,
  alg: PoleAlgebra<C>,
  z2: CouplingPolynomial<C>[][][],
  field: { inverseZPhi: PoleSeries<C> } | { matrix: CouplingPolynomial<C>[][][]; pairs: [number, number][] },
  betaHat: CouplingPolynomial<C>[],
  loops: number,
  checks: string[],
): void {
  const P = z2[1].length;
  const zero = z2[0][0][0];
  // entry (r, c) of Z₂ as a series in 1/ε (δ_rc at ε⁰)
  const z2Series = z2[1].map((row, r) => row.map((_, c) => alg.unitPlus(z2.map((m) => m[r][c]), r === c ? undefined : zero)));
  let zt: PoleSeries<C>[][];
  if ('inverseZPhi' in field) zt = z2Series.map((row) => row.map((series) => alg.mul(series, field.inverseZPhi)));
  else {
    const zeroMatrix = z2[0];
    // Φ(F_n) in the coordinates t_ij, as a matrix of series with Φ[r][m][n] its 1/ε^n part
    const phiByPole = field.matrix.map((F, n) => (n === 0 ? zeroMatrix : quadraticWithField(zeroMatrix, field.pairs, F, zero)));
    const phi = (r: number, m: number) => phiByPole.map((M) => M[r][m]);
    zt = z2Series.map((row, r) => row.map((series, c) => {
      let correction = alg.unitPlus([], zero);
      for (let m = 0; m < P; m++) correction = alg.add(correction, alg.mul(phi(r, m), z2Series[m][c]));
      return alg.sub(series, correction.map((p) => p.scale(p.ring.fromRational(1n, 2n))));
    }));
  }
  const z = (n: number) => zt.map((row) => row.map((series) => series[n]));
  const g1 = z(1).map((row) => row.map(gDot));
  for (let n = 1; n < loops; n++) {
    const zn = z(n);
    const next = z(n + 1);
    for (let r = 0; r < P; r++) for (let c = 0; c < P; c++) {
      let product = zero;
      for (let m = 0; m < P; m++) if (!zn[r][m].isZero() && !g1[m][c].isZero()) product = product.add(zn[r][m].mul(g1[m][c]));
      const residual = upToDegree(gDot(next[r][c]).sub(zn[r][c].along(betaHat)).sub(product), loops);
      assertVanishes(calc, residual, `1/ε^${n + 1} pole of the quadratic-operator matrix entry (${r + 1}, ${c + 1}) is not fixed by lower orders (RG pole equation)`);
    }
  }
  if (loops >= 2) checks.push('quadratic-operator matrix: every higher pole equals the prediction (g·∂)z_{n+1} = (β̂·∂)z_n + z_n (g·∂)z₁');
}

/** λ + D − ½ Σ_legs F ∘ (λ + D): coupling i of the correction is −½ Σ_j (g_j + D_j) Φ_j[i]. */
function withLegCorrection<C>(alg: PoleAlgebra<C>, plain: PoleSeries<C>[], field: FieldMatrixPoles<C>, zero: () => CouplingPolynomial<C>): PoleSeries<C>[] {
  return plain.map((series, i) => {
    let correction = alg.unitPlus([], zero());
    plain.forEach((bareJ, j) => (correction = alg.add(correction, alg.mul(bareJ, field.legs(j, i)))));
    return alg.sub(series, correction.map((p) => p.scale(p.ring.fromRational(1n, 2n))));
  });
}

/** True when some self-energy graph with a pole has a weight not ∝ δ_ab (explicit-tensor models only). */
function needsFieldMatrix<C>(spec: ModelSpec, calc: Calculus<C>, kit: IntegralKit, loops: number, primitives: Primitives<C>, memo: PoleMemo<C>): boolean {
  if (isFamily(spec)) return false;
  for (let L = 1; L <= loops; L++) {
    for (const graph of generateGraphs('selfEnergy', L)) {
      const fp = forestPole(calc, kit, lineGraphOf(graph), primitives, memo);
      if (fp.pole.coefficients().some((c) => !calc.isNegligible(c)) && !tryWeight(spec, graph).weight) return true;
    }
  }
  return false;
}

/** Z_φ = 1 + Σ_m F_m/ε^m as a matrix, with the leg forms Φ_j (see legCorrectionWeights), graph by graph. */
interface FieldMatrixPoles<C> {
  /** Adds a self-energy graph; returns what the trail shows for it. */
  add(graph: Graph, pole: LaurentSeries<C>): Pick<TrailEntry<C>, 'weight' | 'weightLabels' | 'weightNote'>;
  /** Coefficient of coupling i in Σ_legs F ∘ (scale_j basis_j), as a series in 1/ε. */
  legs(j: number, i: number): CouplingPolynomial<C>[];
  gamma(): CouplingPolynomial<C>[][];
  /** F_n for n = 0 … loops (F_0 = 0). */
  poles(): CouplingPolynomial<C>[][][];
  checkPoles(betaHat: CouplingPolynomial<C>[], checks: string[]): void;
}

function fieldMatrixPoles<C>(calc: Calculus<C>, model: QuarticModel, loops: number): FieldMatrixPoles<C> {
  const { ring } = calc.ctx;
  const k = model.couplings.length;
  const n = model.fields;
  const zero = () => new CouplingPolynomial<C>(ring, k);
  const square = (size: number) => Array.from({ length: size }, () => Array.from({ length: size }, zero));
  const F = Array.from({ length: loops + 1 }, () => square(n));
  const phi = Array.from({ length: loops + 1 }, () => square(k));
  const pairs = quadraticPairs(n);
  const pairIndex = (a: number, b: number) => pairs.findIndex(([i, j]) => i === Math.min(a, b) && j === Math.max(a, b));
  return {
    add(graph, pole) {
      const weight = selfEnergyMatrixWeight(model, graph);
      const shown = { weight, weightLabels: fieldPairLabels(n), weightNote: 'not proportional to δ_ab: the weight is the matrix W_ab, entries (a,b) with a ≤ b' };
      const residues = Array.from({ length: loops + 1 }, (_, m) => (m > 0 && pole.lowest <= -m ? pole.coefficient(-m) : ring.zero()));
      if (residues.every((c) => calc.isNegligible(c))) return shown;
      const entries = weightPolynomials(calc, weight, pairs.length);
      const legs = weightPolynomials(calc, legCorrectionWeights(model, graph), k * k);
      residues.forEach((c, m) => {
        if (calc.isNegligible(c)) return;
        const f = ring.neg(c);
        for (let a = 0; a < n; a++) for (let b = 0; b < n; b++) F[m][a][b] = F[m][a][b].add(entries[pairIndex(a, b)].scale(f));
        for (let j = 0; j < k; j++) for (let i = 0; i < k; i++) phi[m][j][i] = phi[m][j][i].add(legs[j * k + i].scale(f));
      });
      return shown;
    },
    legs: (j, i) => phi.map((rows, m) => (m === 0 ? zero() : rows[j][i])),
    poles: () => F,
    gamma: () => F[1].map((row) => row.map((p) => upToDegree(gDot(p), loops).scale(ring.fromRational(-1n, 2n)))),
    checkPoles(betaHat, checks) {
      for (let m = 1; m < loops; m++) {
        for (let a = 0; a < n; a++) for (let b = a; b < n; b++) {
          const residual = upToDegree(gDot(F[m + 1][a][b]).sub(F[m][a][b].along(betaHat)), loops);
          assertVanishes(calc, residual, `1/ε^${m + 1} pole of the field renormalization matrix entry (${a + 1},${b + 1}) is not fixed by lower orders (RG pole equation)`);
        }
      }
      if (loops >= 2) checks.push('self-energy (the matrix Z_φ): every higher pole of every entry equals the prediction (g·∂)F_{n+1} = (β̂·∂)F_n');
    },
  };
}

/** (g·∂) p: each monomial times its total degree. */
function gDot<C>(p: CouplingPolynomial<C>): CouplingPolynomial<C> {
  return new CouplingPolynomial<C>(p.ring, p.variables, [...p.terms.values()].map((t) => ({ powers: t.powers, coeff: p.ring.scale(t.coeff, BigInt(t.powers.reduce((a, b) => a + b, 0))) })));
}

function diagonalOf<C>(p: CouplingPolynomial<C>, n: number): CouplingPolynomial<C>[][] {
  return Array.from({ length: n }, (_, a) => Array.from({ length: n }, (_, b) => (a === b ? p : p.sub(p))));
}

function checkLogPoles<C>(calc: Calculus<C>, alg: PoleAlgebra<C>, z: CouplingPolynomial<C>[], betaHat: CouplingPolynomial<C>[], loops: number, what: string, checks: string[]): void {
  for (let n = 1; n < loops; n++) {
    // Z_φ and Z₂ are known to coupling degree `loops` (an L-loop graph has L vertices)
    const residual = upToDegree(alg.gDot(z[n + 1]).sub(z[n].along(betaHat)), loops);
    assertVanishes(calc, residual, `1/ε^${n + 1} pole of the ${what} is not fixed by lower orders (RG pole equation)`);
  }
  if (loops >= 2) checks.push(`${what}: every higher pole equals the prediction (g·∂)ζ_{n+1} = (β̂·∂)ζ_n`);
}

function upToDegree<C>(p: CouplingPolynomial<C>, degree: number): CouplingPolynomial<C> {
  return new CouplingPolynomial<C>(p.ring, p.variables, [...p.terms.values()].filter((t) => t.powers.reduce((a, b) => a + b, 0) <= degree));
}

function assertVanishes<C>(calc: Calculus<C>, p: CouplingPolynomial<C>, message: string): void {
  for (const t of p.terms.values()) if (!calc.isNegligible(t.coeff)) throw new ConsistencyError(message);
}

function tryWeight(spec: ModelSpec, graph: Graph): { weight: GraphWeight | null; note?: string } {
  try {
    return { weight: graphWeight(spec, graph) };
  } catch (e) {
    if (e instanceof EngineError && graph.function !== 'vertex') return { weight: null, note: e.message };
    throw e;
  }
}

function weightPolynomials<C>(calc: Calculus<C>, w: GraphWeight, width: number): CouplingPolynomial<C>[] {
  const { ring } = calc.ctx;
  const variables = w.terms[0]?.powers.length ?? 0;
  return Array.from({ length: width }, (_, i) => new CouplingPolynomial(ring, variables, w.terms.map((t) => ({ powers: t.powers, coeff: calc.fromPoly(t.values[i]) }))));
}

function asSubtracted<C>(graph: Graph, fp: ForestPole<C>): SubtractedGraph<C> {
  const entry: CatalogueEntry = {
    graph,
    integral: () => fail('invalid', 'a generated graph keeps its integral in the trail'),
    rearrangement: fp.rearrangement,
    subdivergences: [],
  };
  return { entry, integralLatex: fp.integralLatex, laurent: fp.laurent, counterterms: fp.counterterms, subtracted: fp.subtracted, pole: fp.pole };
}

// ---- series in 1/ε with coupling-polynomial coefficients, truncated in the coupling degree ---------

/** index n: the coefficient of 1/ε^n (n = 0 … loops). */
type PoleSeries<C> = CouplingPolynomial<C>[];

interface PoleAlgebra<C> {
  unitPlus(poles: CouplingPolynomial<C>[], constant?: CouplingPolynomial<C>): PoleSeries<C>;
  mul(x: PoleSeries<C>, y: PoleSeries<C>): PoleSeries<C>;
  add(x: PoleSeries<C>, y: PoleSeries<C>): PoleSeries<C>;
  sub(x: PoleSeries<C>, y: PoleSeries<C>): PoleSeries<C>;
  log(x: PoleSeries<C>): PoleSeries<C>;
  power(x: PoleSeries<C>, exponent: number): PoleSeries<C>;
  truncate(p: CouplingPolynomial<C>): CouplingPolynomial<C>;
  gDot(p: CouplingPolynomial<C>): CouplingPolynomial<C>;
  gDotMinusOne(p: CouplingPolynomial<C>): CouplingPolynomial<C>;
}

function poleAlgebra<C>(calc: Calculus<C>, k: number, maxDegree: number): PoleAlgebra<C> {
  const { ring } = calc.ctx;
  const zero = () => new CouplingPolynomial<C>(ring, k);
  const truncate = (p: CouplingPolynomial<C>) => new CouplingPolynomial<C>(ring, k, [...p.terms.values()].filter((t) => t.powers.reduce((a, b) => a + b, 0) <= maxDegree));
  const length = maxDegree;
  const mul = (x: PoleSeries<C>, y: PoleSeries<C>): PoleSeries<C> => {
    const out = Array.from({ length }, zero);
    x.forEach((p, i) => y.forEach((r, j) => i + j < length && !p.isZero() && !r.isZero() && (out[i + j] = out[i + j].add(truncate(p.mul(r))))));
    return out;
  };
  const scaleBy = (x: PoleSeries<C>, c: C) => x.map((p) => p.scale(c));
  const add = (x: PoleSeries<C>, y: PoleSeries<C>) => x.map((p, i) => p.add(y[i] ?? zero()));
  /** Σ_{m≥0} c_m X^m for X without a constant term (its coupling degree ≥ 1 keeps the sum finite). */
  const compose = (x: PoleSeries<C>, coefficient: (m: number) => C): PoleSeries<C> => {
    const X = x.map((p, i) => (i === 0 ? p.sub(constantPart(p)) : p));
    const base = x[0];
    if (!isOne(base)) fail('invalid', 'a renormalization factor must start with 1');
    let result = Array.from({ length }, zero);
    let power: PoleSeries<C> = [CouplingPolynomial.monomial(ring, new Array<number>(k).fill(0), ring.one()), ...Array.from({ length: length - 1 }, zero)];
    for (let m = 0; m <= maxDegree; m++) {
      result = add(result, scaleBy(power, coefficient(m)));
      power = mul(power, X);
    }
    return result;
  };
  const constantPart = (p: CouplingPolynomial<C>) => new CouplingPolynomial<C>(ring, k, [...p.terms.values()].filter((t) => t.powers.every((e) => e === 0)));
  const isOne = (p: CouplingPolynomial<C>) => {
    const c = constantPart(p);
    return [...c.terms.values()].every((t) => calc.isNegligible(ring.sub(t.coeff, ring.one()))) && c.terms.size === 1;
  };
  return {
    unitPlus: (poles, constant) => {
      const one = constant ?? CouplingPolynomial.monomial(ring, new Array<number>(k).fill(0), ring.one());
      return Array.from({ length }, (_, n) => (n === 0 ? one : truncate(poles[n] ?? zero())));
    },
    mul,
    add,
    sub: (x, y) => x.map((p, i) => p.sub(y[i] ?? zero())),
    // ln(1 + X) = Σ (−1)^{m+1} X^m / m
    log: (x) => compose(x, (m) => (m === 0 ? ring.zero() : ring.fromRational(m % 2 === 1 ? 1n : -1n, BigInt(m)))),
    // (1 + X)^e = Σ binom(e, m) X^m
    power: (x, e) => compose(x, (m) => {
      let num = 1n;
      let den = 1n;
      for (let j = 0; j < m; j++) {
        num *= BigInt(e - j);
        den *= BigInt(j + 1);
      }
      return ring.fromRational(num, den);
    }),
    truncate,
    gDot: (p) => gDot(p),
    gDotMinusOne: (p) => gDot(p).sub(p),
  };
}
