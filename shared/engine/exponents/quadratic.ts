import { type DerivedFlow } from '../diagrams';
import { type FixedPoint } from '../fixedpoints';
import { symmetricEigen } from '../linalg';
import { type Real, realContext } from '../precision';
import { LaurentSeries } from '../series';
import { onSeries } from './exponents';

/**
 * Quadratic operators at a fixed point: eigenvalues of the anomalous-dimension matrix γ_{(kl),(ij)}
 * of φ_iφ_j, as ε-series (degenerate perturbation theory: the ε² coefficients are the eigenvalues
 * of M₂ restricted to each eigenspace of M₁) and as numbers, with Δ = d − s + γ.
 *
 * Field renormalization (s = 2): γ already contains the legs' part γ_φ t + t γ_φ (built in
 * diagrams/renormalization.ts, quadraticWithField), with γ_φ the full n×n matrix. Hence
 * Δ = d − s + γ = 2Δ_φ-part + (insertion graphs): for an operator φ_iφ_j of two fields that are
 * γ_φ eigen-directions with eigenvalues γ_i, γ_j and no mixing through the graphs,
 * Δ = (d − s)/2 + γ_i + (d − s)/2 + γ_j = Δ_{φ_i} + Δ_{φ_j}. For s < 2 γ_φ = 0 and Δ = d − s + γ.
 *
 * γ is self-adjoint for the Frobenius product ⟨s, t⟩ = Σ_ab s_ab t_ab, which in the coordinates
 * t_ij (i ≤ j) has weights w = 1 (i = j), 2 (i < j). In t̂ = √w t the matrix is symmetric and is
 * diagonalized by Jacobi rotations at the working precision.
 */
export interface QuadraticOperator {
  /** Symmetry description of the eigenspace (singlet, symmetric traceless, …). */
  name: string;
  multiplicity: number;
  /** True when φ_aφ_a (δ) lies in the eigenspace: then it is itself an eigen-operator with this γ. */
  containsSinglet: boolean;
  /** One operator of the eigenspace, e.g. "phi1^2 - phi2^2". */
  operator: string;
  /** γ = γ₁ε + γ₂ε² and Δ = d − s + γ at fixed s (d = 2s − ε). */
  gammaSeries: LaurentSeries<Real>;
  deltaSeries: LaurentSeries<Real>;
  /** Orthonormal basis of the eigenspace in the coordinates t̂ (for evaluating at a numeric root). */
  basis: Real[][];
}

export interface QuadraticSpectrum {
  operators: QuadraticOperator[];
  pairs: [number, number][];
}

const toNumber = (x: Real) => Number(x.toString());

const weightOf = ([i, j]: [number, number]) => (i === j ? 1 : 2);

/** M̂ = D^{1/2} M D^{−1/2} with D = diag(w): symmetric when M is self-adjoint. */
function symmetrized(m: Real[][], pairs: [number, number][], digits: number): Real[][] {
  const R = realContext(digits);
  const root = pairs.map((p) => new R(weightOf(p)).sqrt());
  return m.map((row, r) => row.map((x, c) => new R(x).times(root[r]).div(root[c])));
}

const column = (v: Real[][], j: number) => v.map((row) => row[j]);

/** Vᵀ A V for the columns `cols` of V. */
function restrict(a: Real[][], vectors: Real[][], digits: number): Real[][] {
  const R = realContext(digits);
  const k = vectors.length;
  const n = a.length;
  const av = vectors.map((vec) => a.map((row) => row.reduce((s, x, j) => s.plus(x.times(vec[j])), new R(0))));
  return Array.from({ length: k }, (_, i) => Array.from({ length: k }, (_, j) => {
    let s = new R(0);
    for (let r = 0; r < n; r++) s = s.plus(vectors[i][r].times(av[j][r]));
    return s;
  }));
}

function clusters(values: Real[], scale: number): number[][] {
  const order = values.map((_, i) => i).sort((i, j) => toNumber(values[i]) - toNumber(values[j]));
  const out: number[][] = [];
  for (const i of order) {
    const last = out[out.length - 1];
    if (last && values[i].minus(values[last[0]]).abs().lte(1e-25 * Math.max(1, scale))) last.push(i);
    else out.push([i]);
  }
  return out;
}

/**
 * The eigenspaces of γ(ε) = M₁ε + M₂ε² + M₃ε³ (M₂, M₃ optional), each with its basis and (γ₁, γ₂, γ₃);
 * M₁, M₂, M₃ symmetric. Degenerate perturbation theory: γ₂ are the eigenvalues of M₂ on each M₁
 * eigenspace V; γ₃ those of Uᵀ(M₃ + M₂ S M₂)U on each resulting subspace U, S = Σ_j v_j v_jᵀ/(γ₁ − λ_j)
 * over the other eigenvectors of M₁ (the reduced resolvent).
 */
export function eigenspaces(m1: Real[][], m2: Real[][] | null, digits: number, m3: Real[][] | null = null): { basis: Real[][]; g1: Real; g2: Real | null; g3: Real | null }[] {
  const R = realContext(digits);
  const first = symmetricEigen(m1, digits);
  const scale = Math.max(...first.values.map((x) => Math.abs(toNumber(x))), 1e-30);
  const out: { basis: Real[][]; g1: Real; g2: Real | null; g3: Real | null }[] = [];
  const combine = (vecs: Real[][], coords: Real[][], c: number) => vecs[0].map((_, r) => vecs.reduce((s, vec, l) => s.plus(vec[r].times(coords[l][c])), new R(0)));
  const apply = (a: Real[][], v: Real[]) => a.map((row) => row.reduce((s, x, j) => s.plus(x.times(v[j])), new R(0)));
  const dot = (a: Real[], b: Real[]) => a.reduce((s, x, i) => s.plus(x.times(b[i])), new R(0));
  const groups = clusters(first.values, scale);
  for (const cluster of groups) {
    const vecs = cluster.map((j) => column(first.vectors, j));
    const g1 = first.values[cluster[0]];
    if (!m2) {
      out.push({ basis: vecs, g1, g2: null, g3: null });
      continue;
    }
    // M₃ + M₂ S M₂ on this eigenspace (third order)
    const others = first.values.map((_, j) => j).filter((j) => !cluster.includes(j));
    const resolvent = (x: Real[]) => others.reduce((acc, j) => {
      const v = column(first.vectors, j);
      const c = dot(v, x).div(g1.minus(first.values[j]));
      return acc.map((a, r) => a.plus(v[r].times(c)));
    }, x.map(() => new R(0)));
    const second = m3 ? vecs.map((v) => apply(m3, v).map((x, r) => x.plus(apply(m2, resolvent(apply(m2, v)))[r]))) : null;
    const h2 = second ? vecs.map((u) => second.map((col) => dot(u, col))) : null;
    const inner = symmetricEigen(restrict(m2, vecs, digits), digits);
    const scale2 = Math.max(...inner.values.map((x) => Math.abs(toNumber(x))), scale);
    for (const sub of clusters(inner.values, scale2)) {
      const basis = sub.map((c) => combine(vecs, inner.vectors, c));
      const g2 = inner.values[sub[0]];
      if (!h2) {
        out.push({ basis, g1, g2, g3: null });
        continue;
      }
      const coords = sub.map((c) => inner.vectors.map((row) => row[c]));
      const third = symmetricEigen(restrict(h2, coords, digits), digits);
      const scale3 = Math.max(...third.values.map((x) => Math.abs(toNumber(x))), scale2);
      for (const last of clusters(third.values, scale3)) out.push({ basis: last.map((c) => combine(basis, third.vectors, c)), g1, g2, g3: third.values[last[0]] });
    }
  }
  return out;
}

function singletOverlap(basis: Real[][], pairs: [number, number][], fields: number): number {
  const delta = pairs.map(([i, j]) => (i === j ? 1 / Math.sqrt(fields) : 0));
  return basis.reduce((s, v) => s + v.reduce((t, x, r) => t + toNumber(x) * delta[r], 0) ** 2, 0);
}

/** Name of an eigenspace from its basis (coordinates t̂). */
function nameOf(basis: Real[][], pairs: [number, number][], fields: number): string {
  const P = pairs.length;
  const delta = pairs.map(([i, j]) => (i === j ? 1 / Math.sqrt(fields) : 0));
  const num = basis.map((v) => v.map(toNumber));
  const overlap = num.reduce((s, v) => s + v.reduce((t, x, r) => t + x * delta[r], 0) ** 2, 0);
  const containsSinglet = overlap > 1 - 1e-12;
  const orthogonal = overlap < 1e-12;
  const support = (diagonal: boolean) => num.every((v) => v.every((x, r) => (pairs[r][0] === pairs[r][1]) === diagonal || Math.abs(x) < 1e-12));
  if (basis.length === P) return 'all quadratic operators (degenerate)';
  if (containsSinglet && basis.length === 1) return 'singlet';
  if (fields === 1) return 'singlet';
  if (orthogonal && basis.length === P - 1) return 'symmetric traceless';
  if (support(true)) return orthogonal ? 'diagonal traceless' : 'diagonal';
  if (support(false)) return 'off-diagonal';
  return orthogonal ? 'traceless (mixed)' : containsSinglet ? 'contains the singlet' : 'mixed';
}

/** An operator of the eigenspace as text: Σ_a t_aa φ_a² + Σ_{a<b} 2 t_ab φ_aφ_b, largest coefficient 1. */
function operatorText(vector: Real[], pairs: [number, number][]): string {
  const coeffs = vector.map((x, r) => toNumber(x) / Math.sqrt(weightOf(pairs[r])) * (pairs[r][0] === pairs[r][1] ? 1 : 2));
  const big = coeffs.reduce((m, x) => (Math.abs(x) > Math.abs(m) ? x : m), 0);
  const parts: string[] = [];
  coeffs.forEach((x, r) => {
    const c = Number((x / big).toPrecision(6));
    if (Math.abs(c) < 1e-9) return;
    const [i, j] = pairs[r];
    const op = i === j ? `phi${i + 1}^2` : `phi${i + 1}*phi${j + 1}`;
    const mag = Math.abs(c) === 1 ? op : `${Math.abs(c)}*${op}`;
    parts.push(parts.length === 0 ? (c < 0 ? `-${mag}` : mag) : `${c < 0 ? '-' : '+'} ${mag}`);
  });
  return parts.join(' ');
}

/** γ-matrix coefficients of ε^m on the coupling series (null when undetermined). */
function seriesMatrices(flow: DerivedFlow<Real>, point: FixedPoint<Real>): Real[][][] {
  const quad = flow.quadratic as NonNullable<DerivedFlow<Real>['quadratic']>;
  const order = flow.loops;
  const g = point.couplingSeries as LaurentSeries<Real>[];
  const entries = quad.gamma.map((row) => row.map((p) => onSeries(p, g, order)));
  return Array.from({ length: order }, (_, m) => entries.map((row) => row.map((e) => (e.order >= m + 1 ? e.coefficient(m + 1) : flow.calculus.ctx.ring.zero()))));
}

/**
 * The quadratic operators at a fixed point (numeric s and N). Null when the flow has no matrix
 * (symbolic N or s) or the point has no real ε-series.
 */
export function quadraticSpectrum(flow: DerivedFlow<Real>, point: FixedPoint<Real>, s: Real, fields: number): QuadraticSpectrum | null {
  if (!flow.quadratic || flow.calculus.symbolic || !point.couplingSeries) return null;
  const digits = flow.calculus.digits;
  const { ring } = flow.calculus.ctx;
  const pairs = flow.quadratic.pairs;
  const [m1, m2, m3] = seriesMatrices(flow, point).map((m) => symmetrized(m, pairs, digits));
  const order = Math.min(flow.loops, ...point.couplingSeries.map((s) => s.order));
  const operators = eigenspaces(m1, order >= 2 ? m2 : null, digits, order >= 3 ? m3 : null).map(({ basis, g1, g2, g3 }) => {
    const gammaCoeffs = [ring.zero(), g1, ...(g2 ? [g2] : []), ...(g2 && g3 ? [g3] : [])].slice(0, order + 1);
    const gammaSeries = LaurentSeries.of(ring, 0, gammaCoeffs, order);
    const dMinusS = LaurentSeries.of(ring, 0, [s, ring.fromRational(-1n)], order);
    return { name: nameOf(basis, pairs, fields), multiplicity: basis.length, containsSinglet: singletOverlap(basis, pairs, fields) > 1 - 1e-12, operator: operatorText(basis[0], pairs), gammaSeries, deltaSeries: dMinusS.add(gammaSeries), basis };
  });
  return { operators, pairs };
}

/** Eigenvalues (ascending) of the symmetric matrix m restricted to the span of the orthonormal `basis`. */
export function restrictedEigenvalues(m: Real[][], basis: Real[][], digits: number): Real[] {
  return symmetricEigen(restrict(m, basis, digits), digits).values.sort((x, y) => toNumber(x) - toNumber(y));
}

/** γ at numeric couplings restricted to each operator's eigenspace: its eigenvalues (one per operator, the smallest). */
export function quadraticAtRoot(flow: DerivedFlow<Real>, spectrum: QuadraticSpectrum, g: Real[]): Real[][] {
  const quad = flow.quadratic as NonNullable<DerivedFlow<Real>['quadratic']>;
  const digits = flow.calculus.digits;
  const m = symmetrized(quad.gamma.map((row) => row.map((p) => p.evaluate(g))), spectrum.pairs, digits);
  return spectrum.operators.map((op) => restrictedEigenvalues(m, op.basis, digits));
}
