import { type DerivedFlow } from '../diagrams';
import { type FixedPoint } from '../fixedpoints';
import { type Real, fail } from '../precision';
import { LaurentSeries } from '../series';
import { onSeries } from './exponents';
import { eigenspaces, restrictedEigenvalues } from './quadratic';

/**
 * The field anomalous dimension at a fixed point when γ_φ is a matrix (s = 2, anisotropic models):
 * its eigen-directions in field space and, for each, γ_φ as an ε-series at fixed s, so that
 * η = 2 − s + 2γ_φ and Δ_φ = (d − s)/2 + γ_φ per direction. When γ_φ ∝ δ (the flow has no matrix,
 * or the matrix is ∝ δ along the point's series) there is one direction holding every field.
 */
export interface FieldDirection<C> {
  /** "phi1", "phi1 - phi2" (largest coefficient 1), or "every field". */
  field: string;
  /** Dimension of the eigenspace; null for "every field" of a flow without a matrix (n may be symbolic). */
  multiplicity: number | null;
  /** Orthonormal basis of the eigenspace in field space (double precision, for display); null for "every field". */
  basis: number[][] | null;
  /** γ_φ along this direction: coefficients of ε⁰ … ε^loops. */
  gammaSeries: LaurentSeries<C>;
  /** The truncated series at the physical ε (null without one). */
  value: C | null;
  /** Eigenvalues of γ_φ(g) at the numeric root of the truncated β restricted to the eigenspace (numeric mode). */
  atRoot: C[] | null;
}

export interface FieldAnomalousSpectrum<C> {
  /** True when one η serves every field at this point. */
  proportional: boolean;
  directions: FieldDirection<C>[];
}

const isNegligibleSeries = <C>(flow: DerivedFlow<C>, x: LaurentSeries<C>) => x.coefficients().every((c) => flow.calculus.isNegligible(c));

/**
 * γ_φ per eigen-direction at a fixed point. Exact (any coefficient ring) when the matrix is
 * diagonal along the point's series; otherwise the ε-coefficient matrices are diagonalized
 * numerically (degenerate perturbation theory, as for the quadratic operators; numeric s and N).
 * `eps`: the physical ε for `value`.
 */
export function fieldAnomalousSpectrum<C>(flow: DerivedFlow<C>, point: FixedPoint<C>, eps: C | null = null): FieldAnomalousSpectrum<C> {
  if (!point.couplingSeries) return fail('not-representable', `fixed point ${point.name} has no real ε-series`);
  const g = point.couplingSeries;
  // a branch given through a lower order than the flow's (a persisting degeneracy) keeps that order
  const order = Math.min(flow.loops, ...g.map((s) => s.order));
  const valueAt = (series: LaurentSeries<C>) => (eps === null ? null : series.evaluate(eps));
  const rootValues = !flow.calculus.symbolic && point.couplingValues ? (point.couplingValues as unknown as C[]) : null;
  const matrix = flow.gammaPhiMatrix;
  if (!matrix) {
    const gammaSeries = onSeries(flow.gammaPhi, g, order);
    return { proportional: true, directions: [{ field: 'every field', multiplicity: null, basis: null, gammaSeries, value: valueAt(gammaSeries), atRoot: rootValues ? [flow.gammaPhi.evaluate(rootValues)] : null }] };
  }
  const n = matrix.length;
  const series = matrix.map((row) => row.map((p) => onSeries(p, g, order)));
  const atRootMatrix = rootValues ? matrix.map((row) => row.map((p) => p.evaluate(rootValues))) : null;
  const offDiagonalVanishes = series.every((row, a) => row.every((x, b) => a === b || isNegligibleSeries(flow, x)));
  if (offDiagonalVanishes) return diagonalSpectrum(flow, series, atRootMatrix, valueAt);
  if (flow.calculus.symbolic) return fail('not-representable', `γ_φ is not diagonal at ${point.name}: its eigen-directions need numeric s and N`);
  const numeric = flow as unknown as DerivedFlow<Real>;
  const digits = numeric.calculus.digits;
  const { ring } = numeric.calculus.ctx;
  const coefficientMatrix = (m: number) => (series as unknown as LaurentSeries<Real>[][]).map((row) => row.map((x) => (x.order >= m && x.lowest <= m ? x.coefficient(m) : ring.zero())));
  const spaces = eigenspaces(coefficientMatrix(1), order >= 2 ? coefficientMatrix(2) : null, digits, order >= 3 ? coefficientMatrix(3) : null);
  const directions = spaces.map(({ basis, g1, g2, g3 }) => {
    const gammaSeries = LaurentSeries.of(ring, 0, [ring.zero(), g1, ...(g2 ? [g2] : []), ...(g2 && g3 ? [g3] : [])].slice(0, order + 1), order) as unknown as LaurentSeries<C>;
    const atRoot = atRootMatrix ? (restrictedEigenvalues(atRootMatrix as unknown as Real[][], basis, digits) as unknown as C[]) : null;
    return { field: fieldText(basis[0].map(Number)), multiplicity: basis.length, basis: basis.map((v) => v.map(Number)), gammaSeries, value: valueAt(gammaSeries), atRoot };
  });
  return { proportional: directions.length === 1, directions };
}

/** Diagonal γ_φ: the field axes, grouped where their series agree. */
function diagonalSpectrum<C>(flow: DerivedFlow<C>, series: LaurentSeries<C>[][], atRoot: C[][] | null, valueAt: (s: LaurentSeries<C>) => C | null): FieldAnomalousSpectrum<C> {
  const n = series.length;
  const groups: number[][] = [];
  for (let a = 0; a < n; a++) {
    const same = groups.find((grp) => isNegligibleSeries(flow, series[grp[0]][grp[0]].sub(series[a][a])));
    if (same) same.push(a);
    else groups.push([a]);
  }
  const unit = (a: number) => Array.from({ length: n }, (_, b) => (a === b ? 1 : 0));
  const directions = groups.map((grp) => ({
    field: groups.length === 1 ? 'every field' : grp.map((a) => `phi${a + 1}`).join(', '),
    multiplicity: grp.length,
    basis: grp.map(unit),
    gammaSeries: series[grp[0]][grp[0]],
    value: valueAt(series[grp[0]][grp[0]]),
    atRoot: atRoot ? grp.map((a) => atRoot[a][a]) : null,
  }));
  return { proportional: groups.length === 1, directions };
}

/** Σ_a v_a φ_a as text, the largest coefficient scaled to 1: "phi1 - phi2", "0.5*phi1 + phi2". */
function fieldText(vector: number[]): string {
  const big = vector.reduce((m, x) => (Math.abs(x) > Math.abs(m) ? x : m), 0);
  const parts: string[] = [];
  vector.forEach((x, a) => {
    const c = Number((x / big).toPrecision(6));
    if (Math.abs(c) < 1e-9) return;
    const mag = Math.abs(c) === 1 ? `phi${a + 1}` : `${Math.abs(c)}*phi${a + 1}`;
    parts.push(parts.length === 0 ? (c < 0 ? `-${mag}` : mag) : `${c < 0 ? '-' : '+'} ${mag}`);
  });
  return parts.join(' ');
}
