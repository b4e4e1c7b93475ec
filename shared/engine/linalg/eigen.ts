import { type Real } from '../precision';
import { type CoefficientRing } from '../series';
import { type ComplexReal, type RealRing, complexOps } from './complex';
import { type PolishedRoot, polishedPolynomialRoots } from './polynomial';
import { characteristicPolynomial } from './characteristic';
import { matrixProduct, transpose } from './solve';

const isLowerTriangular = <T>(a: T[][], isZero: (x: T) => boolean) => a.every((row, i) => row.every((x, j) => j <= i || isZero(x)));

/** The diagonal of a triangular matrix (lower or upper), which holds its eigenvalues; null for any other matrix. */
export function triangularDiagonal<T>(a: T[][], isZero: (x: T) => boolean): T[] | null {
  return isLowerTriangular(a, isZero) || isLowerTriangular(transpose(a), isZero) ? a.map((row, i) => row[i]) : null;
}

/** Distinct values (equal when `same` says so), each with how often it occurs. */
export function groupWithMultiplicity<T>(values: T[], same: (a: T, b: T) => boolean): { value: T; multiplicity: number }[] {
  const groups: { value: T; multiplicity: number }[] = [];
  for (const value of values) {
    const group = groups.find((g) => same(g.value, value));
    if (group) group.multiplicity++;
    else groups.push({ value, multiplicity: 1 });
  }
  return groups;
}

/**
 * Eigenvalues over an exact ring, repeated by multiplicity: the diagonal of a triangular matrix, else
 * `known` (eigenvalues known in advance, e.g. from a symmetry) when their power sums equal the traces
 * of the powers of the matrix, Σ xᵢᵏ = tr(Aᵏ) for k = 1…n, which fixes the multiset of n eigenvalues
 * (Newton's identities); null otherwise (they are not found here).
 */
export function exactEigenvalues<C>(ring: CoefficientRing<C>, a: C[][], isZero: (c: C) => boolean, known: C[] = []): C[] | null {
  const diagonal = triangularDiagonal(a, isZero);
  if (diagonal) return diagonal;
  if (known.length !== a.length) return null;
  const sum = (values: C[]) => values.reduce((s, x) => ring.add(s, x), ring.zero());
  let power = a;
  let knownPower = known;
  for (let k = 1; k <= a.length; k++) {
    if (k > 1) {
      power = matrixProduct(ring, power, a);
      knownPower = knownPower.map((x, i) => ring.mul(x, known[i]));
    }
    if (!isZero(ring.sub(sum(knownPower), sum(power.map((row, i) => row[i]))))) return null;
  }
  return known;
}

/**
 * Eigenvalues of a real or complex matrix in the working precision of `ring`, with multiplicities
 * (equal diagonal entries of a triangular matrix, or multiple roots of the characteristic
 * polynomial). Real eigenvalues of a real matrix have an exactly zero imaginary part; eigenvalues
 * below `isNegligible` are exactly 0.
 */
export function eigenvaluesWithMultiplicity(ring: RealRing, a: ComplexReal[][], isNegligible: (c: Real) => boolean): PolishedRoot[] {
  const c = complexOps(ring);
  const isZeroC = (z: ComplexReal) => isNegligible(z.re) && isNegligible(z.im);
  const diagonal = triangularDiagonal(a, isZeroC);
  if (!diagonal) return polishedPolynomialRoots(ring, characteristicPolynomial(c, a), isNegligible);
  const cleaned = diagonal.map((z) => c.of(isNegligible(z.re) ? ring.zero() : z.re, isNegligible(z.im) ? ring.zero() : z.im));
  return groupWithMultiplicity(cleaned, (x, y) => isZeroC(c.sub(x, y))).map(({ value, multiplicity }) => ({ root: value, multiplicity }));
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
