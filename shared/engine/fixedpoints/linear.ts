import { type CoefficientRing } from '../series/ring';

/**
 * Gaussian elimination over a coefficient ring. Pivots are chosen by `magnitude` (numeric mode)
 * or as the first non-zero entry (exact mode); returns null for a singular system.
 */
export function solveLinear<C>(ring: CoefficientRing<C>, matrix: C[][], rhs: C[], isNegligible: (c: C) => boolean, magnitude?: (c: C) => number): C[] | null {
  const m = matrix.length;
  const a = matrix.map((row, i) => [...row, rhs[i]]);
  for (let col = 0; col < m; col++) {
    let pivot = -1;
    for (let r = col; r < m; r++) {
      if (isNegligible(a[r][col])) continue;
      if (pivot < 0 || (magnitude && magnitude(a[r][col]) > magnitude(a[pivot][col]))) pivot = r;
      if (!magnitude) break;
    }
    if (pivot < 0) return null;
    [a[col], a[pivot]] = [a[pivot], a[col]];
    const inv = ring.inverse(a[col][col]);
    for (let r = 0; r < m; r++) {
      if (r === col || ring.isZero(a[r][col])) continue;
      const f = ring.mul(a[r][col], inv);
      for (let k = col; k <= m; k++) a[r][k] = ring.sub(a[r][k], ring.mul(f, a[col][k]));
    }
  }
  return a.map((row, i) => ring.mul(row[m], ring.inverse(row[i])));
}

export interface Complex {
  re: number;
  im: number;
}

const cadd = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im });
const csub = (a: Complex, b: Complex): Complex => ({ re: a.re - b.re, im: a.im - b.im });
const cmul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const cdiv = (a: Complex, b: Complex): Complex => {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
};
export const cabs = (a: Complex): number => Math.hypot(a.re, a.im);

/** Complex Gaussian elimination (double precision) for Newton steps. */
export function solveComplex(matrix: Complex[][], rhs: Complex[]): Complex[] | null {
  const m = matrix.length;
  const a = matrix.map((row, i) => [...row, rhs[i]]);
  for (let col = 0; col < m; col++) {
    let pivot = col;
    for (let r = col + 1; r < m; r++) if (cabs(a[r][col]) > cabs(a[pivot][col])) pivot = r;
    if (cabs(a[pivot][col]) < 1e-300) return null;
    [a[col], a[pivot]] = [a[pivot], a[col]];
    for (let r = 0; r < m; r++) {
      if (r === col) continue;
      const f = cdiv(a[r][col], a[col][col]);
      for (let k = col; k <= m; k++) a[r][k] = csub(a[r][k], cmul(f, a[col][k]));
    }
  }
  return a.map((row, i) => cdiv(row[m], row[i]));
}

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

export { cadd, csub, cmul, cdiv };
