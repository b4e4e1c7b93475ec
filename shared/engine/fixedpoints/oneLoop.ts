import { type DerivedFlow } from '../diagrams';
import { type Complex, type RealRing, cabs, solveComplex, solveLinear } from '../linalg';
import { type Real, realContext } from '../precision';
import { numericRing } from '../series';
import { newtonSolve } from './newton';

/** A root of the one-loop condition beta⁽²⁾(g₁) = g₁ (the ε¹ coefficients of the couplings); `complex` when it is not real. */
export interface OneLoopRoot<C> {
  g1: C[] | null;
  complex?: Complex[];
}

const toNumber = (c: unknown): number => Number(String(c));

export function oneLoopRootsSingle<C>(flow: DerivedFlow<C>): C[][] {
  const { ring } = flow.calculus.ctx;
  const c2 = flow.beta[0].homogeneous(2).terms.get('2')?.coeff;
  if (!c2 || flow.calculus.isNegligible(c2)) return [[ring.zero()]];
  return [[ring.zero()], [ring.inverse(c2)]];
}

/**
 * Exact one-loop roots of several couplings when every beta_i⁽²⁾ is divisible by g_i (as for the
 * O(N), cubic and decoupled structures): beta_i⁽²⁾ = g_i Σ_j L_ij g_j, so on each subset S of
 * non-zero couplings the roots solve the linear system L_SS g_S = 1 — rational in N and s-free.
 * A solution with a zero component belongs to a smaller subset (a root where points merge).
 * Returns null when the structure does not hold (the roots are then not rational in general).
 */
export function oneLoopRootsFactored<C>(flow: DerivedFlow<C>): C[][] | null {
  const { ring } = flow.calculus.ctx;
  const k = flow.couplings.length;
  const magnitude = flow.calculus.symbolic ? undefined : (c: C) => Math.abs(toNumber(c));
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
      const solution = solveLinear(ring, subset.map((i) => subset.map((j) => L[i][j])), subset.map(() => ring.one()), flow.calculus.isNegligible, magnitude);
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

/** The one-loop condition beta⁽²⁾(g) − g and its Jacobian at complex g (double precision). */
function doubleOneLoopSystem(flow: DerivedFlow<Real>) {
  const terms = flow.beta.map((b) => [...b.homogeneous(2).terms.values()].map((t) => ({ c: toNumber(t.coeff), powers: t.powers })));
  const monomial = (c: number, powers: readonly number[], g: Complex[], skip = -1): Complex => {
    let term: Complex = { re: c, im: 0 };
    powers.forEach((e, j) => {
      for (let r = 0; r < e - (j === skip ? 1 : 0); r++) term = { re: term.re * g[j].re - term.im * g[j].im, im: term.re * g[j].im + term.im * g[j].re };
    });
    return term;
  };
  const value = (g: Complex[]) =>
    terms.map((ts, i) => ts.reduce((s, t) => {
      const m = monomial(t.c, t.powers, g);
      return { re: s.re + m.re, im: s.im + m.im };
    }, { re: -g[i].re, im: -g[i].im }));
  const jacobian = (g: Complex[]) =>
    terms.map((ts, i) => g.map((_, j) => ts.reduce((s, t) => {
      if (t.powers[j] === 0) return s;
      const m = monomial(t.c * t.powers[j], t.powers, g, j);
      return { re: s.re + m.re, im: s.im + m.im };
    }, { re: i === j ? -1 : 0, im: 0 })));
  const largest = Math.max(...terms.flatMap((ts) => ts.map((t) => Math.abs(t.c))), 1e-30);
  return { value, jacobian, largest };
}

/**
 * All one-loop roots of a multi-coupling flow whose beta⁽²⁾ is not factored: complex Newton from
 * many starts in double precision. A multiple root scatters these into a cloud of size ≈ (machine
 * ε)^{1/m} (some with small imaginary parts), so nearby roots are grouped and each group's mean is
 * polished as a real root in full precision; a group that does not polish to a real root is kept
 * as complex.
 */
export function oneLoopRootsNumeric(flow: DerivedFlow<Real>): OneLoopRoot<Real>[] {
  const k = flow.couplings.length;
  const { value, jacobian, largest } = doubleOneLoopSystem(flow);
  const found: Complex[][] = [[...Array(k)].map(() => ({ re: 0, im: 0 }))];
  for (const start of seededStarts(k, 1 / largest)) {
    let g = start;
    for (let iter = 0; iter < 100; iter++) {
      const step = solveComplex(jacobian(g), value(g));
      if (!step) break;
      g = g.map((x, i) => ({ re: x.re - step[i].re, im: x.im - step[i].im }));
      if (Math.max(...step.map(cabs)) < 1e-14 * (1 + Math.max(...g.map(cabs)))) break;
    }
    if (Math.max(...value(g).map(cabs)) <= 1e-10 / largest) found.push(g);
  }
  const distance = (a: Complex[], b: Complex[]) => Math.max(...a.map((x, i) => cabs({ re: x.re - b[i].re, im: x.im - b[i].im })));
  const groups: Complex[][][] = [];
  for (const g of found) {
    const near = groups.find((group) => distance(group[0], g) < 1e-3 / largest);
    if (near) near.push(g);
    else groups.push([g]);
  }
  const roots: OneLoopRoot<Real>[] = [];
  for (const group of groups) {
    const mean = group[0].map((_, i) => ({ re: group.reduce((s, g) => s + g[i].re, 0) / group.length, im: group.reduce((s, g) => s + g[i].im, 0) / group.length }));
    const nearlyReal = mean.every((x) => Math.abs(x.im) < 1e-3 / largest);
    const real = nearlyReal ? polishOneLoop(flow, mean.map((x) => x.re)) : null;
    if (real && !roots.some((r) => r.g1 && r.g1.every((x, i) => flow.calculus.isNegligible(x.minus(real[i]))))) roots.push({ g1: real });
    else if (!real) roots.push({ g1: null, complex: group.reduce((best, g) => (Math.max(...value(g).map(cabs)) < Math.max(...value(best).map(cabs)) ? g : best)) });
  }
  return roots;
}

/** A coefficient as the exact rational it rounds (small denominator), else unchanged: one-loop coefficients are rational. */
function rationalized(x: Real, digits: number, target: RealRing): Real {
  const [num, den] = x.toFraction(1e8);
  const R = realContext(3 * digits);
  const exact = new R(num).div(den);
  return exact.minus(x).abs().lte(new R(10).pow(-(digits - 6)).times(x.abs().plus(1))) ? target.add(target.zero(), exact) : target.add(target.zero(), x);
}

/**
 * Newton polish of a real one-loop root; null when it does not converge to a root. A root of
 * multiplicity m is determined only to (working precision)^{1/m}, so the polish runs at three times
 * the working digits with the coefficients as exact rationals, and the root is rounded back.
 */
function polishOneLoop(flow: DerivedFlow<Real>, start: number[]): Real[] | null {
  const { ring } = flow.calculus.ctx;
  const digits = flow.calculus.digits;
  const fine = numericRing(3 * digits);
  const fineZero = (c: Real) => c.abs().lte(new (realContext(3 * digits))(10).pow(-(3 * digits - 8)));
  const quadratic = flow.beta.map((b) => b.homogeneous(2).map(fine, (c) => rationalized(c, digits, fine)));
  const derivatives = quadratic.map((p) => flow.couplings.map((_, l) => p.derivative(l)));
  const system = (r: RealRing) => (g: Real[]) => ({
    value: quadratic.map((p, i) => r.sub(p.evaluate(g), g[i])),
    jacobian: derivatives.map((row, i) => row.map((p, l) => (i === l ? r.sub(p.evaluate(g), r.one()) : p.evaluate(g)))),
  });
  const result = newtonSolve(fine, system(fine), start.map((x) => fine.fromRational(BigInt(Math.round(x * 1e15)), 10n ** 15n)), fineZero, 600);
  if (!result || !result.converged) return null;
  const root = result.root.map((x) => ring.add(ring.zero(), x));
  const isZero = flow.calculus.isNegligible;
  const residual = flow.beta.map((b, i) => ring.sub(b.homogeneous(2).evaluate(root), root[i]));
  if (!residual.every(isZero)) return null;
  return root.map((x) => (isZero(x) ? ring.zero() : x));
}
