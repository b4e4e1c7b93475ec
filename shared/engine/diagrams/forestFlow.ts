import { EngineError, fail } from '../precision';
import { type ModelSpec, type QuarticModel, CouplingPolynomial, isFamily } from '../models';
import { type Calculus } from './calculus';
import { type CatalogueEntry } from './catalogue';
import { type ForestPole, type PoleMemo, type Primitives, forestPole } from './forests';
import { generateGraphs } from './generate';
import { type Graph, type GraphFunction, graphSign, symmetryData } from './graphs';
import { integralKit } from './integrals';
import { lineGraphOf } from './lineGraph';
import { ConsistencyError, type SubtractedGraph } from './subtraction';
import { type DerivedFlow, type TrailEntry, MAX_QUADRATIC_FIELDS, quadraticWithField } from './renormalization';
import { type GraphWeight, graphWeight, insertionMatrixWeight, quadraticPairs } from './weights';

/**
 * The RG functions from the generated graphs of every order up to `loops` (docs/engine.md, "Three
 * loops"): K R̄ of each graph by its forests, weights by contraction, then
 *   g₀ = μ^ε (g + D(g, ε)) Z_φ^{−2},  Z_φ = 1 + F(g, ε),  Z₂ = 1 + M(g, ε),  Z_t = Z₂ / Z_φ,
 * with D, F, M the weighted pole parts of the four-point, self-energy and φ²-insertion graphs. With
 * g₀ = μ^ε(g + Σ a_n/ε^n): β = −εg + (g·∂ − 1)a₁, γ_φ = −½(g·∂) ln Z_φ|₁, γ_{φ²} = (g·∂) ln Z_t|₁, and
 * every higher pole is checked against the RG pole equations (g·∂ − 1)a_{n+1} = (β̂·∂)a_n and
 * (g·∂)ζ_{n+1} = (β̂·∂)ζ_n for ζ = ln Z_φ, ln Z_t.
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
  const quadGamma = Array.from({ length: P }, () => Array.from({ length: P }, zero));
  for (let L = 1; L <= loops; L++) {
    for (const fn of ['vertex', 'selfEnergy', 'massInsertion'] as GraphFunction[]) {
      for (const graph of generateGraphs(fn, L)) {
        const fp = forestPole(calc, kit, lineGraphOf(graph), primitives, memo);
        const { weight, note } = tryWeight(spec, graph);
        const sym = symmetryData(graph);
        trail.push({ graph, sign: graphSign(graph), symmetryFactor: sym.symmetryFactor, labellings: sym.labellings, weight, weightNote: note, subtracted: asSubtracted(graph, fp) });
        const hasPole = fp.pole.coefficients().some((c) => !calc.isNegligible(c));
        if (fn === 'massInsertion' && pairs) {
          const matrixWeight = insertionMatrixWeight(spec as QuarticModel, graph);
          const polys = weightPolynomials(calc, matrixWeight, P * P);
          const k1 = fp.pole.lowest <= -1 ? fp.pole.coefficient(-1) : ring.zero();
          const factor = ring.scale(ring.neg(k1), BigInt(matrixWeight.degree));
          for (let r = 0; r < P; r++) for (let c = 0; c < P; c++) quadGamma[r][c] = quadGamma[r][c].add(polys[r * P + c].scale(factor));
        }
        if (!weight) {
          if (fn === 'massInsertion') massNote = note;
          else if (hasPole) fail('not-representable', `three-loop field renormalization for this model is a matrix not proportional to the identity (${note})`);
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
  const bare = spec.couplings.map((_, i) => alg.mul(alg.unitPlus(vertex.map((row) => row[i]), CouplingPolynomial.coupling(ring, k, i)), factorPhi));
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
  checkLogPoles(calc, alg, lnZPhi, betaHat, loops, 'self-energy (ln Z_φ)', checks);
  const lnZt = massNote ? null : alg.sub(alg.log(alg.unitPlus(mass.map((row) => row[0]))), lnZPhi);
  if (lnZt) checkLogPoles(calc, alg, lnZt, betaHat, loops, 'φ² insertion (ln Z_t = ln Z₂ − ln Z_φ)', checks);
  checks.push('no ln(p²)/ε terms after subtraction of subdivergences (every graph)');
  const gammaPhi = upToDegree(alg.gDot(lnZPhi[1]).scale(ring.fromRational(-1n, 2n)), loops);
  const fieldRenormalized = !lnZPhi[1].isZero() && [...lnZPhi[1].terms.values()].some((t) => !calc.isNegligible(t.coeff));
  return {
    calculus: calc,
    couplings: spec.couplings,
    loops,
    beta: betaHat,
    gammaPhi,
    gammaPhiMatrix: null,
    gammaPhi2: lnZt ? upToDegree(alg.gDot(lnZt[1]), loops) : null,
    gammaPhi2Note: massNote,
    // the field part γ_φ t + t γ_φ with the scalar γ_φ (a matrix γ_φ is refused above)
    quadratic: pairs ? { pairs, gamma: quadraticWithField(quadGamma, pairs, diagonalOf(gammaPhi, (spec as QuarticModel).fields), zero()) } : null,
    fieldRenormalized,
    residues: { first: a(1), second: a(2) },
    trail,
    checks,
  };
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
  const gDot = (p: CouplingPolynomial<C>) => new CouplingPolynomial<C>(ring, k, [...p.terms.values()].map((t) => ({ powers: t.powers, coeff: ring.scale(t.coeff, BigInt(t.powers.reduce((a, b) => a + b, 0))) })));
  return {
    unitPlus: (poles, constant) => {
      const one = constant ?? CouplingPolynomial.monomial(ring, new Array<number>(k).fill(0), ring.one());
      return Array.from({ length }, (_, n) => (n === 0 ? one : truncate(poles[n] ?? zero())));
    },
    mul,
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
    gDot,
    gDotMinusOne: (p) => gDot(p).sub(p),
  };
}
