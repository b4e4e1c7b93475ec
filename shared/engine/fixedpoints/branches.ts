import { type DerivedFlow } from '../diagrams';
import { jacobianPolynomials } from '../flows';
import { nullSpace, solveLinear, transpose } from '../linalg';
import { type CouplingPolynomial } from '../models';
import { type Real, EngineError } from '../precision';
import { LaurentSeries } from '../series';

/**
 * The pieces of a flow the ε-expansion of fixed points needs. With g = εx,
 * β(εx)/ε² = F(x, ε) = −x + b₂(x) + ε b₃(x) + ε² b₄(x) (b_n homogeneous of degree n; b₄ from three loops).
 */
export interface FlowPieces<C> {
  flow: DerivedFlow<C>;
  k: number;
  isZero: (c: C) => boolean;
  magnitude?: (c: C) => number;
  b2: CouplingPolynomial<C>[];
  b3: CouplingPolynomial<C>[];
  /** ∂b₂/∂g (linear) and ∂b₃/∂g (quadratic) as polynomials. */
  db2: CouplingPolynomial<C>[][];
  db3: CouplingPolynomial<C>[][];
}

const toNumber = (c: unknown): number => Number(String(c));

export function flowPieces<C>(flow: DerivedFlow<C>): FlowPieces<C> {
  const jacobian = jacobianPolynomials(flow);
  return {
    flow,
    k: flow.couplings.length,
    isZero: flow.calculus.isNegligible,
    magnitude: flow.calculus.symbolic ? undefined : (c: C) => Math.abs(toNumber(c)),
    b2: flow.beta.map((b) => b.homogeneous(2)),
    b3: flow.beta.map((b) => b.homogeneous(3)),
    db2: jacobian.map((row) => row.map((p) => p.homogeneous(1))),
    db3: jacobian.map((row) => row.map((p) => p.homogeneous(2))),
  };
}

const evaluateAll = <C>(ps: CouplingPolynomial<C>[], x: C[]) => ps.map((p) => p.evaluate(x));
const evaluateMatrix = <C>(ps: CouplingPolynomial<C>[][], x: C[]) => ps.map((row) => row.map((p) => p.evaluate(x)));

/** M₁ = ∂b₂/∂g(x₁) − 1: the one-loop stability matrix divided by ε. */
export function oneLoopMatrix<C>(pieces: FlowPieces<C>, x1: C[]): C[][] {
  const { ring } = pieces.flow.calculus.ctx;
  return evaluateMatrix(pieces.db2, x1).map((row, i) => row.map((x, j) => (i === j ? ring.sub(x, ring.one()) : x)));
}

/** How the ε-expansion of a point was obtained when its one-loop stability matrix is singular. */
export interface Degeneracy<C> {
  /**
   * 'split': the two-loop equations separate the merging points at order ε² (both listed);
   * 'not-split': they stay together at order ε²; 'fold': they separate as ±ε^{3/2} (series in √ε,
   * given through ε¹); 'complex-split': the pair is complex beyond one loop; 'one-loop': a
   * one-loop flow, nothing separates them; 'unresolved': a higher degeneracy or not representable.
   */
  kind: 'split' | 'not-split' | 'fold' | 'complex-split' | 'one-loop' | 'unresolved';
  /** The zero mode v of M₁ (the direction in which the merging points separate). */
  zeroMode: C[] | null;
  detail: string;
}

/** One fixed point grown from a one-loop root: its coupling series and how to find it at a physical ε. */
export interface Branch<C> {
  series: LaurentSeries<C>[];
  status: 'real' | 'complex' | 'degenerate';
  degeneracy?: Degeneracy<C>;
  /** Newton start at a physical ε when it is not the series value (fold: ε x₁ ± ε^{3/2} τ v + ε² z). */
  start?: (eps: Real) => Real[];
  /** Complex start (complex pairs beyond one loop): real and imaginary parts. */
  complexStart?: (eps: Real) => { re: Real[]; im: Real[] };
}

function seriesOf<C>(pieces: FlowPieces<C>, x1: C[], x2: C[] | null, x3: C[] | null = null): LaurentSeries<C>[] {
  return seriesFrom(pieces, x2 ? (x3 ? [x1, x2, x3] : [x1, x2]) : [x1]);
}

/** Coupling series g_i = Σ_m x_m,i ε^m through ε^{xs.length}. */
function seriesFrom<C>(pieces: FlowPieces<C>, xs: C[][]): LaurentSeries<C>[] {
  const { ring } = pieces.flow.calculus.ctx;
  return xs[0].map((_, i) => LaurentSeries.of(ring, 0, [ring.zero(), ...xs.map((x) => x[i])], xs.length));
}

/** A coupling polynomial evaluated on coupling series (products truncated at `order`). */
export function polynomialOnSeries<C>(p: CouplingPolynomial<C>, g: readonly LaurentSeries<C>[], order: number): LaurentSeries<C> {
  const ring = p.ring;
  let sum = LaurentSeries.of(ring, 0, [], order);
  for (const t of p.terms.values()) {
    let term = LaurentSeries.constant(ring, t.coeff, order);
    t.powers.forEach((e, k) => {
      for (let i = 0; i < e; i++) term = term.mul(g[k]).truncate(order);
    });
    sum = sum.add(term.truncate(order));
  }
  return sum;
}

/**
 * The ε^n coefficient of F(x, ε) = β(εx; ε)/ε² for x = x₁ + ε x₂ + … + ε^{n−1} x_n (xs = [x₁ … x_n],
 * x_{n+1} = 0): the right-hand side of the order-n equation M₁ x_{n+1} = −r_n. For n = 1 this is
 * b₃(x₁); for n = 2, b₂(x₂) + ∂b₃(x₁) x₂ + b₄(x₁).
 */
export function residualCoefficient<C>(pieces: FlowPieces<C>, xs: C[][], n: number): C[] {
  const { flow } = pieces;
  const { ring } = flow.calculus.ctx;
  const order = n + 2;
  const padded = [...xs, ...Array.from({ length: Math.max(0, n - xs.length) }, () => xs[0].map(() => ring.zero()))];
  const g = xs[0].map((_, i) => LaurentSeries.of(ring, 0, [ring.zero(), ...padded.map((x) => x[i])], order));
  return flow.beta.map((b, i) => {
    const value = polynomialOnSeries(b, g, order).sub(g[i].mul(LaurentSeries.variable(ring, order)).truncate(order));
    return value.order >= order ? value.coefficient(order) : ring.zero();
  });
}

/**
 * The fixed points that grow from the one-loop root x₁. One coupling: reversion of ε(g) = β(g)/g.
 * Several couplings, M₁ regular: order by order, M₁ x₂ = −b₃(x₁). M₁ singular (merging points):
 * degenerate perturbation theory (`degenerateBranches`).
 */
export function couplingBranches<C>(pieces: FlowPieces<C>, x1: C[]): Branch<C>[] {
  const { flow, isZero } = pieces;
  const { ring } = flow.calculus.ctx;
  const order = flow.loops;
  if (x1.every(isZero)) return [{ series: x1.map(() => LaurentSeries.of(ring, 0, [], order)), status: 'real' }];
  if (pieces.k === 1) {
    const c = (d: number) => flow.beta[0].homogeneous(d).terms.get(String(d))?.coeff ?? ring.zero();
    // ε(g) = β(g)/g + ε = c₂g + c₃g² + c₄g³ + …; lowest power 0 (a zero constant term): LaurentSeries.compose drops ε^lowest for lowest > 0
    const epsOfG = LaurentSeries.of(ring, 0, [ring.zero(), ...Array.from({ length: order }, (_, i) => c(i + 2))], order);
    return [{ series: [epsOfG.reversion()], status: 'real' }];
  }
  const m1 = oneLoopMatrix(pieces, x1);
  const zeroModes = nullSpace(ring, m1, isZero, pieces.magnitude);
  if (zeroModes.vectors.length === 0) {
    // order by order: M₁ x_{n+1} = −r_n(x₁ … x_n) (residualCoefficient)
    const xs: C[][] = [x1];
    while (xs.length < order) {
      const next = solveLinear(ring, m1, residualCoefficient(pieces, xs, xs.length).map((x) => ring.neg(x)), isZero, pieces.magnitude);
      if (!next) return [{ series: seriesFrom(pieces, xs), status: 'degenerate' }];
      xs.push(next);
    }
    return [{ series: seriesFrom(pieces, xs), status: 'real' }];
  }
  return degenerateBranches(pieces, x1, m1, zeroModes);
}

const dot = <C>(pieces: FlowPieces<C>, a: C[], b: C[]): C => {
  const { ring } = pieces.flow.calculus.ctx;
  return a.reduce((s, x, i) => ring.add(s, ring.mul(x, b[i])), ring.zero());
};
const apply = <C>(pieces: FlowPieces<C>, m: C[][], v: C[]): C[] => m.map((row) => dot(pieces, row, v));

/**
 * Degenerate perturbation theory at a one-loop root with a simple zero mode (M₁v = 0, wM₁ = 0).
 * Write x = x₁ + εy₁ + …; order ε: M₁y₁ = −b₃(x₁), solvable iff w·b₃(x₁) = 0.
 *  - Solvable (transcritical: the merging points both exist, e.g. O(N) and cubic at N = 4):
 *    y₁ = y_p + t v, and the order-ε² solvability condition w·[b₂(y₁) + ∂b₃(x₁) y₁] = 0 is the
 *    quadratic a t² + b t + c = 0 with a = w·b₂(v), b = w·[∂b₂(y_p) v + ∂b₃(x₁) v],
 *    c = w·[b₂(y_p) + ∂b₃(x₁) y_p]. Each real root t gives a point with couplings exact through ε².
 *  - Not solvable (a fold: the points annihilate): x = x₁ ± ε^{1/2} τ v + …, τ² = −w·b₃(x₁)/w·b₂(v).
 * y_p solves the bordered system [[M₁, wᵀ], [e_jᵀ, 0]] (y_p)_j = 0 at the free index j of v.
 * At three loops c also holds w·b₄(x₁) (c = w·r₂(y_p), residualCoefficient), and the ε³ couplings
 * x₃ = z_p + t₃ v follow from the order-ε² equation M₁x₃ = −r₂(x₁, x₂) (solvable by the choice of t)
 * and the order-ε³ solvability condition of the truncated β, w·r₃(x₁, x₂, x₃) = 0, which is linear
 * in t₃ with slope b + 2at ≠ 0 for split roots. A double root leaves t₃ undetermined (couplings through
 * ε²); where the ε² condition vanishes identically the symmetric choice v·x₃ = 0 is kept as for x₂.
 */
function degenerateBranches<C>(pieces: FlowPieces<C>, x1: C[], m1: C[][], zeroModes: { vectors: C[][]; free: number[] }): Branch<C>[] {
  const { flow, isZero, k } = pieces;
  const { ring } = flow.calculus.ctx;
  const one = (kind: Degeneracy<C>['kind'], detail: string, zeroMode: C[] | null, x2: C[] | null = null, status: Branch<C>['status'] = 'degenerate', x3: C[] | null = null): Branch<C>[] => [{ series: seriesOf(pieces, x1, x2, x3), status, degeneracy: { kind, zeroMode, detail } }];
  if (zeroModes.vectors.length > 1) return one('unresolved', `the one-loop stability matrix has a ${zeroModes.vectors.length}-fold zero eigenvalue; the ε² couplings are not determined here`, null);
  const v = zeroModes.vectors[0];
  if (flow.loops === 1) return one('one-loop', 'at one loop nothing separates them, so the point is listed once (two loops give both, with their ε² terms)', v);
  const w = nullSpace(ring, transpose(m1), isZero, pieces.magnitude).vectors[0];
  const b3 = evaluateAll(pieces.b3, x1);
  // pin (y_p)_j = 0 at the free index j of v (keeps exact roots such as t = 0 for a symmetric point), or v·y_p = 0
  const bordered = (pin: C[], r: C[]) => solveLinear(ring, [...m1.map((row, i) => [...row, w[i]]), [...pin, ring.zero()]], [...r.map((x) => ring.neg(x)), ring.zero()], isZero, pieces.magnitude);
  const particular = (pin: C[]) => bordered(pin, b3);
  const freePin = Array.from({ length: k }, (_, l) => (l === zeroModes.free[0] ? ring.one() : ring.zero()));
  const solution = particular(freePin);
  if (!solution) return one('unresolved', 'the bordered system at the zero mode is singular', v);
  const yp = solution.slice(0, k);
  const db3 = evaluateMatrix(pieces.db3, x1);
  const a = dot(pieces, w, evaluateAll(pieces.b2, v));
  if (!isZero(solution[k])) return foldBranches(pieces, x1, v, w, a);
  const b = ring.add(dot(pieces, w, apply(pieces, evaluateMatrix(pieces.db2, yp), v)), dot(pieces, w, apply(pieces, db3, v)));
  // c = w·[b₂(y_p) + ∂b₃(x₁) y_p + b₄(x₁)] (b₄ from three loops)
  const c = dot(pieces, w, residualCoefficient(pieces, [x1, yp], 2));
  const roots = quadraticRoots(pieces, a, b, c);
  const x2 = (t: C) => yp.map((y, i) => ring.add(y, ring.mul(t, v[i])));
  const add = (p: C[], t: C) => p.map((z, i) => ring.add(z, ring.mul(t, v[i])));
  // three loops: x₃ = z_p + t₃ v from M₁x₃ = −r₂ and w·r₃ = 0 (linear in t₃); `symmetric`: v·x₃ = 0 instead
  const third = (second: C[] | null, symmetric = false): C[] | null => {
    if (!second || flow.loops < 3) return null;
    try {
      const sol = bordered(symmetric ? v : freePin, residualCoefficient(pieces, [x1, second], 2));
      if (!sol || !isZero(sol[k])) return null;
      const zp = sol.slice(0, k);
      if (symmetric) return zp;
      const along = (t: C) => dot(pieces, w, residualCoefficient(pieces, [x1, second, add(zp, t)], 3));
      const alpha = along(ring.zero());
      const slope = ring.sub(along(ring.one()), alpha);
      if (isZero(slope)) return null;
      return add(zp, ring.neg(ring.mul(alpha, ring.inverse(slope))));
    } catch (e) {
      if (e instanceof EngineError) return null;
      throw e;
    }
  };
  const throughThree = (x3: C[] | null) => (flow.loops < 3 ? '' : x3 ? '; at three loops the ε³ couplings follow from the order-ε³ condition along the zero mode' : '; the ε³ couplings are not determined by the three-loop flow here (given through ε²)');
  if (roots.kind === 'unresolved') return one('unresolved', roots.detail, v);
  if (roots.kind === 'undetermined') {
    const orthogonal = particular(v);
    const second = orthogonal ? orthogonal.slice(0, k) : null;
    const x3 = third(second, true);
    const detail = `the order-ε² condition along the zero mode vanishes identically (the mode stays marginal at two loops): the ε² couplings are given with no component along it (v·x₂ = 0), which a symmetry exchanging the two sides of the zero mode selects${flow.loops >= 3 ? (x3 ? '; likewise v·x₃ = 0 at three loops' : '; the ε³ couplings are not determined here (given through ε²)') : ''}`;
    return one('not-split', detail, v, second, 'degenerate', x3);
  }
  if (roots.kind === 'double') {
    const second = x2(roots.t[0]);
    const x3 = third(second);
    return one('not-split', `the order-ε² condition along the zero mode has a double root: the points do not separate at two loops${throughThree(x3)}`, v, second, 'degenerate', x3);
  }
  if (roots.kind === 'complex') {
    const [re, im] = roots.t;
    const [X1, Y, V] = [x1, x2(re), v] as unknown as Real[][];
    const r = (flow as unknown as DerivedFlow<Real>).calculus.ctx.ring;
    const Im = im as unknown as Real;
    const degeneracy: Degeneracy<C> = { kind: 'complex-split', zeroMode: v, detail: 'the order-ε² condition along the zero mode has complex roots: beyond one loop the merging points are a complex pair' };
    return [{ series: seriesOf(pieces, x1, null), status: 'complex', degeneracy, complexStart: (eps) => ({ re: X1.map((x, i) => r.add(r.mul(eps, x), r.mul(r.mul(eps, eps), Y[i]))), im: V.map((x) => r.mul(r.mul(eps, eps), r.mul(Im, x))) }) }];
  }
  return roots.t.map((t) => {
    const x3 = third(x2(t));
    return { series: seriesOf(pieces, x1, x2(t), x3), status: 'real', degeneracy: { kind: 'split', zeroMode: v, detail: `two loops separate the points at order ε² (degenerate perturbation theory along the zero mode of the one-loop stability matrix)${throughThree(x3)}` } };
  });
}

type QuadraticRoots<C> = { kind: 'real' | 'double' | 'complex'; t: C[] } | { kind: 'unresolved'; detail: string } | { kind: 'undetermined' };

/** Roots of a t² + b t + c (numeric: quadratic formula; symbolic: only when c = 0 or a = 0, no square roots). */
function quadraticRoots<C>(pieces: FlowPieces<C>, a: C, b: C, c: C): QuadraticRoots<C> {
  const { flow, isZero } = pieces;
  const { ring } = flow.calculus.ctx;
  try {
    if (isZero(a) && isZero(b)) return isZero(c) ? { kind: 'undetermined' } : { kind: 'unresolved', detail: 'the order-ε² condition along the zero mode has no solution: the point does not continue to two loops' };
    if (isZero(a)) return { kind: 'real', t: [ring.neg(ring.mul(c, ring.inverse(b)))] };
    if (flow.calculus.symbolic) {
      if (!isZero(c)) return { kind: 'unresolved', detail: 'the ε² couplings need a square root, not representable symbolically (give N and s as numbers)' };
      if (isZero(b)) return { kind: 'double', t: [ring.zero()] };
      return { kind: 'real', t: [ring.zero(), ring.neg(ring.mul(b, ring.inverse(a)))] };
    }
    const r = ring as unknown as DerivedFlow<Real>['calculus']['ctx']['ring'];
    const [A, B, Cc] = [a, b, c] as unknown as Real[];
    const disc = r.sub(r.mul(B, B), r.scale(r.mul(A, Cc), 4n));
    const size = r.add(r.mul(B, B), r.scale(r.mul(A, Cc), 4n).abs());
    const half = r.inverse(r.scale(A, 2n));
    if (disc.abs().lte(size.times('1e-30'))) return { kind: 'double', t: [r.neg(r.mul(B, half))] as unknown as C[] };
    if (disc.isNegative()) return { kind: 'complex', t: [r.neg(r.mul(B, half)), r.mul(disc.neg().sqrt(), half).abs()] as unknown as C[] };
    const root = disc.sqrt();
    return { kind: 'real', t: [r.mul(r.add(r.neg(B), root), half), r.mul(r.sub(r.neg(B), root), half)] as unknown as C[] };
  } catch (e) {
    if (e instanceof EngineError) return { kind: 'unresolved', detail: `the ε² couplings are not representable here (${e.message})` };
    throw e;
  }
}

/** A fold: the merging points separate as x₁ ± ε^{1/2} τ v (numeric mode only). */
function foldBranches<C>(pieces: FlowPieces<C>, x1: C[], v: C[], w: C[], a: C): Branch<C>[] {
  const { flow, isZero } = pieces;
  const single = (detail: string): Branch<C>[] => [{ series: seriesOf(pieces, x1, null), status: 'degenerate', degeneracy: { kind: 'unresolved', zeroMode: v, detail } }];
  if (flow.calculus.symbolic) return single('the merging points separate as ±ε^{3/2}, a square root that is not representable symbolically (give N and s as numbers)');
  if (isZero(a)) return single('the merging points separate at a higher order than ε^{3/2}');
  const r = (flow as unknown as DerivedFlow<Real>).calculus.ctx.ring;
  const [X1, V, W] = [x1, v, w] as unknown as Real[][];
  const wb3 = W.reduce((s, x, i) => r.add(s, r.mul(x, (pieces.b3[i] as unknown as CouplingPolynomial<Real>).evaluate(X1))), r.zero());
  const tau2 = r.neg(r.mul(wb3, r.inverse(a as unknown as Real)));
  const tau = tau2.abs().sqrt();
  const point = (eps: Real, sign: 1 | -1) => X1.map((x, i) => r.add(r.mul(eps, x), r.mul(r.mul(eps, eps.sqrt()), r.mul(tau, V[i])).times(sign)));
  const detail = (complex: boolean) => `the one-loop root is a fold: w·b₃(x₁) ≠ 0, the points separate as ±ε^{3/2}·τ·v with τ² = ${tau2.toSignificantDigits(6).toString()}${complex ? ' < 0 (a complex pair for ε > 0)' : ''}; the couplings are series in √ε, given here through ε¹`;
  if (tau2.isNegative()) {
    return [{ series: seriesOf(pieces, x1, null), status: 'complex', degeneracy: { kind: 'fold', zeroMode: v, detail: detail(true) }, complexStart: (eps) => ({ re: X1.map((x) => r.mul(eps, x)), im: V.map((x) => r.mul(r.mul(eps, eps.sqrt()), r.mul(tau, x))) }) }];
  }
  return ([1, -1] as const).map((sign) => ({ series: seriesOf(pieces, x1, null), status: 'real' as const, degeneracy: { kind: 'fold' as const, zeroMode: v, detail: detail(false) }, start: (eps: Real) => point(eps, sign) }));
}
