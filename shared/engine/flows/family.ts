import { type DerivedFlow, type GraphWeight, type SubtractedGraph, type TrailEntry, deriveFlow, numericCalculus, symbolicCalculus } from '../diagrams';
import { type CouplingPolynomial, type FamilyPoint, type ModelFamily, familyPointLabel } from '../models';
import { type Real, fail, rationalToReal, realContext } from '../precision';
import { type CoefficientRing, LaurentSeries } from '../series';
import { type Expression, type Poly, type Q, atomKey, evaluateAtom, polyConstant, polyEvaluate, polyIsZero, polySubstitute, polyToString, polyVariables, qKey, qToString, ratEvaluate, substituteParameter } from '../symbolic';

/** Exact values of the flow's parameters: s always, N for a symbolic-N family. */
export interface ParameterValues {
  readonly s: Q;
  readonly N?: Q;
}

/** Numeric value of a coefficient, each ψ/Γ atom computed once per point and shared through `atoms`. */
export function expressionValueAt(e: Expression, at: Readonly<Record<string, Q>>, digits: number, atoms: Map<string, Real>): Real {
  const R = realContext(digits);
  let sum = new R(0);
  for (const t of e.terms.values()) {
    let term = rationalToReal(ratEvaluate(t.coeff, at), digits);
    for (const p of t.monomial) {
      const key = atomKey(p.atom);
      let base = atoms.get(key);
      if (!base) {
        base = evaluateAtom(p.atom, at, digits);
        atoms.set(key, base);
      }
      term = term.times(p.exponent.den === 1n ? base.pow(p.exponent.num.toString()) : base.pow(new R(p.exponent.num.toString()).div(p.exponent.den.toString())));
    }
    sum = sum.plus(term);
  }
  return sum;
}

function mapSeries<C, D>(series: LaurentSeries<C>, ring: CoefficientRing<D>, f: (c: C) => D): LaurentSeries<D> {
  return LaurentSeries.of(ring, series.lowest, series.coefficients().map(f), series.order);
}

function mapSubtracted<C, D>(g: SubtractedGraph<C>, ring: CoefficientRing<D>, f: (c: C) => D): SubtractedGraph<D> {
  const m = (s: LaurentSeries<C>) => mapSeries(s, ring, f);
  return { ...g, laurent: m(g.laurent), counterterms: g.counterterms.map((c) => ({ ...c, pole: m(c.pole), reduced: m(c.reduced) })), subtracted: m(g.subtracted), pole: m(g.pole) };
}

function mapWeight(w: GraphWeight | null, N: Q | undefined): GraphWeight | null {
  if (!w || N === undefined) return w;
  return { ...w, terms: w.terms.map((t) => ({ powers: t.powers, values: t.values.map((p) => polySubstitute(p, 'N', polyConstant(N))) })) };
}

/** The flow with every coefficient mapped (to numbers, or to expressions with a parameter set). */
function mapFlow<D>(flow: DerivedFlow<Expression>, calculus: DerivedFlow<D>['calculus'], f: (e: Expression) => D, N: Q | undefined, withTrail: boolean): DerivedFlow<D> {
  const { ring } = calculus.ctx;
  const poly = (p: CouplingPolynomial<Expression>) => p.map(ring, f);
  const trail: TrailEntry<D>[] = withTrail ? flow.trail.map((t) => ({ ...t, weight: mapWeight(t.weight, N), subtracted: mapSubtracted(t.subtracted, ring, f) })) : [];
  return {
    ...flow,
    calculus,
    beta: flow.beta.map(poly),
    gammaPhi: poly(flow.gammaPhi),
    gammaPhiMatrix: flow.gammaPhiMatrix ? flow.gammaPhiMatrix.map((row) => row.map(poly)) : null,
    gammaPhi2: flow.gammaPhi2 ? poly(flow.gammaPhi2) : null,
    quadratic: flow.quadratic ? { pairs: flow.quadratic.pairs, gamma: flow.quadratic.gamma.map((row) => row.map(poly)) } : null,
    residues: { first: flow.residues.first.map(poly), second: flow.residues.second.map(poly) },
    trail,
  };
}

/**
 * A flow whose coefficients are symbolic (in s, and in N for a family) as numbers at exact parameter
 * values; the trail too unless `withTrail` is false (scans). Each ψ/Γ atom is computed once.
 */
export function flowAt(flow: DerivedFlow<Expression>, values: ParameterValues, digits: number, { withTrail = true } = {}): DerivedFlow<Real> {
  if (flow.calculus.sValue && qKey(flow.calculus.sValue) !== qKey(values.s)) fail('invalid', `this flow was derived at s = ${qToString(flow.calculus.sValue)}, not at s = ${qToString(values.s)}`);
  const calculus = numericCalculus(values.s, digits);
  const atoms = new Map<string, Real>();
  const at: Record<string, Q> = values.N === undefined ? { s: values.s } : { s: values.s, N: values.N };
  return mapFlow(flow, calculus, (e) => expressionValueAt(e, at, calculus.digits, atoms), values.N, withTrail);
}

/** A family flow at one exact N, still symbolic in s (what scans over s evaluate point by point). */
export function flowAtN(flow: DerivedFlow<Expression>, N: Q): DerivedFlow<Expression> {
  return mapFlow(flow, flow.calculus, (e) => substituteParameter(e, 'N', N), N, true);
}

// ---- symbolic-N families, derived once -------------------------------------------------------------

/** Where a fixed point of the family divides by a polynomial in N (collected by the caller, which knows fixed points). */
export interface PoleSource {
  point: string;
  coefficients: readonly Expression[];
}

interface FamilyEntry {
  flow: DerivedFlow<Expression>;
  poles?: { point: string; factor: Poly }[];
}

/** Family flows kept per family, loop order and s (symbolic or one exact value): each is a derivation of 0.1–0.5 s. */
const FAMILY_FLOWS_KEPT = 24;
const familyFlows = new Map<ModelFamily, Map<string, FamilyEntry>>();

function familyEntry(family: ModelFamily, s: Q | null, loops: number): FamilyEntry {
  let byKey = familyFlows.get(family);
  if (!byKey) familyFlows.set(family, (byKey = new Map()));
  const key = `${loops}|${s ? qKey(s) : 's'}`;
  const hit = byKey.get(key);
  if (hit) {
    byKey.delete(key);
    byKey.set(key, hit);
    return hit;
  }
  const entry = { flow: deriveFlow(family, symbolicCalculus(s), loops) };
  byKey.set(key, entry);
  if (byKey.size > FAMILY_FLOWS_KEPT) byKey.delete(byKey.keys().next().value as string);
  return entry;
}

/** The flow of a symbolic-N family (exact coefficients; s symbolic when null), derived once and kept. */
export function familyFlow(family: ModelFamily, s: Q | null, loops: number): DerivedFlow<Expression> {
  return familyEntry(family, s, loops).flow;
}

function denominatorsInN(sources: PoleSource[]): { point: string; factor: Poly }[] {
  const found = new Map<string, { point: string; factor: Poly }>();
  for (const { point, coefficients } of sources) {
    for (const e of coefficients) for (const t of e.terms.values()) for (const f of t.coeff.den.values()) {
      if (polyVariables(f.poly).includes('N')) found.set(`${point}|${polyToString(f.poly)}`, { point, factor: f.poly });
    }
  }
  return [...found.values()];
}

function vanishesAt(factor: Poly, N: Q, s: Q | null): boolean {
  const atN = polySubstitute(factor, 'N', polyConstant(N));
  if (polyIsZero(atN)) return true;
  return s !== null && polyVariables(atN).every((v) => v === 's') && polyEvaluate(atN, { s }).num === 0n;
}

/** A fixed point of a symbolic-N family that has no data at one N: its ε-series have a pole there. */
export interface OmittedPoint {
  point: string;
  N: Q;
  /** The denominator factor of its ε-series that vanishes at N. */
  factor: string;
  message: string;
}

/** Per flow evaluated from a family at one N: its omitted points, found only when asked for (flow jobs never need them). */
const omittedByFlow = new WeakMap<object, () => OmittedPoint[]>();

/**
 * The fixed points of the family that have a pole at the N this flow was evaluated at (empty for a
 * flow not evaluated from a family, or without pole sources). Only those points lack data there:
 * β itself is polynomial in N, and every other point is unaffected.
 */
export function omittedFixedPoints(flow: DerivedFlow<unknown>): OmittedPoint[] {
  return omittedByFlow.get(flow)?.() ?? [];
}

function polesAt(entry: FamilyEntry, point: FamilyPoint, s: Q | null, poleSources: (flow: DerivedFlow<Expression>) => PoleSource[]): OmittedPoint[] {
  entry.poles ??= denominatorsInN(poleSources(entry.flow));
  const byPoint = new Map<string, Poly>();
  for (const pole of entry.poles) if (!byPoint.has(pole.point) && vanishesAt(pole.factor, point.N, s)) byPoint.set(pole.point, pole.factor);
  return [...byPoint.entries()].map(([name, factor]) => {
    const N = qToString(point.N);
    const message = `${familyPointLabel(point)}: the fixed point "${name}" is not listed at N = ${N}: its ε-series divide by ${polyToString(factor)}, which vanishes there (a pole of the family in N); the other fixed points are unaffected`;
    return { point: name, N: point.N, factor: polyToString(factor), message };
  });
}

export interface FamilyPointRequest {
  point: FamilyPoint;
  s: Q | null;
  loops: number;
  digits: number;
  /** The ε-series of the family's fixed points, to name the points with a pole at N (omitted: none named). */
  poleSources?: (flow: DerivedFlow<Expression>) => PoleSource[];
}

/**
 * A preset at a numeric N without explicit tensors: the symbolic-N family flow (derived once),
 * evaluated exactly at N — to numbers when s is given, else still symbolic in s. β is polynomial in N,
 * so every N has a flow; the fixed points with a pole at N are named by omittedFixedPoints.
 */
export function familyPointFlow(request: FamilyPointRequest): { mode: 'numeric'; flow: DerivedFlow<Real> } | { mode: 'symbolic'; flow: DerivedFlow<Expression> } {
  const { point, s, loops, digits, poleSources } = request;
  const entry = familyEntry(point.family, s, loops);
  const result = s ? { mode: 'numeric' as const, flow: flowAt(entry.flow, { s, N: point.N }, digits) } : { mode: 'symbolic' as const, flow: flowAtN(entry.flow, point.N) };
  if (poleSources) omittedByFlow.set(result.flow, () => polesAt(entry, point, s, poleSources));
  return result;
}
