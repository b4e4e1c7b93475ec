import { type DerivedFlow } from '../diagrams/renormalization';
import { stabilityMatrixAt, betaAt, jacobianPolynomials } from '../flows/flow';
import { type ModelSpec } from '../models/model';
import { fail } from '../precision/errors';
import { type Real, realContext } from '../precision/real';
import { LaurentSeries } from '../series/laurent';
import { type ComplexReal, complexOps, complexRootNear, complexStabilityMatrix, eigenvaluesFullPrecision } from './complexRoots';
import { type Complex, cabs, polynomialRoots, solveComplex, solveLinear } from './linear';

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
  stable: boolean | null;
  notes: string[];
  /** What a result using this point must say at its top (complex at the physical ε, a stability sign that depends on resummation, …). */
  caveats?: FixedPointCaveat[];
}

export interface FixedPointCaveat {
  kind: 'complex-at-eps' | 'stability-sign-disagrees' | 'degenerate-one-loop' | 'complex-one-loop';
  message: string;
}

const toNumber = (c: unknown): number => Number(String(c));

/** Pivot size below which the one-loop stability matrix counts as singular (merging fixed points). */
const SINGULAR_PIVOT = 1e-20;

/** Solutions of the one-loop condition beta⁽²⁾(g₁) = g₁ (the ε¹ coefficients of the couplings). */
function oneLoopRootsSingle<C>(flow: DerivedFlow<C>): C[][] {
  const { ring } = flow.calculus.ctx;
  const c2 = flow.beta[0].homogeneous(2).terms.get('2')?.coeff;
  if (!c2 || flow.calculus.isNegligible(c2)) return [[ring.zero()]];
  return [[ring.zero()], [ring.inverse(c2)]];
}

/**
 * Exact one-loop roots of several couplings when every beta_i⁽²⁾ is divisible by g_i (as for the
 * O(N), cubic and decoupled structures): beta_i⁽²⁾ = g_i Σ_j L_ij g_j, so on each subset S of
 * non-zero couplings the roots solve the linear system L_SS g_S = 1 — rational in N and s-free.
 * Returns null when the structure does not hold (the roots are then not rational in general).
 */
export function oneLoopRootsFactored<C>(flow: DerivedFlow<C>): C[][] | null {
  const { ring } = flow.calculus.ctx;
  const k = flow.couplings.length;
  const L: C[][] = Array.from({ length: k }, () => Array.from({ length: k }, () => ring.zero()));
  for (let i = 0; i < k; i++) {
    for (const t of flow.beta[i].homogeneous(2).terms.values()) {
      if (t.powers[i] === 0) return null;
      const j = t.powers.findIndex((p, l) => (l === i ? p === 2 : p === 1));
      L[i][j] = ring.add(L[i][j], t.coeff);
    }
  }
  const roots: C[][] = [];
  for (let mask = 0; mask < 2 ** k; mask++) {
    const subset = Array.from({ length: k }, (_, i) => i).filter((i) => mask & (1 << i));
    const g = Array.from({ length: k }, () => ring.zero());
    if (subset.length > 0) {
      const solution = solveLinear(ring, subset.map((i) => subset.map((j) => L[i][j])), subset.map(() => ring.one()), flow.calculus.isNegligible);
      if (!solution || solution.some((x) => flow.calculus.isNegligible(x))) continue;
      subset.forEach((i, r) => (g[i] = solution[r]));
    }
    roots.push(g);
  }
  return roots;
}

function seededStarts(k: number, scale: number): Complex[][] {
  let seed = 12345;
  const next = () => {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    return seed / 2147483648 - 0.5;
  };
  return Array.from({ length: 96 }, () => Array.from({ length: k }, () => ({ re: 4 * scale * next(), im: 2 * scale * next() })));
}

/** All one-loop roots of a multi-coupling flow: complex Newton from many starts (double precision). */
function oneLoopRootsNumeric(flow: DerivedFlow<Real>): Complex[][] {
  const k = flow.couplings.length;
  const quadratic = flow.beta.map((b) => b.homogeneous(2));
  const coeff = (c: Real) => toNumber(c);
  const value = (g: Complex[]) =>
    quadratic.map((p, i) => {
      let s: Complex = { re: -g[i].re, im: -g[i].im };
      for (const t of p.terms.values()) {
        let term: Complex = { re: coeff(t.coeff), im: 0 };
        t.powers.forEach((e, j) => {
          for (let r = 0; r < e; r++) term = { re: term.re * g[j].re - term.im * g[j].im, im: term.re * g[j].im + term.im * g[j].re };
        });
        s = { re: s.re + term.re, im: s.im + term.im };
      }
      return s;
    });
  const jac = (g: Complex[]) =>
    quadratic.map((p, i) =>
      flow.couplings.map((_, j) => {
        let s: Complex = { re: i === j ? -1 : 0, im: 0 };
        for (const t of p.derivative(j).terms.values()) {
          let term: Complex = { re: coeff(t.coeff), im: 0 };
          t.powers.forEach((e, l) => {
            for (let r = 0; r < e; r++) term = { re: term.re * g[l].re - term.im * g[l].im, im: term.re * g[l].im + term.im * g[l].re };
          });
          s = { re: s.re + term.re, im: s.im + term.im };
        }
        return s;
      }),
    );
  const largest = Math.max(...quadratic.flatMap((p) => [...p.terms.values()].map((t) => Math.abs(coeff(t.coeff)))), 1e-30);
  const roots: Complex[][] = [[...Array(k)].map(() => ({ re: 0, im: 0 }))];
  for (const start of seededStarts(k, 1 / largest)) {
    let g = start;
    for (let iter = 0; iter < 100; iter++) {
      const step = solveComplex(jac(g), value(g));
      if (!step) break;
      g = g.map((x, i) => ({ re: x.re - step[i].re, im: x.im - step[i].im }));
      if (Math.max(...step.map(cabs)) < 1e-14 * (1 + Math.max(...g.map(cabs)))) break;
    }
    if (Math.max(...value(g).map(cabs)) > 1e-10 / largest) continue;
    const cleaned = g.map((x) => ({ re: x.re, im: Math.abs(x.im) < 1e-9 / largest ? 0 : x.im }));
    if (!roots.some((r) => r.every((x, i) => cabs({ re: x.re - cleaned[i].re, im: x.im - cleaned[i].im }) < 1e-7 / largest))) roots.push(cleaned);
    if (roots.length === 2 ** k) break;
  }
  return roots;
}

/** Newton polish of a real one-loop root in full precision. */
function polishOneLoop(flow: DerivedFlow<Real>, start: number[]): Real[] {
  const { ring } = flow.calculus.ctx;
  let g = start.map((x) => ring.fromRational(BigInt(Math.round(x * 1e15)), 10n ** 15n));
  const quadratic = flow.beta.map((b) => b.homogeneous(2));
  for (let iter = 0; iter < 200; iter++) {
    const f = quadratic.map((p, i) => ring.sub(p.evaluate(g), g[i]));
    const j = quadratic.map((p, i) => flow.couplings.map((_, l) => (i === l ? ring.sub(p.derivative(l).evaluate(g), ring.one()) : p.derivative(l).evaluate(g))));
    const step = solveLinear(ring, j, f, (c) => c.isZero(), (c) => Math.abs(toNumber(c)));
    if (!step) break;
    g = g.map((x, i) => ring.sub(x, step[i]));
    if (step.every((s) => flow.calculus.isNegligible(s))) break;
  }
  // a merging (double) root converges only linearly: components at rounding level are zero
  const size = Math.max(...g.map((x) => Math.abs(toNumber(x))));
  return g.map((x) => (Math.abs(toNumber(x)) < 1e-30 * size ? ring.zero() : x));
}

interface SeriesOutcome<C> {
  series: LaurentSeries<C>[];
  degenerate: boolean;
}

/**
 * g(ε) through ε^loops. One coupling: ε = beta(g)/g is reverted, g(ε) = reversion of the series
 * ε(g). Several couplings: order by order, (J₁ − 1) g₂ = −beta⁽³⁾(g₁).
 */
function couplingSeries<C>(flow: DerivedFlow<C>, g1: C[], magnitude?: (c: C) => number): SeriesOutcome<C> {
  const { ring } = flow.calculus.ctx;
  const order = flow.loops;
  const isZero = flow.calculus.isNegligible;
  if (g1.every(isZero)) return { series: g1.map(() => LaurentSeries.of(ring, 0, [], order)), degenerate: false };
  if (flow.couplings.length === 1) {
    const c = (d: number) => flow.beta[0].homogeneous(d).terms.get(String(d))?.coeff ?? ring.zero();
    // lowest power 0 (a zero constant term): LaurentSeries.compose drops ε^lowest for lowest > 0
    const epsOfG = LaurentSeries.of(ring, 0, [ring.zero(), c(2), c(3)].slice(0, order + 1), order);
    return { series: [epsOfG.reversion()], degenerate: false };
  }
  const series = (g2: C[] | null) => g1.map((x, i) => LaurentSeries.of(ring, 0, order === 1 ? [ring.zero(), x] : [ring.zero(), x, g2 ? g2[i] : ring.zero()], g2 || order === 1 ? order : 1));
  if (order === 1) return { series: series(null), degenerate: false };
  const jacobian = jacobianPolynomials(flow);
  const m1 = jacobian.map((row, i) => row.map((p, j) => (i === j ? ring.sub(p.homogeneous(1).evaluate(g1), ring.one()) : p.homogeneous(1).evaluate(g1))));
  const rhs = flow.beta.map((b) => ring.neg(b.homogeneous(3).evaluate(g1)));
  const nearlySingular = magnitude ? (c: C) => magnitude(c) < SINGULAR_PIVOT : isZero;
  const g2 = solveLinear(ring, m1, rhs, nearlySingular, magnitude);
  return { series: series(g2), degenerate: g2 === null };
}

function coefficientVector<C>(series: LaurentSeries<C>[], m: number): C[] {
  return series.map((s) => (s.order >= m ? s.coefficient(m) : s.ring.zero()));
}

/** Stability matrix as a series, M(ε) = ε M₁ + ε² M₂, from ∂beta/∂g at g(ε). */
function stabilitySeriesMatrices<C>(flow: DerivedFlow<C>, series: LaurentSeries<C>[], order: number): C[][][] {
  const { ring } = flow.calculus.ctx;
  const g1 = coefficientVector(series, 1);
  const jacobian = jacobianPolynomials(flow);
  const m1 = jacobian.map((row, i) => row.map((p, j) => (i === j ? ring.sub(p.homogeneous(1).evaluate(g1), ring.one()) : p.homogeneous(1).evaluate(g1))));
  if (order === 1) return [m1];
  const g2 = coefficientVector(series, 2);
  const m2 = jacobian.map((row) => row.map((p) => ring.add(p.homogeneous(1).evaluate(g2), p.homogeneous(2).evaluate(g1))));
  return [m1, m2];
}

/** Eigenvalue series of a single coupling, or of several couplings by first-order perturbation theory (numeric). */
function eigenvalueSeries<C>(flow: DerivedFlow<C>, matrices: C[][][]): (LaurentSeries<C> | null)[] | null {
  const { ring } = flow.calculus.ctx;
  const order = matrices.length;
  if (flow.couplings.length === 1) return [LaurentSeries.of(ring, 0, [ring.zero(), ...matrices.map((m) => m[0][0])], order)];
  if (!flow.calculus.symbolic) return numericEigenvalueSeries(flow as unknown as DerivedFlow<Real>, matrices as unknown as Real[][][]) as unknown as (LaurentSeries<C> | null)[];
  return exactEigenvalueSeries(flow, matrices);
}

/**
 * Exact eigenvalue series (symbolic coefficients): triangular M₁ and M₂ give the diagonal; for two
 * couplings the one-loop eigenvalues are 1 (the radial direction g₁: ∂beta⁽²⁾(g₁)·g₁ = 2g₁) and
 * tr M₁ − 1, and the ε² coefficients follow from perturbation theory with the exact left and right
 * eigenvectors, μ = w M₂ v / (w v). Otherwise null (the eigenvalues are not rational in N).
 */
function exactEigenvalueSeries<C>(flow: DerivedFlow<C>, matrices: C[][][]): (LaurentSeries<C> | null)[] | null {
  const { ring } = flow.calculus.ctx;
  const zero = flow.calculus.isNegligible;
  const k = flow.couplings.length;
  const order = matrices.length;
  const series = (coeffs: C[]) => LaurentSeries.of(ring, 0, [ring.zero(), ...coeffs], order);
  const lower = (m: C[][]) => m.every((row, i) => row.every((x, j) => j <= i || zero(x)));
  const upper = (m: C[][]) => m.every((row, i) => row.every((x, j) => j >= i || zero(x)));
  if (matrices.every(lower) || matrices.every(upper)) return Array.from({ length: k }, (_, i) => series(matrices.map((m) => m[i][i])));
  if (k !== 2) return null;
  const [m1, m2] = matrices;
  const trace = ring.add(m1[0][0], m1[1][1]);
  const lambdas = [ring.one(), ring.sub(trace, ring.one())];
  // check: det(M₁ − λ) = 0 for both (the radial eigenvalue is exact at one loop)
  const det = (l: C) => ring.sub(ring.mul(ring.sub(m1[0][0], l), ring.sub(m1[1][1], l)), ring.mul(m1[0][1], m1[1][0]));
  if (!lambdas.every((l) => zero(det(l)))) return null;
  if (zero(ring.sub(lambdas[0], lambdas[1]))) return null;
  return lambdas.map((lambda) => {
    if (!m2) return series([lambda]);
    const a = ring.sub(m1[0][0], lambda);
    const b = m1[0][1];
    const c = m1[1][0];
    const d = ring.sub(m1[1][1], lambda);
    const right = zero(a) && zero(b) ? [ring.neg(d), c] : [ring.neg(b), a];
    const left = zero(a) && zero(c) ? [ring.neg(d), b] : [ring.neg(c), a];
    const den = ring.add(ring.mul(left[0], right[0]), ring.mul(left[1], right[1]));
    if (zero(den)) return null;
    let num = ring.zero();
    for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) num = ring.add(num, ring.mul(ring.mul(left[i], m2[i][j]), right[j]));
    return series([lambda, ring.mul(num, ring.inverse(den))]);
  });
}

function numericEigenvalueSeries(flow: DerivedFlow<Real>, [m1, m2]: Real[][][]): (LaurentSeries<Real> | null)[] {
  const { ring } = flow.calculus.ctx;
  const k = m1.length;
  const lambdas = realEigenvalues(ring, m1, flow.calculus.isNegligible);
  // M₁ = λ·1 (fully degenerate, e.g. decoupled copies of one model): the ε² coefficients are the eigenvalues of M₂
  const scalar = m1.every((row, i) => row.every((x, j) => flow.calculus.isNegligible(i === j ? ring.sub(x, m1[0][0]) : x)));
  if (scalar && m2) return realEigenvalues(ring, m2, flow.calculus.isNegligible).map((mu) => (mu === null ? null : LaurentSeries.of(ring, 0, [ring.zero(), m1[0][0], mu], 2)));
  return lambdas.map((lambda, idx) => {
    if (lambda === null) return null;
    if (!m2) return LaurentSeries.of(ring, 0, [ring.zero(), lambda], 1);
    const shifted = m1.map((row, i) => row.map((x, j) => (i === j ? ring.sub(x, lambda) : x)));
    const repeated = lambdas.some((other, j) => j !== idx && other !== null && flow.calculus.isNegligible(ring.sub(other, lambda)));
    const m2Zero = m2.every((row) => row.every((x) => flow.calculus.isNegligible(x)));
    if (m2Zero) return LaurentSeries.of(ring, 0, [ring.zero(), lambda, ring.zero()], 2);
    if (repeated) return null;
    const right = nullVector(ring, shifted, flow.calculus.isNegligible);
    const left = nullVector(ring, shifted[0].map((_, j) => shifted.map((row) => row[j])), flow.calculus.isNegligible);
    if (!right || !left) return null;
    let num = ring.zero();
    let den = ring.zero();
    for (let i = 0; i < k; i++) {
      den = ring.add(den, ring.mul(left[i], right[i]));
      for (let j = 0; j < k; j++) num = ring.add(num, ring.mul(ring.mul(left[i], m2[i][j]), right[j]));
    }
    return LaurentSeries.of(ring, 0, [ring.zero(), lambda, ring.mul(num, ring.inverse(den))], 2);
  });
}

/** A vector v with A v = 0 for a singular A (one component fixed to 1). */
function nullVector(ring: DerivedFlow<Real>['calculus']['ctx']['ring'], a: Real[][], isZero: (c: Real) => boolean): Real[] | null {
  const k = a.length;
  for (let fixed = 0; fixed < k; fixed++) {
    const rows = a.slice(0, k).map((row) => row.filter((_, j) => j !== fixed));
    const rhs = a.map((row) => ring.neg(row[fixed]));
    for (let drop = 0; drop < k; drop++) {
      const sub = rows.filter((_, i) => i !== drop);
      const subRhs = rhs.filter((_, i) => i !== drop);
      const solution = solveLinear(ring, sub, subRhs, isZero, (c) => Math.abs(toNumber(c)));
      if (!solution) continue;
      const v = [...solution.slice(0, fixed), ring.one(), ...solution.slice(fixed)];
      const residual = a.map((row) => row.reduce((s, x, j) => ring.add(s, ring.mul(x, v[j])), ring.zero()));
      if (residual.every((r) => Math.abs(toNumber(r)) < 1e-20)) return v;
    }
  }
  return null;
}

/** Characteristic polynomial by Faddeev–LeVerrier: coefficients c_0..c_k of det(x − A). */
function characteristicPolynomial(ring: DerivedFlow<Real>['calculus']['ctx']['ring'], a: Real[][]): Real[] {
  const k = a.length;
  const coeffs: Real[] = new Array(k + 1);
  coeffs[k] = ring.one();
  const times = (x: Real[][], y: Real[][]) => x.map((row) => y[0].map((_, j) => row.reduce((s, v, l) => ring.add(s, ring.mul(v, y[l][j])), ring.zero())));
  let m: Real[][] = a.map((row) => row.map(() => ring.zero()));
  for (let step = 1; step <= k; step++) {
    // M_m = A M_{m−1} + c_{k−m+1} I;  c_{k−m} = −tr(A M_m)/m
    m = times(a, m).map((row, i) => row.map((x, j) => (i === j ? ring.add(x, coeffs[k - step + 1]) : x)));
    const am = times(a, m);
    let trace = ring.zero();
    for (let i = 0; i < k; i++) trace = ring.add(trace, am[i][i]);
    coeffs[k - step] = ring.scale(trace, -1n, BigInt(step));
  }
  return coeffs;
}

/** Eigenvalues: real ones polished to full precision, complex ones (null here) reported separately. */
export function realEigenvalues(ring: DerivedFlow<Real>['calculus']['ctx']['ring'], a: Real[][], isZero: (c: Real) => boolean): (Real | null)[] {
  if (a.length === 1) return [a[0][0]];
  const triangular = (t: Real[][]) => t.every((row, i) => row.every((x, j) => j >= i || isZero(x)));
  if (triangular(a) || triangular(a[0].map((_, j) => a.map((row) => row[j])))) return a.map((row, i) => row[i]);
  const p = characteristicPolynomial(ring, a);
  const approx = polynomialRoots(p.map(toNumber));
  return approx.map((z) => {
    if (Math.abs(z.im) > 1e-9 * (1 + Math.abs(z.re))) return null;
    let x = ring.fromRational(BigInt(Math.round(z.re * 1e15)), 10n ** 15n);
    for (let iter = 0; iter < 100; iter++) {
      let value = ring.zero();
      let slope = ring.zero();
      for (let c = p.length - 1; c >= 0; c--) {
        slope = ring.add(ring.mul(slope, x), value);
        value = ring.add(ring.mul(value, x), p[c]);
      }
      if (isZero(slope)) break;
      const step = ring.mul(value, ring.inverse(slope));
      x = ring.sub(x, step);
      if (isZero(step)) break;
    }
    return x;
  });
}

export function complexEigenvalues(a: number[][]): Complex[] {
  const k = a.length;
  const scale = Math.max(...a.flatMap((row) => row.map(Math.abs)), 1e-300);
  const triangular = (t: number[][]) => t.every((row, i) => row.every((x, j) => j >= i || Math.abs(x) < 1e-25 * scale));
  if (k === 1 || triangular(a) || triangular(a[0].map((_, j) => a.map((row) => row[j])))) return a.map((row, i) => ({ re: row[i], im: 0 }));
  if (k === 2) {
    const half = (a[0][0] + a[1][1]) / 2;
    const disc = half * half - (a[0][0] * a[1][1] - a[0][1] * a[1][0]);
    const root = Math.sqrt(Math.abs(disc));
    return disc >= 0 ? [{ re: half + root, im: 0 }, { re: half - root, im: 0 }] : [{ re: half, im: root }, { re: half, im: -root }];
  }
  const R = realContext(40);
  const ring = { zero: () => new R(0), one: () => new R(1), add: (x: Real, y: Real) => x.plus(y), sub: (x: Real, y: Real) => x.minus(y), mul: (x: Real, y: Real) => x.times(y), scale: (x: Real, n: bigint, d = 1n) => x.times(n.toString()).div(d.toString()) };
  const p = characteristicPolynomial(ring as never, a.map((row) => row.map((x) => new R(x))));
  return polynomialRoots(p.map(toNumber));
}

/** Accept a root only on the branch it was started from (not, e.g., the Gaussian point). */
function isNear(g: Real[], start: Real[]): boolean {
  const size = Math.max(...start.map((x) => Math.abs(toNumber(x))));
  return g.every((x, i) => Math.abs(toNumber(x) - toNumber(start[i])) <= 0.5 * size + 1e-30);
}

function newtonRoot(flow: DerivedFlow<Real>, start: Real[], eps: Real): Real[] | null {
  const { ring } = flow.calculus.ctx;
  let g = start;
  for (let iter = 0; iter < 80; iter++) {
    const f = betaAt(flow, g, eps);
    const step = solveLinear(ring, stabilityMatrixAt(flow, g, eps), f, (c) => c.isZero(), (c) => Math.abs(toNumber(c)));
    if (!step) return null;
    g = g.map((x, i) => ring.sub(x, step[i]));
    if (g.some((x) => !x.isFinite() || x.abs().gt(1e6))) return null;
    if (step.every((s) => flow.calculus.isNegligible(s))) return isNear(g, start) ? g : null;
  }
  return null;
}

export interface FixedPointOptions<C> {
  /** Physical ε = 2s − d (numeric mode); null for series only. */
  eps: C | null;
}

export function findFixedPoints<C>(spec: ModelSpec, flow: DerivedFlow<C>, options: FixedPointOptions<C>): FixedPoint<C>[] {
  const numeric = !flow.calculus.symbolic;
  const k = flow.couplings.length;
  const factored = k > 1 && !numeric ? oneLoopRootsFactored(flow) : null;
  if (k > 1 && !numeric && !factored) {
    fail('not-representable', 'the one-loop fixed points of these couplings are not rational in the symbolic parameters (beta_i is not proportional to g_i); give N as a number (e.g. "N":3) and s as a number for numeric fixed points');
  }
  const magnitude = numeric ? (c: C) => Math.abs(toNumber(c)) : undefined;
  const points: FixedPoint<C>[] = [];
  const roots: { g1: C[] | null; complex?: Complex[] }[] =
    k === 1 ? oneLoopRootsSingle(flow).map((g1) => ({ g1 })) : factored ? factored.map((g1) => ({ g1 })) : oneLoopRootsNumeric(flow as unknown as DerivedFlow<Real>).map((r) => (r.every((x) => x.im === 0) ? { g1: polishOneLoop(flow as unknown as DerivedFlow<Real>, r.map((x) => x.re)) as unknown as C[] } : { g1: null, complex: r }));
  for (const root of roots) {
    if (!root.g1) {
      points.push({ name: `complex (${spec.classify((root.complex as Complex[]).map((x) => x.re))})`, status: 'complex', couplingSeries: null, eigenvalueSeries: null, couplingValues: null, eigenvalueValues: null, complexCouplings: root.complex, stable: null, notes: ['complex at one loop: not a physical fixed point'] });
      continue;
    }
    points.push(describeFixedPoint(spec, flow, root.g1, options, magnitude));
  }
  if (k > 1 && numeric && roots.length < 2 ** k) points.push(...mergedPoints(spec, points));
  return uniqueNames(points, flow.couplings);
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

/**
 * Fewer one-loop roots than the Bézout count 2^k: a root with a zero one-loop stability eigenvalue is
 * a multiple root where fixed points merge (e.g. cubic and O(N) at N = 4). Each such root is kept a
 * second time as a "degenerate" entry, named as the generic (all couplings non-zero) point.
 */
function mergedPoints<C>(spec: ModelSpec, points: FixedPoint<C>[]): FixedPoint<C>[] {
  const merged: FixedPoint<C>[] = [];
  const taken = new Set(points.map((p) => p.name));
  for (const p of points) {
    if (p.name === 'Gaussian' || !p.couplingSeries || !p.eigenvalueSeries) continue;
    const marginal = p.eigenvalueSeries.some((e) => e !== null && Math.abs(toNumber(e.coefficient(1))) < 1e-20);
    if (!marginal) continue;
    let name = spec.classify(p.couplingSeries.map(() => 1));
    if (taken.has(name)) name = `${name} (merged with ${p.name})`;
    taken.add(name);
    p.notes.push(`another fixed point (${name}) coincides with this one at one loop (zero one-loop stability eigenvalue)`);
    merged.push({ ...p, name, status: 'degenerate', notes: [`coincides with ${p.name}: a double root of the one-loop fixed-point equations (zero one-loop stability eigenvalue)`] });
  }
  return merged;
}

function describeFixedPoint<C>(spec: ModelSpec, flow: DerivedFlow<C>, g1: C[], options: FixedPointOptions<C>, magnitude?: (c: C) => number): FixedPoint<C> {
  const notes: string[] = [];
  // symbolic coefficients: their rational value when they have one (s-free one-loop roots), else 0/1
  const symbolicValue = (c: C) => {
    if (flow.calculus.isNegligible(c)) return 0;
    const r = (c as unknown as { rationalValue?: () => { num: bigint; den: bigint } | null }).rationalValue?.();
    return r ? Number(r.num) / Number(r.den) : 1;
  };
  const name = spec.classify(flow.calculus.symbolic ? g1.map(symbolicValue) : g1.map(toNumber));
  const { series, degenerate } = couplingSeries(flow, g1, magnitude);
  if (degenerate) notes.push('the one-loop stability matrix has a zero eigenvalue here: the ε² correction is not determined (fixed points merge)');
  const eigen = eigenvalueSeries(flow, stabilitySeriesMatrices(flow, series, degenerate ? 1 : flow.loops));
  let couplingValues: Real[] | null = null;
  let eigenvalueValues: Complex[] | null = null;
  let complexValues: ComplexReal[] | undefined;
  let eigenvalueFull: ComplexReal[] | undefined;
  if (options.eps !== null && !flow.calculus.symbolic) {
    const realFlow = flow as unknown as DerivedFlow<Real>;
    const eps = options.eps as unknown as Real;
    const start = (series as unknown as LaurentSeries<Real>[]).map((s) => s.evaluate(eps));
    const { ring } = realFlow.calculus.ctx;
    const c = complexOps(ring);
    couplingValues = newtonRoot(realFlow, start, eps);
    if (couplingValues) {
      eigenvalueFull = eigenvaluesFullPrecision(ring, stabilityMatrixAt(realFlow, couplingValues, eps).map((row) => row.map((x) => c.of(x))), realFlow.calculus.isNegligible);
      eigenvalueValues = eigenvalueFull.map(c.toDouble);
    } else {
      const seriesAt = (e: number) => (series as unknown as LaurentSeries<Real>[]).map((sr) => toNumber(sr.evaluate(ring.fromRational(BigInt(Math.round(e * 1e15)), 10n ** 15n))));
      complexValues = complexRootNear(realFlow, seriesAt, eps) ?? undefined;
      if (complexValues) {
        eigenvalueFull = eigenvaluesFullPrecision(ring, complexStabilityMatrix(realFlow, complexValues, eps), realFlow.calculus.isNegligible);
        eigenvalueValues = eigenvalueFull.map(c.toDouble);
        notes.push('the truncated β has no real root on this branch at the physical ε: the root is complex (given with positive imaginary part; its conjugate is a root too); the ε-series and its truncated values are real');
      } else notes.push('no root of the truncated β near the ε-series value at this ε');
    }
  }
  let stable: boolean | null = null;
  if (eigen && eigen.every((e) => e !== null) && options.eps !== null && !flow.calculus.symbolic) {
    stable = (eigen as LaurentSeries<C>[]).every((e) => toNumber(e.evaluate(options.eps as C)) > 0);
  } else if (eigenvalueValues) stable = eigenvalueValues.every((z) => z.re > 0);
  return { name, status: degenerate ? 'degenerate' : complexValues ? 'complex' : 'real', couplingSeries: series, eigenvalueSeries: eigen, couplingValues, eigenvalueValues, ...(complexValues ? { complexValues } : {}), ...(eigenvalueFull ? { eigenvalueFull } : {}), stable, notes };
}
