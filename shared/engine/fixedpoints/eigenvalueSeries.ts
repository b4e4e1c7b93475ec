import { type DerivedFlow } from '../diagrams';
import { jacobianPolynomials } from '../flows';
import { exactEigenvalues, groupWithMultiplicity, matrixProduct, nullSpace, realEigenvalueGroups, realEigenvalues, solveLinear, transpose, triangularDiagonal } from '../linalg';
import { type Real } from '../precision';
import { LaurentSeries } from '../series';
import { type FlowPieces, oneLoopMatrix, polynomialOnSeries } from './branches';

/**
 * The stability matrix as a series, M(ε) = ε M₁ + ε² M₂ + ε³ M₃ …, from ∂β/∂g along the coupling
 * series (through the lowest order of the coupling series).
 */
export function stabilitySeriesMatrices<C>(pieces: FlowPieces<C>, series: LaurentSeries<C>[]): C[][][] {
  const { ring } = pieces.flow.calculus.ctx;
  const coefficient = (m: number) => series.map((s) => (s.order >= m ? s.coefficient(m) : ring.zero()));
  const m1 = oneLoopMatrix(pieces, coefficient(1));
  const order = Math.min(...series.map((s) => s.order));
  if (order < 2) return [m1];
  const entries = jacobianPolynomials(pieces.flow).map((row) => row.map((p) => polynomialOnSeries(p, series, order)));
  const matrices = [m1];
  for (let m = 2; m <= order; m++) matrices.push(entries.map((row) => row.map((e) => (e.order >= m ? e.coefficient(m) : ring.zero()))));
  return matrices;
}

export interface EigenvalueSeriesResult<C> {
  series: (LaurentSeries<C> | null)[] | null;
  notes: string[];
}

/**
 * Stability eigenvalues as ε-series by (degenerate) perturbation theory of M(ε)/ε = M₁ + ε M₂ + ε² M₃.
 * For each eigenvalue λ of M₁ with multiplicity m and right/left eigenspaces V (k×m), W (m×k), the
 * effective matrix on the eigenspace is R₁ + ε R₂ with R₁ = (WV)⁻¹ W M₂ V and
 * R₂ = (WV)⁻¹ W (M₃ + M₂ S M₂) V, S the reduced resolvent (λ − M₁)⁻¹ off the eigenspace (Kato; for
 * m = 1 the usual λ₃ = w M₃ v + w M₂ S M₂ v). The ε² coefficients are the eigenvalues of R₁, the ε³
 * ones follow by the same step applied to R₁ + ε R₂. A defective λ (fewer than m eigenvectors) splits
 * as ε^{3/2}: no series. Symbolic coefficients: the eigenvalues of M₁ must be exact (triangular M₁, or
 * two couplings with the radial eigenvalue 1 and tr M₁ − 1) and those of the restricted matrices too.
 */
export function eigenvalueSeries<C>(pieces: FlowPieces<C>, matrices: C[][][]): EigenvalueSeriesResult<C> {
  const { ring } = pieces.flow.calculus.ctx;
  const order = matrices.length;
  if (pieces.k === 1) return { series: [LaurentSeries.of(ring, 0, [ring.zero(), ...matrices.map((m) => m[0][0])], order)], notes: [] };
  const m1 = matrices[0];
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
    if (order === 1) {
      series.push(...repeat(LaurentSeries.of(ring, 0, [ring.zero(), value], 1)));
      continue;
    }
    const corrections = groupCorrections(pieces, matrices, value, multiplicity);
    if (!corrections) {
      series.push(...repeat(null));
      notes.push(`a ${multiplicity}-fold one-loop stability eigenvalue has fewer eigenvectors, or its ε² splitting is not representable: no series for it`);
      continue;
    }
    for (const c of corrections) {
      if (c === null) series.push(null);
      else if (c.length < order - 1) {
        series.push(LaurentSeries.of(ring, 0, [ring.zero(), value, ...c], c.length + 1));
        notes.push(`a ${multiplicity}-fold one-loop stability eigenvalue stays degenerate at ε²: its ε³ splitting is not determined here (series through ε²)`);
      } else series.push(LaurentSeries.of(ring, 0, [ring.zero(), value, ...c], order));
    }
  }
  return { series, notes: [...new Set(notes)] };
}

const numericRing = <C>(pieces: FlowPieces<C>) => (pieces.flow as unknown as DerivedFlow<Real>).calculus.ctx.ring;

/**
 * The corrections μ₁, μ₂, … (one list per eigenvalue, m of them) of the eigenvalues of
 * A₀ + ε A₁ + ε² A₂ + … that continue the eigenvalue λ of A₀ with multiplicity m, through
 * ε^{matrices.length − 1} (at most ε²); null when λ is defective or a step is not representable.
 * A list may be shorter when a degeneracy persists (its next order is then not determined here).
 */
function groupCorrections<C>(pieces: FlowPieces<C>, matrices: C[][][], lambda: C, m: number): (C[] | null)[] | null {
  const { ring } = pieces.flow.calculus.ctx;
  const { isZero, magnitude } = pieces;
  const [a0, a1, a2] = matrices;
  const k = a0.length;
  const shifted = a0.map((row, i) => row.map((x, j) => (i === j ? ring.sub(x, lambda) : x)));
  const right = nullSpace(ring, shifted, isZero, magnitude).vectors;
  const left = nullSpace(ring, transpose(shifted), isZero, magnitude).vectors;
  if (right.length !== m || left.length !== m) return null;
  const V = transpose(right);
  const overlap = matrixProduct(ring, left, V);
  // (W V)⁻¹ W X, column by column
  const project = (x: C[][]): C[][] | null => {
    const columns = transpose(matrixProduct(ring, left, x)).map((col) => solveLinear(ring, overlap, col, isZero, magnitude));
    return columns.some((c) => c === null) ? null : transpose(columns as C[][]);
  };
  const r1 = project(matrixProduct(ring, a1, V));
  if (!r1) return null;
  let r2: C[][] | null = null;
  if (a2) {
    // Y = S Q A₁ V: (λ − A₀) y = Q c with W y = 0, from the bordered system [[λ − A₀, V], [W, 0]]
    const a1V = matrixProduct(ring, a1, V);
    const p1 = project(a1V);
    if (!p1) return null;
    const qa1V = a1V.map((row, i) => row.map((x, j) => ring.sub(x, V[i].reduce((s, vil, l) => ring.add(s, ring.mul(vil, p1[l][j])), ring.zero()))));
    const border = [...shifted.map((row, i) => [...row.map((x) => ring.neg(x)), ...V[i]]), ...left.map((w) => [...w, ...Array.from({ length: m }, () => ring.zero())])];
    const ys: C[][] = [];
    for (let j = 0; j < m; j++) {
      const y = solveLinear(ring, border, [...qa1V.map((row) => row[j]), ...Array.from({ length: m }, () => ring.zero())], isZero, magnitude);
      if (!y) return null;
      ys.push(y.slice(0, k));
    }
    const effective = matrixProduct(ring, a2, V).map((row, i) => row.map((x, j) => ring.add(x, a1[i].reduce((s, a, l) => ring.add(s, ring.mul(a, ys[j][l])), ring.zero()))));
    r2 = project(effective);
    if (!r2) return null;
  }
  if (m === 1) return [r2 ? [r1[0][0], r2[0][0]] : [r1[0][0]]];
  // the m×m problem R₁ + ε R₂ on the eigenspace
  if (!r2) {
    const values = pieces.flow.calculus.symbolic ? triangularDiagonal(r1, isZero) : (realEigenvalues(numericRing(pieces), r1 as unknown as Real[][], isZero as unknown as (c: Real) => boolean) as unknown as (C | null)[]);
    return values ? values.map((x) => (x === null ? null : [x])) : null;
  }
  const inner = pieces.flow.calculus.symbolic ? (() => {
    const values = triangularDiagonal(r1, isZero);
    return values && groupWithMultiplicity(values, (a, b) => isZero(ring.sub(a, b)));
  })() : (realEigenvalueGroups(numericRing(pieces), r1 as unknown as Real[][], isZero as unknown as (c: Real) => boolean) as unknown as { value: C | null; multiplicity: number }[]);
  if (!inner) return null;
  const out: (C[] | null)[] = [];
  for (const { value, multiplicity } of inner) {
    if (value === null) {
      out.push(...Array.from({ length: multiplicity }, () => null));
      continue;
    }
    const next = groupCorrections(pieces, [r1, r2], value, multiplicity);
    if (!next) out.push(...Array.from({ length: multiplicity }, () => [value]));
    else out.push(...next.map((c) => (c === null ? [value] : [value, ...c])));
  }
  return out;
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
