import { type DerivedFlow } from '../diagrams';
import { exactEigenvalues, groupWithMultiplicity, matrixProduct, nullSpace, realEigenvalueGroups, realEigenvalues, solveLinear, transpose, triangularDiagonal } from '../linalg';
import { type Real } from '../precision';
import { LaurentSeries } from '../series';
import { type FlowPieces, oneLoopMatrix } from './branches';

/** The stability matrix as a series, M(ε) = ε M₁ + ε² M₂, from ∂β/∂g along the coupling series. */
export function stabilitySeriesMatrices<C>(pieces: FlowPieces<C>, series: LaurentSeries<C>[]): C[][][] {
  const { ring } = pieces.flow.calculus.ctx;
  const coefficient = (m: number) => series.map((s) => (s.order >= m ? s.coefficient(m) : ring.zero()));
  const m1 = oneLoopMatrix(pieces, coefficient(1));
  if (Math.min(...series.map((s) => s.order)) < 2) return [m1];
  const g1 = coefficient(1);
  const g2 = coefficient(2);
  const m2 = pieces.db2.map((row, i) => row.map((p, j) => ring.add(p.evaluate(g2), pieces.db3[i][j].evaluate(g1))));
  return [m1, m2];
}

export interface EigenvalueSeriesResult<C> {
  series: (LaurentSeries<C> | null)[] | null;
  notes: string[];
}

/**
 * Stability eigenvalues as ε-series by (degenerate) perturbation theory: for each eigenvalue λ of
 * M₁ with multiplicity m and right/left eigenspaces V (k×m), W (m×k), the ε² coefficients are the
 * eigenvalues of (WV)⁻¹ W M₂ V (m = 1: w M₂ v / w v). A defective λ (fewer than m eigenvectors)
 * splits as ε^{3/2}: no series. Symbolic coefficients: the eigenvalues of M₁ must be exact (triangular
 * M₁, or two couplings with the radial eigenvalue 1 and tr M₁ − 1) and those of the restricted M₂ too.
 */
export function eigenvalueSeries<C>(pieces: FlowPieces<C>, matrices: C[][][]): EigenvalueSeriesResult<C> {
  const { ring } = pieces.flow.calculus.ctx;
  const order = matrices.length;
  if (pieces.k === 1) return { series: [LaurentSeries.of(ring, 0, [ring.zero(), ...matrices.map((m) => m[0][0])], order)], notes: [] };
  const [m1, m2] = matrices;
  const groups = pieces.flow.calculus.symbolic ? exactEigenvalueGroups(pieces, m1) : (realEigenvalueGroups(numericRing(pieces), m1 as unknown as Real[][], pieces.isZero as unknown as (c: Real) => boolean) as unknown as { value: C | null; multiplicity: number }[]);
  if (!groups) return { series: null, notes: [] };
  const notes: string[] = [];
  const series: (LaurentSeries<C> | null)[] = [];
  for (const { value, multiplicity } of groups) {
    const repeat = (s: LaurentSeries<C> | null) => Array.from({ length: multiplicity }, () => s);
    if (value === null) {
      series.push(...repeat(null));
      continue;
    }
    if (!m2) {
      series.push(...repeat(LaurentSeries.of(ring, 0, [ring.zero(), value], 1)));
      continue;
    }
    const corrections = secondOrder(pieces, m1, m2, value, multiplicity);
    if (!corrections) {
      series.push(...repeat(null));
      notes.push(`a ${multiplicity}-fold one-loop stability eigenvalue has fewer eigenvectors, or its ε² splitting is not representable: no series for it`);
      continue;
    }
    series.push(...corrections.map((mu) => (mu === null ? null : LaurentSeries.of(ring, 0, [ring.zero(), value, mu], 2))));
  }
  return { series, notes };
}

const numericRing = <C>(pieces: FlowPieces<C>) => (pieces.flow as unknown as DerivedFlow<Real>).calculus.ctx.ring;

/** ε² coefficients of the eigenvalues that continue λ (m of them), or null (defective / not representable). */
function secondOrder<C>(pieces: FlowPieces<C>, m1: C[][], m2: C[][], lambda: C, m: number): (C | null)[] | null {
  const { ring } = pieces.flow.calculus.ctx;
  const { isZero, magnitude } = pieces;
  const shifted = m1.map((row, i) => row.map((x, j) => (i === j ? ring.sub(x, lambda) : x)));
  const right = nullSpace(ring, shifted, isZero, magnitude).vectors;
  const left = nullSpace(ring, transpose(shifted), isZero, magnitude).vectors;
  if (right.length !== m || left.length !== m) return null;
  const V = transpose(right);
  const overlap = matrixProduct(ring, left, V);
  const projected = matrixProduct(ring, left, matrixProduct(ring, m2, V));
  // R = (W V)⁻¹ W M₂ V, column by column
  const columns = transpose(projected).map((col) => solveLinear(ring, overlap, col, isZero, magnitude));
  if (columns.some((c) => c === null)) return null;
  const restricted = transpose(columns as C[][]);
  if (m === 1) return [restricted[0][0]];
  if (!pieces.flow.calculus.symbolic) return realEigenvalues(numericRing(pieces), restricted as unknown as Real[][], isZero as unknown as (c: Real) => boolean) as unknown as (C | null)[];
  return triangularDiagonal(restricted, isZero);
}

/**
 * Exact eigenvalues of M₁ (symbolic coefficients): the diagonal of a triangular M₁; for two couplings
 * 1 (the radial direction g₁: ∂b₂(g₁)·g₁ = 2g₁) and tr M₁ − 1, checked against the characteristic polynomial.
 */
function exactEigenvalueGroups<C>(pieces: FlowPieces<C>, m1: C[][]): { value: C | null; multiplicity: number }[] | null {
  const { ring } = pieces.flow.calculus.ctx;
  const radial = pieces.k === 2 ? [ring.one(), ring.sub(ring.add(m1[0][0], m1[1][1]), ring.one())] : [];
  const values = exactEigenvalues(ring, m1, pieces.isZero, radial);
  return values && groupWithMultiplicity(values, (a, b) => pieces.isZero(ring.sub(a, b)));
}
