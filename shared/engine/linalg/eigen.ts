import { type Real } from '../precision/real';
import { characteristicPolynomial } from './characteristic';
import { type ComplexReal, type RealRing, complexOps } from './complex';
import { type PolishedRoot, polishedPolynomialRoots } from './polynomial';

const isTriangular = <T>(a: T[][], isZero: (x: T) => boolean) => a.every((row, i) => row.every((x, j) => j >= i || isZero(x)));

/**
 * Eigenvalues of a real or complex matrix in the working precision of `ring`, with multiplicities
 * (equal diagonal entries of a triangular matrix, or multiple roots of the characteristic
 * polynomial). Real eigenvalues of a real matrix have an exactly zero imaginary part; eigenvalues
 * below `isNegligible` are exactly 0.
 */
export function eigenvaluesWithMultiplicity(ring: RealRing, a: ComplexReal[][], isNegligible: (c: Real) => boolean): PolishedRoot[] {
  const c = complexOps(ring);
  const isZeroC = (z: ComplexReal) => isNegligible(z.re) && isNegligible(z.im);
  if (a.length === 1 || isTriangular(a, isZeroC) || isTriangular(a[0].map((_, j) => a.map((row) => row[j])), isZeroC)) {
    const out: PolishedRoot[] = [];
    a.forEach((row, i) => {
      const z = c.of(isNegligible(row[i].re) ? ring.zero() : row[i].re, isNegligible(row[i].im) ? ring.zero() : row[i].im);
      const same = out.find((r) => isZeroC(c.sub(r.root, z)));
      if (same) same.multiplicity++;
      else out.push({ root: z, multiplicity: 1 });
    });
    return out;
  }
  return polishedPolynomialRoots(ring, characteristicPolynomial(c, a), isNegligible);
}

/** Every eigenvalue (repeated by multiplicity) in full precision. */
export function eigenvaluesFullPrecision(ring: RealRing, a: ComplexReal[][], isNegligible: (c: Real) => boolean): ComplexReal[] {
  return eigenvaluesWithMultiplicity(ring, a, isNegligible).flatMap((r) => Array.from({ length: r.multiplicity }, () => r.root));
}

/** A real eigenvalue (null when complex) and its algebraic multiplicity. */
export interface RealEigenvalue {
  value: Real | null;
  multiplicity: number;
}

/** Eigenvalues of a real matrix grouped by value; complex ones have value null. */
export function realEigenvalueGroups(ring: RealRing, a: Real[][], isNegligible: (c: Real) => boolean): RealEigenvalue[] {
  const c = complexOps(ring);
  return eigenvaluesWithMultiplicity(ring, a.map((row) => row.map((x) => c.of(x))), isNegligible).map((r) => ({ value: r.root.im.isZero() ? r.root.re : null, multiplicity: r.multiplicity }));
}

/** Eigenvalues of a real matrix, repeated by multiplicity: real ones in full precision, complex ones null. */
export function realEigenvalues(ring: RealRing, a: Real[][], isNegligible: (c: Real) => boolean): (Real | null)[] {
  return realEigenvalueGroups(ring, a, isNegligible).flatMap((g) => Array.from({ length: g.multiplicity }, () => g.value));
}
