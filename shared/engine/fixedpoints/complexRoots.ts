import { type DerivedFlow } from '../diagrams/renormalization';
import { jacobianPolynomials } from '../flows/flow';
import { type CouplingPolynomial } from '../models/couplingPolynomial';
import { type Real } from '../precision/real';
import { type Complex, cabs, cadd, cmul, complexPolynomialRoots, csub, solveComplex } from './linear';

/** A complex number with arbitrary-precision parts. */
export interface ComplexReal {
  re: Real;
  im: Real;
}

type Ring = DerivedFlow<Real>['calculus']['ctx']['ring'];
const num = (x: Real): number => Number(x.toString());

/** Complex arithmetic over the flow's real ring. */
export function complexOps(ring: Ring) {
  const of = (re: Real, im: Real = ring.zero()): ComplexReal => ({ re, im });
  const fromDouble = (z: Complex): ComplexReal => of(ring.fromRational(BigInt(Math.round(z.re * 1e17)), 10n ** 17n), ring.fromRational(BigInt(Math.round(z.im * 1e17)), 10n ** 17n));
  const add = (a: ComplexReal, b: ComplexReal): ComplexReal => of(ring.add(a.re, b.re), ring.add(a.im, b.im));
  const sub = (a: ComplexReal, b: ComplexReal): ComplexReal => of(ring.sub(a.re, b.re), ring.sub(a.im, b.im));
  const mul = (a: ComplexReal, b: ComplexReal): ComplexReal => of(ring.sub(ring.mul(a.re, b.re), ring.mul(a.im, b.im)), ring.add(ring.mul(a.re, b.im), ring.mul(a.im, b.re)));
  const div = (a: ComplexReal, b: ComplexReal): ComplexReal => {
    const inv = ring.inverse(ring.add(ring.mul(b.re, b.re), ring.mul(b.im, b.im)));
    return of(ring.mul(ring.add(ring.mul(a.re, b.re), ring.mul(a.im, b.im)), inv), ring.mul(ring.sub(ring.mul(a.im, b.re), ring.mul(a.re, b.im)), inv));
  };
  const abs = (a: ComplexReal): number => Math.hypot(num(a.re), num(a.im));
  const toDouble = (a: ComplexReal): Complex => ({ re: num(a.re), im: num(a.im) });
  return { of, fromDouble, add, sub, mul, div, abs, toDouble, zero: () => of(ring.zero()), one: () => of(ring.one()) };
}

/** p(g) at complex couplings. */
export function evaluateComplex(ring: Ring, p: CouplingPolynomial<Real>, g: readonly ComplexReal[]): ComplexReal {
  const c = complexOps(ring);
  let sum = c.zero();
  for (const t of p.terms.values()) {
    let term = c.of(t.coeff);
    t.powers.forEach((e, j) => {
      for (let r = 0; r < e; r++) term = c.mul(term, g[j]);
    });
    sum = c.add(sum, term);
  }
  return sum;
}

/** Complex Gaussian elimination over the real ring (partial pivoting by magnitude). */
export function solveComplexReal(ring: Ring, matrix: ComplexReal[][], rhs: ComplexReal[]): ComplexReal[] | null {
  const c = complexOps(ring);
  const m = matrix.length;
  const a = matrix.map((row, i) => [...row, rhs[i]]);
  for (let col = 0; col < m; col++) {
    let pivot = col;
    for (let r = col + 1; r < m; r++) if (c.abs(a[r][col]) > c.abs(a[pivot][col])) pivot = r;
    if (c.abs(a[pivot][col]) === 0) return null;
    [a[col], a[pivot]] = [a[pivot], a[col]];
    for (let r = 0; r < m; r++) {
      if (r === col) continue;
      const f = c.div(a[r][col], a[col][col]);
      for (let k = col; k <= m; k++) a[r][k] = c.sub(a[r][k], c.mul(f, a[col][k]));
    }
  }
  return a.map((row, i) => c.div(row[m], row[i]));
}

/** β_i(g; ε) = beta_i(g) − ε g_i and its Jacobian at complex g. */
function betaAndJacobian(flow: DerivedFlow<Real>, g: ComplexReal[], eps: Real) {
  const { ring } = flow.calculus.ctx;
  const c = complexOps(ring);
  const e = c.of(eps);
  const f = flow.beta.map((b, i) => c.sub(evaluateComplex(ring, b, g), c.mul(e, g[i])));
  const jac = jacobianPolynomials(flow).map((row, i) => row.map((p, j) => (i === j ? c.sub(evaluateComplex(ring, p, g), e) : evaluateComplex(ring, p, g))));
  return { f, jac };
}

/** The stability matrix ∂β_i/∂g_j at complex couplings. */
export function complexStabilityMatrix(flow: DerivedFlow<Real>, g: ComplexReal[], eps: Real): ComplexReal[][] {
  return betaAndJacobian(flow, g, eps).jac;
}

function polish(flow: DerivedFlow<Real>, start: ComplexReal[], eps: Real): ComplexReal[] | null {
  const { ring } = flow.calculus.ctx;
  const c = complexOps(ring);
  let g = start;
  for (let iter = 0; iter < 80; iter++) {
    const { f, jac } = betaAndJacobian(flow, g, eps);
    const step = solveComplexReal(ring, jac, f);
    if (!step) return null;
    g = g.map((x, i) => c.sub(x, step[i]));
    const size = Math.max(...g.map(c.abs), 1e-300);
    if (!Number.isFinite(size) || size > 1e6) return null;
    if (step.every((s) => flow.calculus.isNegligible(s.re) && flow.calculus.isNegligible(s.im)) || Math.max(...step.map(c.abs)) < 10 ** -(flow.calculus.digits + 4) * size) return g;
  }
  return null;
}

/**
 * A complex root of the truncated β at the physical ε on the branch of a real ε-series value
 * (for when no real root exists there). One coupling: β(u)/u = −ε + c₂u + c₃u² is solved exactly
 * (quadratic formula); several couplings: the real root at a small ε (Newton from the series value)
 * is continued to the physical ε along a path through complex ε, which passes the fold where the
 * real branch ends. Both are polished in full precision. Returns the member of the conjugate pair with
 * positive imaginary part of the first non-real coupling, or null.
 */
export function complexRootNear(flow: DerivedFlow<Real>, seriesAt: (eps: number) => number[], eps: Real): ComplexReal[] | null {
  const { ring } = flow.calculus.ctx;
  const c = complexOps(ring);
  const k = flow.couplings.length;
  const seeds: ComplexReal[][] = [];
  if (k === 1) {
    const coeff = (d: number) => flow.beta[0].homogeneous(d).terms.get(String(d))?.coeff ?? ring.zero();
    const c2 = coeff(2);
    const c3 = coeff(3);
    if (flow.calculus.isNegligible(c3)) return null; // linear β/u: the root is real
    // c₃u² + c₂u − ε = 0: u = (−c₂ ± √(c₂² + 4c₃ε)) / (2c₃)
    const disc = ring.add(ring.mul(c2, c2), ring.scale(ring.mul(c3, eps), 4n));
    if (!disc.isNegative()) return null;
    const inv = ring.inverse(ring.scale(c3, 2n));
    const im = ring.mul(disc.neg().sqrt(), inv).abs();
    seeds.push([c.of(ring.mul(ring.neg(c2), inv), im)]);
  } else {
    const tracked = trackInComplexEps(flow, seriesAt, num(eps));
    if (tracked) seeds.push(tracked.map((z) => c.fromDouble(z)));
  }
  for (const seed of seeds) {
    const root = polish(flow, seed, eps);
    if (!root) continue;
    const first = root.find((z) => Math.abs(num(z.im)) > 1e-20 * (1 + c.abs(z)));
    if (!first) continue;
    return num(first.im) > 0 ? root : root.map((z) => c.of(z.re, ring.neg(z.im)));
  }
  return null;
}


/**
 * Eigenvalues of a (real or complex) matrix in full precision: characteristic polynomial by
 * Faddeev–LeVerrier over the ring, roots located in double precision and polished by Newton.
 * Real eigenvalues of a real matrix come back with an exactly zero imaginary part.
 */
export function eigenvaluesFullPrecision(ring: Ring, a: ComplexReal[][], isNegligible: (c: Real) => boolean): ComplexReal[] {
  const c = complexOps(ring);
  const k = a.length;
  const realMatrix = a.every((row) => row.every((z) => z.im.isZero()));
  const isZeroC = (z: ComplexReal) => isNegligible(z.re) && isNegligible(z.im);
  const triangular = (t: ComplexReal[][]) => t.every((row, i) => row.every((x, j) => j >= i || isZeroC(x)));
  if (k === 1 || triangular(a) || triangular(a[0].map((_, j) => a.map((row) => row[j])))) return a.map((row, i) => row[i]);
  const times = (x: ComplexReal[][], y: ComplexReal[][]) => x.map((row) => y[0].map((_, j) => row.reduce((s, v, l) => c.add(s, c.mul(v, y[l][j])), c.zero())));
  const coeffs: ComplexReal[] = new Array(k + 1);
  coeffs[k] = c.one();
  let m: ComplexReal[][] = a.map((row) => row.map(() => c.zero()));
  for (let step = 1; step <= k; step++) {
    m = times(a, m).map((row, i) => row.map((x, j) => (i === j ? c.add(x, coeffs[k - step + 1]) : x)));
    const am = times(a, m);
    let trace = c.zero();
    for (let i = 0; i < k; i++) trace = c.add(trace, am[i][i]);
    coeffs[k - step] = c.of(ring.scale(trace.re, -1n, BigInt(step)), ring.scale(trace.im, -1n, BigInt(step)));
  }
  const approx = complexPolynomialRoots(coeffs.map(c.toDouble));
  const scale = 1 + Math.max(...approx.map(cabs));
  return approx.map((z0) => {
    const realRoot = realMatrix && Math.abs(z0.im) < 1e-7 * scale;
    let z = c.fromDouble(realRoot ? { re: z0.re, im: 0 } : z0);
    for (let iter = 0; iter < 100; iter++) {
      let value = c.zero();
      let slope = c.zero();
      for (let j = k; j >= 0; j--) {
        slope = c.add(c.mul(slope, z), value);
        value = c.add(c.mul(value, z), coeffs[j]);
      }
      if (isZeroC(slope)) break;
      const step = c.div(value, slope);
      z = c.sub(z, step);
      if (realRoot) z = c.of(z.re);
      if (isZeroC(step)) break;
    }
    return z;
  });
}

/** β and its Jacobian in double precision at complex couplings and complex ε. */
function doubleSystem(flow: DerivedFlow<Real>) {
  const terms = (p: CouplingPolynomial<Real>) => [...p.terms.values()].map((t) => ({ c: num(t.coeff), powers: t.powers }));
  const beta = flow.beta.map(terms);
  const jac = jacobianPolynomials(flow).map((row) => row.map(terms));
  const value = (ts: { c: number; powers: readonly number[] }[], g: Complex[]) => {
    let s: Complex = { re: 0, im: 0 };
    for (const t of ts) {
      let term: Complex = { re: t.c, im: 0 };
      t.powers.forEach((e, j) => {
        for (let r = 0; r < e; r++) term = cmul(term, g[j]);
      });
      s = cadd(s, term);
    }
    return s;
  };
  return (g: Complex[], eps: Complex) => ({
    f: beta.map((b, i) => csub(value(b, g), cmul(eps, g[i]))),
    jac: jac.map((row, i) => row.map((p, j) => (i === j ? csub(value(p, g), eps) : value(p, g)))),
  });
}

function newtonDouble(system: ReturnType<typeof doubleSystem>, start: Complex[], eps: Complex, maxIter: number): Complex[] | null {
  let g = start;
  for (let iter = 0; iter < maxIter; iter++) {
    const { f, jac } = system(g, eps);
    const step = solveComplex(jac, f);
    if (!step) return null;
    g = g.map((x, i) => csub(x, step[i]));
    const size = 1e-300 + Math.max(...g.map(cabs));
    if (!Number.isFinite(size)) return null;
    if (Math.max(...step.map(cabs)) < 1e-13 * size) return g;
  }
  return null;
}

/** Continue the real branch of the ε-series from a small ε to the physical ε through complex ε. */
function trackInComplexEps(flow: DerivedFlow<Real>, seriesAt: (eps: number) => number[], eps: number): Complex[] | null {
  const system = doubleSystem(flow);
  for (let j = 2; j <= 12; j++) {
    const eps0 = eps / 2 ** j;
    const guess = seriesAt(eps0);
    const size = Math.max(...guess.map(Math.abs));
    const real = newtonDouble(system, guess.map((x) => ({ re: x, im: 0 })), { re: eps0, im: 0 }, 50);
    if (!real || real.some((z, i) => Math.abs(z.re - guess[i]) > 0.25 * size)) continue;
    let g = real;
    let t = 0;
    let dt = 1 / 64;
    const at = (u: number): Complex => ({ re: eps0 + (eps - eps0) * u, im: 0.5 * (eps - eps0) * u * (1 - u) });
    while (t < 1 && dt > 1e-6) {
      const next = Math.min(1, t + dt);
      const moved = newtonDouble(system, g, at(next), 12);
      if (moved && Math.max(...moved.map((z, i) => cabs(csub(z, g[i])))) < 0.2 * (1e-300 + Math.max(...g.map(cabs)))) {
        g = moved;
        t = next;
        dt = Math.min(dt * 1.5, 1 / 16);
      } else dt /= 2;
    }
    if (t >= 1) return g;
  }
  return null;
}
