import { type DerivedFlow } from '../diagrams';
import { betaAt, omittedFixedPoints, stabilityMatrixAt } from '../flows';
import { type Complex, type ComplexReal, complexOps, eigenvaluesFullPrecision, solveLinear } from '../linalg';
import { type ModelSpec } from '../models';
import { type Real, fail } from '../precision';
import { type LaurentSeries } from '../series';
import { type Branch, type FlowPieces, couplingBranches, flowPieces } from './branches';
import { complexRootNear, complexStabilityMatrix, polishComplexRoot, trackedBranchRoot } from './complexRoots';
import { eigenvalueSeries, stabilitySeriesMatrices } from './eigenvalueSeries';
import { newtonSolve } from './newton';
import { type OneLoopRoot, oneLoopRootsFactored, oneLoopRootsNumeric, oneLoopRootsSingle } from './oneLoop';
import { type FixedPointCaveat, stabilityAt } from './stability';

export type { FixedPointCaveat };
export { oneLoopRootsFactored };

/**
 * A fixed point of the truncated flow: couplings and stability eigenvalues as ε-series at fixed s
 * (coefficient of ε^m at index m), and, at a physical ε, as numbers.
 */
export interface FixedPoint<C> {
  name: string;
  status: 'real' | 'complex' | 'degenerate';
  couplingSeries: LaurentSeries<C>[] | null;
  eigenvalueSeries: (LaurentSeries<C> | null)[] | null;
  /** Root of the truncated β at the physical ε, found by Newton from the series value. */
  couplingValues: Real[] | null;
  /** Eigenvalues of ∂β_i/∂g_j at that root (complex ones in double precision). */
  eigenvalueValues: Complex[] | null;
  complexCouplings?: Complex[];
  /** status 'complex' with a real ε-series: the complex root of the truncated β at the physical ε (one of a conjugate pair), full precision. */
  complexValues?: ComplexReal[];
  /** Stability eigenvalues at the numeric root (real or complex) in full precision. */
  eigenvalueFull?: ComplexReal[];
  /** true: IR-stable; false: unstable, or not a physical point (complex); null: undecided. */
  stable: boolean | null;
  notes: string[];
  /** What a result using this point must say at its top (complex at the physical ε, a stability sign that depends on resummation, …). */
  caveats?: FixedPointCaveat[];
}

const toNumber = (c: unknown): number => Number(String(c));

export interface FixedPointOptions<C> {
  /** Physical ε = 2s − d (numeric mode); null for series only. */
  eps: C | null;
}

function oneLoopRoots<C>(flow: DerivedFlow<C>): OneLoopRoot<C>[] {
  if (flow.couplings.length === 1) return oneLoopRootsSingle(flow).map((g1) => ({ g1 }));
  const factored = oneLoopRootsFactored(flow);
  if (factored) return factored.map((g1) => ({ g1 }));
  if (flow.calculus.symbolic) {
    fail('not-representable', 'the one-loop fixed points of these couplings are not rational in the symbolic parameters (beta_i is not proportional to g_i); give N as a number (e.g. "N":3) and s as a number for numeric fixed points');
  }
  return oneLoopRootsNumeric(flow as unknown as DerivedFlow<Real>) as unknown as OneLoopRoot<C>[];
}

export function findFixedPoints<C>(spec: ModelSpec, flow: DerivedFlow<C>, options: FixedPointOptions<C>): FixedPoint<C>[] {
  const pieces = flowPieces(flow);
  const points: FixedPoint<C>[] = [];
  const onBranches: OnBranch<C>[] = [];
  for (const root of oneLoopRoots(flow)) {
    if (!root.g1) {
      points.push(complexOneLoopPoint(spec, root.complex as Complex[]));
      continue;
    }
    const branches = couplingBranches(pieces, root.g1);
    const described = branches.map((branch, i) => describeBranch(spec, pieces, branch, branches.filter((_, j) => j !== i), options));
    described.forEach((p, i) => degeneracyCaveat(spec, pieces, p, branches[i], described.filter((_, j) => j !== i)));
    described.forEach((point, i) => onBranches.push({ point, branch: branches[i] }));
    points.push(...described);
  }
  if (options.eps !== null && !flow.calculus.symbolic) separateSharedRoots(pieces, onBranches, options.eps as unknown as Real);
  noteOmittedPoints(flow, points);
  return uniqueNames(withoutDuplicates(points, pieces), flow.couplings);
}

/** A family evaluated at a pole of one of its fixed points: that point is absent; the Gaussian point says which and why. */
function noteOmittedPoints<C>(flow: DerivedFlow<C>, points: FixedPoint<C>[]): void {
  const gaussian = points.find((p) => p.name === 'Gaussian');
  for (const omitted of omittedFixedPoints(flow as DerivedFlow<unknown>)) {
    if (gaussian && !points.some((p) => baseName(p.name) === omitted.point)) gaussian.notes.push(omitted.message);
  }
}

function complexOneLoopPoint<C>(spec: ModelSpec, g: Complex[]): FixedPoint<C> {
  const name = `complex (${spec.classify(g.map((x) => x.re))})`;
  const message = 'the one-loop fixed-point equations have only a complex solution here: not a physical fixed point (its conjugate is a solution too)';
  return { name, status: 'complex', couplingSeries: null, eigenvalueSeries: null, couplingValues: null, eigenvalueValues: null, complexCouplings: g, stable: false, notes: ['complex at one loop: not a physical fixed point'], caveats: [{ kind: 'complex-one-loop', message }] };
}

/** The name of a point: by which couplings are non-zero at ε¹, or beyond (a merging point can leave a coupling zero until ε²). */
function nameOf<C>(spec: ModelSpec, pieces: FlowPieces<C>, series: LaurentSeries<C>[]): string {
  const { isZero } = pieces;
  const value = (c: C) => {
    if (isZero(c)) return 0;
    if (!pieces.flow.calculus.symbolic) return toNumber(c);
    const r = (c as unknown as { rationalValue?: () => { num: bigint; den: bigint } | null }).rationalValue?.();
    return r ? Number(r.num) / Number(r.den) : 1;
  };
  const at = (m: number) => series.map((s) => (s.order >= m ? value(s.coefficient(m)) : 0));
  const [g1, g2] = [at(1), at(2)];
  return spec.classify(g1.map((x, i) => x + 1e-6 * g2[i]));
}

/** Accept a root on the branch it was started from: nearer its own start than a merging sibling's, and not far off. */
function onBranch(g: Real[], start: Real[], siblings: Real[][]): boolean {
  const distance = (a: Real[], b: Real[]) => Math.max(...a.map((x, i) => Math.abs(toNumber(x) - toNumber(b[i]))));
  const size = Math.max(...start.map((x) => Math.abs(toNumber(x))));
  const own = distance(g, start);
  return own <= 0.5 * size + 1e-30 && siblings.every((s) => own < distance(g, s));
}

/**
 * Newton from `start` at ε. A multiple root of the truncated β stalls at rounding level: it is
 * accepted when β vanishes there, with `accuracy` the size of the stalled steps.
 */
function newtonRoot(flow: DerivedFlow<Real>, start: Real[], eps: Real, siblings: Real[][]): { g: Real[]; accuracy: number } | null {
  const isZero = flow.calculus.isNegligible;
  const result = newtonSolve(flow.calculus.ctx.ring, (g) => ({ value: betaAt(flow, g, eps), jacobian: stabilityMatrixAt(flow, g, eps) }), start, isZero, 200);
  // a stalled iteration is a multiple root when β is small on the scale of half the working digits
  const stalledRoot = (g: Real[]) => betaAt(flow, g, eps).every((x) => x.abs().lte(10 ** -Math.floor(flow.calculus.digits / 2)));
  if (!result || !(result.converged || stalledRoot(result.root)) || !onBranch(result.root, start, siblings)) return null;
  return { g: result.root.map((x) => (isZero(x) ? flow.calculus.ctx.ring.zero() : x)), accuracy: result.converged ? 0 : 10 * result.lastStep };
}

/**
 * The real root on a branch at ε: Newton from the branch's start. A branch with merging siblings
 * (whose series values at ε may be farther apart than the roots) is continued from a small ε, where
 * the series tell the branches apart, up to ε: Euler predictor along dg/dε = J⁻¹g (from
 * ∂β/∂ε = −g), Newton corrector, a step accepted only when the correction is small against the
 * predicted move and against the siblings' separation.
 */
function continuedRoot(flow: DerivedFlow<Real>, startAt: (e: Real) => Real[], siblingsAt: (e: Real) => Real[][], eps: Real): { g: Real[]; accuracy: number } | null {
  if (siblingsAt(eps).length === 0) return newtonRoot(flow, startAt(eps), eps, []);
  const { ring } = flow.calculus.ctx;
  const isZero = flow.calculus.isNegligible;
  const at = (t: number) => ring.mul(eps, ring.fromRational(BigInt(Math.round(t * 2 ** 40)), 2n ** 40n));
  const size = (v: Real[]) => Math.max(...v.map((x) => Math.abs(toNumber(x))));
  let t = 1 / 64;
  let root = newtonRoot(flow, startAt(at(t)), at(t), siblingsAt(at(t)));
  let dt = t;
  for (let attempts = 0; root && root.accuracy === 0 && t < 1 && attempts < 200; attempts++) {
    const next = Math.min(1, t + dt);
    const tangent = solveLinear(ring, stabilityMatrixAt(flow, root.g, at(t)), root.g, (c) => c.isZero(), (c) => Math.abs(toNumber(c)));
    if (!tangent) return null;
    const move = tangent.map((x) => ring.mul(x, ring.sub(at(next), at(t))));
    const predicted = root.g.map((x, i) => ring.add(x, move[i]));
    const corrected = newtonSolve(ring, (g) => ({ value: betaAt(flow, g, at(next)), jacobian: stabilityMatrixAt(flow, g, at(next)) }), predicted, isZero, 30);
    // the correction must be small against the move and against the distance to a merging sibling
    const separation = Math.min(...siblingsAt(at(next)).map((sib) => size(sib.map((x, i) => ring.sub(x, startAt(at(next))[i])))));
    if (corrected?.converged && size(corrected.root.map((x, i) => ring.sub(x, predicted[i]))) <= 0.2 * Math.min(size(move), separation)) {
      root = { g: corrected.root, accuracy: 0 };
      t = next;
      dt = Math.min(2 * dt, 1 / 8);
    } else if ((dt /= 2) < 1e-4) return null;
  }
  return t < 1 ? null : root;
}

const COMPLEX_ROOT_NOTE = 'the truncated β has no real root on this branch at the physical ε: the root is complex (given with positive imaginary part; its conjugate is a root too); the ε-series and its truncated values are real';

interface AtEps {
  couplingValues: Real[] | null;
  complexValues?: ComplexReal[];
  eigenvalueFull?: ComplexReal[];
  notes: string[];
}

/** The root of the truncated β at the physical ε on this branch: real by Newton, else the complex root nearby. */
function valuesAtEps<C>(pieces: FlowPieces<C>, branch: Branch<C>, siblings: Branch<C>[], eps: Real): AtEps {
  const flow = pieces.flow as unknown as DerivedFlow<Real>;
  const { ring } = flow.calculus.ctx;
  const c = complexOps(ring);
  const startOf = (b: Branch<C>, e: Real) => b.start?.(e) ?? (b.series as unknown as LaurentSeries<Real>[]).map((s) => s.evaluate(e));
  const eigenAt = (m: ComplexReal[][]) => eigenvaluesFullPrecision(ring, m, flow.calculus.isNegligible);
  if (branch.status !== 'complex') {
    const realSiblings = siblings.filter((s) => s.status !== 'complex');
    const root = continuedRoot(flow, (e) => startOf(branch, e), (e) => realSiblings.map((s) => startOf(s, e)), eps);
    if (root && root.accuracy === 0) return { couplingValues: root.g, eigenvalueFull: eigenAt(stabilityMatrixAt(flow, root.g, eps).map((row) => row.map((x) => c.of(x)))), notes: [] };
    if (root) return multipleRootValues(flow, root.g, root.accuracy, eps);
  }
  const seriesAt = (e: number) => (branch.series as unknown as LaurentSeries<Real>[]).map((sr) => toNumber(sr.evaluate(ring.fromRational(BigInt(Math.round(e * 1e15)), 10n ** 15n))));
  const seed = branch.complexStart?.(eps);
  const complexValues = (seed ? polishComplexRoot(flow, seed.re.map((re, i) => c.of(re, seed.im[i])), eps) : null) ?? complexRootNear(flow, seriesAt, eps);
  if (!complexValues) return { couplingValues: null, notes: ['no root of the truncated β near the ε-series value at this ε'] };
  return {
    couplingValues: null,
    complexValues,
    eigenvalueFull: eigenAt(complexStabilityMatrix(flow, complexValues, eps)),
    notes: [COMPLEX_ROOT_NOTE],
  };
}

/**
 * A multiple root of the truncated β at ε: couplings and stability eigenvalues are known only to
 * about `accuracy` (absolute), so they are rounded there and an eigenvalue below it is 0.
 */
function multipleRootValues(flow: DerivedFlow<Real>, g: Real[], accuracy: number, eps: Real): AtEps {
  const { ring } = flow.calculus.ctx;
  const c = complexOps(ring);
  const places = Math.max(0, Math.floor(-Math.log10(accuracy)));
  const round = (x: Real) => ring.add(ring.zero(), x.toDecimalPlaces(places));
  const couplingValues = g.map(round);
  const eigenvalueFull = eigenvaluesFullPrecision(ring, stabilityMatrixAt(flow, g, eps).map((row) => row.map((x) => c.of(x))), flow.calculus.isNegligible).map((z) => c.of(round(z.re), round(z.im)));
  const note = `the truncated β has a multiple root here: its couplings and stability eigenvalues are determined only to about ${accuracy.toPrecision(2)} at this working precision and are rounded there`;
  return { couplingValues, eigenvalueFull, notes: [note] };
}

function describeBranch<C>(spec: ModelSpec, pieces: FlowPieces<C>, branch: Branch<C>, siblings: Branch<C>[], options: FixedPointOptions<C>): FixedPoint<C> {
  const { flow } = pieces;
  const eigen = eigenvalueSeries(pieces, stabilitySeriesMatrices(pieces, branch.series));
  const point: FixedPoint<C> = { name: nameOf(spec, pieces, branch.series), status: branch.status, couplingSeries: branch.series, eigenvalueSeries: eigen.series, couplingValues: null, eigenvalueValues: null, stable: null, notes: [...eigen.notes], caveats: [] };
  if (options.eps === null || flow.calculus.symbolic) {
    if (branch.status === 'complex') point.stable = false;
    return point;
  }
  const eps = options.eps as unknown as Real;
  applyValuesAtEps(flow as unknown as DerivedFlow<Real>, point, valuesAtEps(pieces, branch, siblings, eps), eps);
  return point;
}

/**
 * A point's root at ε, its stability and caveats. The stability check (truncated series against its
 * Padé approximant, and against the eigenvalues at a real root) runs for every point: a complex point
 * is never stable, but a sign that depends on resummation is still said.
 */
function applyValuesAtEps<C>(flow: DerivedFlow<Real>, point: FixedPoint<C>, at: AtEps, eps: Real): void {
  const caveats = point.caveats as FixedPointCaveat[];
  point.notes.push(...at.notes);
  point.couplingValues = at.couplingValues;
  if (at.eigenvalueFull) {
    point.eigenvalueFull = at.eigenvalueFull;
    point.eigenvalueValues = at.eigenvalueFull.map(complexOps(flow.calculus.ctx.ring).toDouble);
  }
  const complex = !!at.complexValues || point.status === 'complex';
  const { calculus } = flow;
  const verdict = stabilityAt(point.eigenvalueSeries as unknown as (LaurentSeries<Real> | null)[] | null, complex ? null : point.eigenvalueValues, eps, calculus.isNegligible, calculus.digits);
  if (complex) {
    if (at.complexValues) point.complexValues = at.complexValues;
    point.status = 'complex';
    point.stable = false;
    caveats.push({ kind: 'complex-at-eps', message: `at ε = ${eps.toSignificantDigits(6).toString()} the truncated β has no real fixed point on this branch, only a complex pair: not a physical fixed point there, never IR-stable; results that use it evaluate its real ε-series` }, ...verdict.caveats);
    return;
  }
  point.stable = verdict.stable;
  caveats.push(...verdict.caveats);
}

interface OnBranch<C> {
  point: FixedPoint<C>;
  branch: Branch<C>;
}

const realRoot = <C>(p: FixedPoint<C>) => (p.status !== 'complex' ? p.couplingValues : null);

function sameRoot(a: Real[], b: Real[], digits: number): boolean {
  const tolerance = 10 ** -Math.floor(digits / 2);
  return a.every((x, i) => x.minus(b[i]).abs().lte(tolerance * (1 + Math.abs(toNumber(x)))));
}

/** Different one-loop couplings: points of different branches (merging siblings are told apart by continuedRoot). */
function otherBranch<C>(pieces: FlowPieces<C>, a: FixedPoint<C>, b: FixedPoint<C>): boolean {
  const { ring } = pieces.flow.calculus.ctx;
  const first = (p: FixedPoint<C>) => (p.couplingSeries as LaurentSeries<C>[]).map((s) => (s.order >= 1 ? s.coefficient(1) : ring.zero()));
  return !!a.couplingSeries && !!b.couplingSeries && first(a).some((x, i) => !pieces.isZero(ring.sub(x, first(b)[i])));
}

/**
 * Two points of different branches cannot share one root of the truncated β, yet Newton from a series
 * value can reach a neighbour's root (past a crossing of the branches, or after its own branch turned
 * complex). A branch's own root is its real root at a small ε continued through complex ε
 * (trackedBranchRoot); a point whose continuation ends elsewhere takes that root, real or complex. A
 * point whose continuation fails keeps the shared root only if it is the nearest to its series value.
 */
function separateSharedRoots<C>(pieces: FlowPieces<C>, onBranches: OnBranch<C>[], eps: Real): void {
  const flow = pieces.flow as unknown as DerivedFlow<Real>;
  const digits = flow.calculus.digits;
  const sharing = () => onBranches.filter((a) => onBranches.some((b) => b !== a && realRoot(a.point) && realRoot(b.point) && otherBranch(pieces, a.point, b.point) && sameRoot(realRoot(a.point) as Real[], realRoot(b.point) as Real[], digits)));
  const unresolved: OnBranch<C>[] = [];
  for (const entry of sharing()) {
    const seriesAt = (e: number) => (entry.branch.series as unknown as LaurentSeries<Real>[]).map((sr) => toNumber(sr.evaluate(flow.calculus.ctx.ring.fromRational(BigInt(Math.round(e * 1e15)), 10n ** 15n))));
    const own = trackedBranchRoot(flow, seriesAt, eps);
    if (!own) unresolved.push(entry);
    else if (!own.real || !sameRoot(own.real, entry.point.couplingValues as Real[], digits)) moveToOwnRoot(flow, entry.point, own, eps);
  }
  const distanceToSeries = (e: OnBranch<C>) => Math.max(...(e.point.couplingValues as Real[]).map((x, i) => Math.abs(toNumber(x) - toNumber((e.branch.series as unknown as LaurentSeries<Real>[])[i].evaluate(eps)))));
  const stillShared = sharing();
  for (const entry of unresolved.filter((e) => stillShared.includes(e))) {
    const nearer = stillShared.some((o) => o !== entry && sameRoot(o.point.couplingValues as Real[], entry.point.couplingValues as Real[], digits) && distanceToSeries(o) <= distanceToSeries(entry));
    if (nearer) clearValues(entry.point, 'Newton from the ε-series value reached the root of another fixed point, and the continuation of this branch to the physical ε failed: no root of the truncated β is given for it here');
  }
}

/** Replace a point's values at ε by its branch's own root (its former values belonged to another point). */
function moveToOwnRoot<C>(flow: DerivedFlow<Real>, point: FixedPoint<C>, own: { real: Real[] | null; complex: ComplexReal[] | null }, eps: Real): void {
  const { ring } = flow.calculus.ctx;
  const c = complexOps(ring);
  const eigenAt = (m: ComplexReal[][]) => eigenvaluesFullPrecision(ring, m, flow.calculus.isNegligible);
  const note = 'Newton from the ε-series value reached the root of another fixed point; the root given is this branch continued from a small ε';
  resetValues(point);
  if (own.complex) {
    const at = { couplingValues: null, complexValues: own.complex, eigenvalueFull: eigenAt(complexStabilityMatrix(flow, own.complex, eps)), notes: [note, COMPLEX_ROOT_NOTE] };
    applyValuesAtEps(flow, point, at, eps);
    return;
  }
  const g = (own.real as Real[]).map((x) => (flow.calculus.isNegligible(x) ? ring.zero() : x));
  applyValuesAtEps(flow, point, { couplingValues: g, eigenvalueFull: eigenAt(stabilityMatrixAt(flow, g, eps).map((row) => row.map((x) => c.of(x)))), notes: [note] }, eps);
}

/** Forget a point's values at ε, its verdict and the caveats that came with them (a one-loop degeneracy stays). */
function resetValues<C>(point: FixedPoint<C>): void {
  point.couplingValues = null;
  point.eigenvalueValues = null;
  delete point.eigenvalueFull;
  delete point.complexValues;
  point.stable = null;
  if (point.status === 'complex') point.status = 'real';
  point.caveats = (point.caveats ?? []).filter((c) => c.kind === 'degenerate-one-loop');
}

function clearValues<C>(point: FixedPoint<C>, note: string): void {
  resetValues(point);
  point.notes.push(note);
}

/** The 'degenerate-one-loop' caveat: which points merge at one loop and what was done. */
function degeneracyCaveat<C>(spec: ModelSpec, pieces: FlowPieces<C>, point: FixedPoint<C>, branch: Branch<C>, siblings: FixedPoint<C>[]): void {
  const degeneracy = branch.degeneracy;
  if (!degeneracy) return;
  const g1 = branch.series.map((s) => toNumber(s.order >= 1 ? s.coefficient(1) : 0));
  const partner = (sign: number) => (degeneracy.zeroMode && !pieces.flow.calculus.symbolic ? spec.classify(g1.map((x, i) => x + sign * 1e-6 * toNumber((degeneracy.zeroMode as C[])[i]))) : null);
  const partners = siblings.length > 0 ? siblings.map((s) => s.name) : [partner(1), partner(-1)];
  const others = [...new Set(partners.filter((n): n is string => n !== null && n !== point.name))];
  const merging = others.length > 0 ? `${point.name} and ${others.join(', ')} coincide at one loop` : `${point.name} is a multiple root at one loop`;
  const message = `${merging} (a multiple root of the one-loop fixed-point equations: the one-loop stability matrix has a zero eigenvalue); ${degeneracy.detail}`;
  (point.caveats as FixedPointCaveat[]).unshift({ kind: 'degenerate-one-loop', message });
  if (degeneracy.kind !== 'split' && point.status === 'real') point.status = 'degenerate';
}

/** Points whose coupling series (and values at ε, if any) agree to rounding are one point: keep the first, with the notes of both. */
function withoutDuplicates<C>(points: FixedPoint<C>[], pieces: FlowPieces<C>): FixedPoint<C>[] {
  const { ring } = pieces.flow.calculus.ctx;
  const sameValues = (a: FixedPoint<C>, b: FixedPoint<C>) => !a.couplingValues || !b.couplingValues || a.couplingValues.every((x, i) => pieces.isZero(ring.sub(x as unknown as C, (b.couplingValues as Real[])[i] as unknown as C)));
  const same = (a: FixedPoint<C>, b: FixedPoint<C>) => {
    if (!a.couplingSeries || !b.couplingSeries || a.status !== b.status || !sameValues(a, b)) return false;
    return a.couplingSeries.every((s, i) => {
      const t = (b.couplingSeries as LaurentSeries<C>[])[i];
      if (s.order !== t.order) return false;
      for (let m = 1; m <= s.order; m++) if (!pieces.isZero(ring.sub(s.coefficient(m), t.coefficient(m)))) return false;
      return true;
    });
  };
  const kept: FixedPoint<C>[] = [];
  for (const p of points) {
    const twin = kept.find((q) => same(p, q));
    if (twin) twin.notes.push(...p.notes.filter((n) => !twin.notes.includes(n)));
    else kept.push(p);
  }
  return kept;
}

/** The name a point was given before disambiguation ("O(2) (u only) [u+]" → "u only"), for lookups by the plain name. */
export function baseName(name: string): string {
  return name.replace(/ #\d+$/, '').replace(/ \[[^\]]*\]$/, '').replace(/^O\(\d+\) \((.*)\)$/, '$1');
}

/** Points sharing a name get the signs of their one-loop couplings appended, then an index if still equal. */
function uniqueNames<C>(points: FixedPoint<C>[], couplings: readonly string[]): FixedPoint<C>[] {
  const count = (names: string[], n: string) => names.filter((x) => x === n).length;
  const sign = (p: FixedPoint<C>, i: number): string => {
    const x = p.couplingSeries ? toNumber(p.couplingSeries[i].order >= 1 ? p.couplingSeries[i].coefficient(1) : 0) : p.complexCouplings ? p.complexCouplings[i].re : NaN;
    return !Number.isFinite(x) || Math.abs(x) < 1e-12 ? '' : `${couplings[i]}${x > 0 ? '+' : '−'}`;
  };
  let names = points.map((p) => p.name);
  names = names.map((n, j) => (count(names, n) > 1 ? `${n} [${couplings.map((_, i) => sign(points[j], i)).filter(Boolean).join(', ')}]` : n));
  const seen = new Map<string, number>();
  names = names.map((n) => {
    if (count(names, n) === 1) return n;
    const index = (seen.get(n) ?? 0) + 1;
    seen.set(n, index);
    return `${n} #${index}`;
  });
  points.forEach((p, j) => (p.name = names[j]));
  return points;
}
