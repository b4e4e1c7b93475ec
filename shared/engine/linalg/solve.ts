import { type CoefficientRing } from '../series';
import { type Complex, type ComplexReal, type RealRing, cabs, cdiv, cmul, complexOps, csub } from './complex';

/** What elimination needs of the coefficients: a coefficient ring, or exact rationals. */
export type EliminationArithmetic<C> = Pick<CoefficientRing<C>, 'sub' | 'mul' | 'inverse' | 'isZero'>;

/**
 * Gaussian elimination over a coefficient ring. Pivots are chosen by `magnitude` (numeric mode)
 * or as the first non-zero entry (exact mode); returns null for a singular system.
 */
export function solveLinear<C>(ring: EliminationArithmetic<C>, matrix: C[][], rhs: C[], isNegligible: (c: C) => boolean, magnitude?: (c: C) => number): C[] | null {
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

/**
 * A basis of the right null space {v : A v = 0} (reduced row echelon form; entries that
 * `isNegligible` calls zero are zero). Each basis vector has a 1 at its free column, listed in `free`.
 */
export function nullSpace<C>(ring: CoefficientRing<C>, matrix: C[][], isNegligible: (c: C) => boolean, magnitude?: (c: C) => number): { vectors: C[][]; free: number[] } {
  const rows = matrix.length;
  const cols = rows === 0 ? 0 : matrix[0].length;
  const a = matrix.map((row) => [...row]);
  const pivotColumns: number[] = [];
  let r = 0;
  for (let col = 0; col < cols && r < rows; col++) {
    let pivot = -1;
    for (let i = r; i < rows; i++) {
      if (isNegligible(a[i][col])) continue;
      if (pivot < 0 || (magnitude && magnitude(a[i][col]) > magnitude(a[pivot][col]))) pivot = i;
      if (!magnitude) break;
    }
    if (pivot < 0) continue;
    [a[r], a[pivot]] = [a[pivot], a[r]];
    const inv = ring.inverse(a[r][col]);
    a[r] = a[r].map((x) => ring.mul(x, inv));
    for (let i = 0; i < rows; i++) {
      if (i === r || isNegligible(a[i][col])) continue;
      const f = a[i][col];
      a[i] = a[i].map((x, j) => ring.sub(x, ring.mul(f, a[r][j])));
    }
    pivotColumns.push(col);
    r++;
  }
  const free = Array.from({ length: cols }, (_, j) => j).filter((j) => !pivotColumns.includes(j));
  const vectors = free.map((f) => {
    const v = Array.from({ length: cols }, (_, j) => (j === f ? ring.one() : ring.zero()));
    pivotColumns.forEach((pc, i) => (v[pc] = isNegligible(a[i][f]) ? ring.zero() : ring.neg(a[i][f])));
    return v;
  });
  return { vectors, free };
}

export const transpose = <C>(a: C[][]): C[][] => (a.length === 0 ? [] : a[0].map((_, j) => a.map((row) => row[j])));

/** A · B over a ring. */
export function matrixProduct<C>(ring: CoefficientRing<C>, a: C[][], b: C[][]): C[][] {
  return a.map((row) => b[0].map((_, j) => row.reduce((s, x, l) => ring.add(s, ring.mul(x, b[l][j])), ring.zero())));
}

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

/** Complex Gaussian elimination over a real ring (partial pivoting by magnitude). */
export function solveComplexReal(ring: RealRing, matrix: ComplexReal[][], rhs: ComplexReal[]): ComplexReal[] | null {
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
