import { type Real } from '../precision';
import { type Complex, type ComplexReal, type RealRing, cabs, cadd, cdiv, cmul, complexOps, csub } from './complex';

/** Roots of Σ c_k x^k with real coefficients (double precision). */
export function polynomialRoots(coeffs: number[]): Complex[] {
  return complexPolynomialRoots(coeffs.map((re) => ({ re, im: 0 })));
}

/** Roots of Σ c_k x^k with complex coefficients: Durand–Kerner in double precision. */
export function complexPolynomialRoots(coeffs: Complex[]): Complex[] {
  const n = coeffs.length - 1;
  if (n < 1) return [];
  const lead = coeffs[n];
  const cc = coeffs.map((x) => cdiv(x, lead));
  const evalAt = (z: Complex) => {
    let s: Complex = { re: 0, im: 0 };
    for (let k = n; k >= 0; k--) s = cadd(cmul(s, z), cc[k]);
    return s;
  };
  const radius = 1 + Math.max(...cc.slice(0, n).map(cabs));
  let z: Complex[] = Array.from({ length: n }, (_, k) => ({ re: radius * Math.cos((2 * Math.PI * k) / n + 0.4), im: radius * Math.sin((2 * Math.PI * k) / n + 0.4) }));
  for (let iter = 0; iter < 500; iter++) {
    let moved = 0;
    z = z.map((zi, i) => {
      let den: Complex = { re: 1, im: 0 };
      z.forEach((zj, j) => j !== i && (den = cmul(den, csub(zi, zj))));
      const step = cdiv(evalAt(zi), den);
      moved = Math.max(moved, cabs(step));
      return csub(zi, step);
    });
    if (moved < 1e-15 * radius) break;
  }
  return z;
}

/** A root in full precision with its multiplicity. */
export interface PolishedRoot {
  root: ComplexReal;
  multiplicity: number;
}

/**
 * The roots of Σ c_k x^k in the working precision of `ring`, with multiplicities. Double-precision
 * roots (Durand–Kerner) that lie close together are taken as one root of multiplicity m when Newton
 * on the (m−1)-th derivative converges to a point where p, p′, …, p⁽ᵐ⁻¹⁾ all vanish (a multiple
 * root is a simple root of p⁽ᵐ⁻¹⁾, so it is found to full precision); otherwise they are polished
 * one by one. With real coefficients, roots whose imaginary part is at rounding level are real
 * (exactly zero imaginary part), and roots below `isNegligible` are exactly 0.
 */
export function polishedPolynomialRoots(ring: RealRing, coeffs: ComplexReal[], isNegligible: (c: Real) => boolean): PolishedRoot[] {
  const c = complexOps(ring);
  const realCoefficients = coeffs.every((z) => z.im.isZero());
  const approx = complexPolynomialRoots(coeffs.map(c.toDouble));
  const scale = 1 + Math.max(0, ...approx.map(cabs));
  const out: PolishedRoot[] = [];
  for (const group of clusterRoots(approx, 1e-4 * scale)) {
    const mean = { re: group.reduce((s, z) => s + z.re, 0) / group.length, im: group.reduce((s, z) => s + z.im, 0) / group.length };
    const multiple = group.length > 1 ? polishMultiple(ring, coeffs, mean, group.length, realCoefficients, isNegligible) : null;
    if (multiple) out.push({ root: multiple, multiplicity: group.length });
    else for (const z of group) out.push({ root: polishRoot(ring, coeffs, z, 0, realCoefficients, isNegligible), multiplicity: 1 });
  }
  return out;
}

function clusterRoots(roots: Complex[], tolerance: number): Complex[][] {
  const groups: Complex[][] = [];
  for (const z of roots) {
    const near = groups.find((g) => g.some((w) => cabs(csub(w, z)) < tolerance));
    if (near) near.push(z);
    else groups.push([z]);
  }
  return groups;
}

/** Coefficients of the m-th derivative. */
function derivative(ring: RealRing, coeffs: ComplexReal[], m: number): ComplexReal[] {
  const c = complexOps(ring);
  let p = coeffs;
  for (let r = 0; r < m; r++) p = p.slice(1).map((z, k) => c.scale(z, BigInt(k + 1)));
  return p;
}

function horner(ring: RealRing, coeffs: ComplexReal[], z: ComplexReal): { value: ComplexReal; slope: ComplexReal } {
  const c = complexOps(ring);
  let value = c.zero();
  let slope = c.zero();
  for (let j = coeffs.length - 1; j >= 0; j--) {
    slope = c.add(c.mul(slope, z), value);
    value = c.add(c.mul(value, z), coeffs[j]);
  }
  return { value, slope };
}

/** Newton on p⁽ᵐ⁾ from a double-precision start. */
function polishRoot(ring: RealRing, coeffs: ComplexReal[], start: Complex, m: number, realCoefficients: boolean, isNegligible: (c: Real) => boolean): ComplexReal {
  const c = complexOps(ring);
  const p = derivative(ring, coeffs, m);
  const scale = 1 + cabs(start);
  const real = realCoefficients && Math.abs(start.im) < 1e-6 * scale;
  let z = c.fromDouble(real ? { re: start.re, im: 0 } : start);
  const isZeroC = (w: ComplexReal) => isNegligible(w.re) && isNegligible(w.im);
  for (let iter = 0; iter < 200; iter++) {
    const { value, slope } = horner(ring, p, z);
    if (isZeroC(slope)) break;
    const step = c.div(value, slope);
    z = c.sub(z, step);
    if (real) z = c.of(z.re);
    if (isZeroC(step)) break;
  }
  return c.of(isNegligible(z.re) ? ring.zero() : z.re, isNegligible(z.im) ? ring.zero() : z.im);
}

/** An m-fold root near `start`, or null when p, …, p⁽ᵐ⁻¹⁾ do not all vanish there. */
function polishMultiple(ring: RealRing, coeffs: ComplexReal[], start: Complex, m: number, realCoefficients: boolean, isNegligible: (c: Real) => boolean): ComplexReal | null {
  const c = complexOps(ring);
  const z = polishRoot(ring, coeffs, start, m - 1, realCoefficients, isNegligible);
  const size = Math.max(1, ...coeffs.map(c.abs));
  for (let j = 0; j < m - 1; j++) {
    const { value } = horner(ring, derivative(ring, coeffs, j), z);
    if (!(isNegligible(ring.scale(value.re, 1n, BigInt(Math.ceil(size)))) && isNegligible(ring.scale(value.im, 1n, BigInt(Math.ceil(size)))))) return null;
  }
  return z;
}
