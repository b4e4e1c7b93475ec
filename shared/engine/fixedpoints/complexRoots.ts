import { type DerivedFlow } from '../diagrams';
import { jacobianPolynomials } from '../flows';
import { type Complex, type ComplexReal, cabs, cadd, cmul, complexOps, csub, solveComplex, solveComplexReal } from '../linalg';
import { type CouplingPolynomial } from '../models';
import { type Real } from '../precision';

export type { ComplexReal };

type Ring = DerivedFlow<Real>['calculus']['ctx']['ring'];
const num = (x: Real): number => Number(x.toString());

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

/** Newton on the truncated β at complex couplings, in full precision. */
export function polishComplexRoot(flow: DerivedFlow<Real>, start: ComplexReal[], eps: Real): ComplexReal[] | null {
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
    const root = polishComplexRoot(flow, seed, eps);
    const upper = root ? withPositiveImaginary(flow, root) : null;
    if (upper) return upper;
  }
  return null;
}

/** The member of a conjugate pair with positive imaginary part of its first non-real coupling; null for a real root. */
function withPositiveImaginary(flow: DerivedFlow<Real>, root: ComplexReal[]): ComplexReal[] | null {
  const { ring } = flow.calculus.ctx;
  const c = complexOps(ring);
  const first = root.find((z) => Math.abs(num(z.im)) > 1e-20 * (1 + c.abs(z)));
  if (!first) return null;
  return num(first.im) > 0 ? root : root.map((z) => c.of(z.re, ring.neg(z.im)));
}

/**
 * The root of the truncated β at ε that belongs to the branch of a real ε-series (several couplings):
 * its real root at a small ε continued along a path through complex ε, which passes beside every
 * crossing and fold on the real axis, polished in full precision. Real (`complex` null) or one of a
 * conjugate pair; null when the continuation or the polish fails.
 */
export function trackedBranchRoot(flow: DerivedFlow<Real>, seriesAt: (eps: number) => number[], eps: Real): { real: Real[] | null; complex: ComplexReal[] | null } | null {
  const c = complexOps(flow.calculus.ctx.ring);
  const tracked = trackInComplexEps(flow, seriesAt, num(eps));
  const root = tracked ? polishComplexRoot(flow, tracked.map((z) => c.fromDouble(z)), eps) : null;
  if (!root) return null;
  // a real root polishes to an imaginary part at rounding level; half the working digits separate the two
  const real = root.every((z) => Math.abs(num(z.im)) <= 10 ** -Math.floor(flow.calculus.digits / 2) * (1 + c.abs(z)));
  const complex = real ? null : withPositiveImaginary(flow, root);
  return complex ? { real: null, complex } : { real: root.map((z) => z.re), complex: null };
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

/**
 * Continue the real branch of the ε-series from a small ε to the physical ε through complex ε: Euler
 * predictor along dg/dε = J⁻¹g (from ∂β/∂ε = −g), Newton corrector, a step accepted only when the
 * correction is small against the predicted move — so the path cannot slip onto a neighbouring root
 * where two branches come close (a crossing near the physical ε).
 */
function trackInComplexEps(flow: DerivedFlow<Real>, seriesAt: (eps: number) => number[], eps: number): Complex[] | null {
  const system = doubleSystem(flow);
  const size = (v: Complex[]) => Math.max(...v.map(cabs));
  for (let j = 2; j <= 12; j++) {
    const eps0 = eps / 2 ** j;
    const guess = seriesAt(eps0);
    const real = newtonDouble(system, guess.map((x) => ({ re: x, im: 0 })), { re: eps0, im: 0 }, 50);
    if (!real || real.some((z, i) => Math.abs(z.re - guess[i]) > 0.25 * Math.max(...guess.map(Math.abs)))) continue;
    let g = real;
    let t = 0;
    let dt = 1 / 64;
    const at = (u: number): Complex => ({ re: eps0 + (eps - eps0) * u, im: 0.5 * (eps - eps0) * u * (1 - u) });
    while (t < 1 && dt > 1e-7) {
      const next = Math.min(1, t + dt);
      const tangent = solveComplex(system(g, at(t)).jac, g);
      const step = csub(at(next), at(t));
      const predicted = tangent ? g.map((x, i) => cadd(x, cmul(tangent[i], step))) : g;
      const moved = newtonDouble(system, predicted, at(next), 12);
      const move = size(predicted.map((x, i) => csub(x, g[i])));
      if (moved && size(moved.map((z, i) => csub(z, predicted[i]))) <= 0.1 * move + 1e-13 * size(g)) {
        g = moved;
        t = next;
        dt = Math.min(dt * 1.5, 1 / 16);
      } else dt /= 2;
    }
    if (t >= 1) return g;
  }
  return null;
}
