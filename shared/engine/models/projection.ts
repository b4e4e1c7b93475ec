import { fail } from '../precision/errors';
import { type Q, Q0, q, qAdd, qDiv, qIsZero, qMul, qSub } from '../symbolic/rational';
import { type QuarticModel } from './model';
import { type Tensor, innerProduct } from './tensor';

/** Exact solution of a small square system over Q (Gaussian elimination); null when singular. */
export function solveRational(matrix: Q[][], rhs: Q[]): Q[] | null {
  const m = matrix.length;
  const a = matrix.map((row, i) => [...row, rhs[i]]);
  for (let col = 0; col < m; col++) {
    const pivot = a.findIndex((row, r) => r >= col && !qIsZero(row[col]));
    if (pivot < 0) return null;
    [a[col], a[pivot]] = [a[pivot], a[col]];
    for (let r = 0; r < m; r++) {
      if (r === col || qIsZero(a[r][col])) continue;
      const f = qDiv(a[r][col], a[col][col]);
      for (let k = col; k <= m; k++) a[r][k] = qSub(a[r][k], qMul(f, a[col][k]));
    }
  }
  return a.map((row, i) => qDiv(row[m], row[i]));
}

const gramCache = new WeakMap<QuarticModel, Q[][]>();

function gramMatrix(model: QuarticModel): Q[][] {
  let g = gramCache.get(model);
  if (!g) {
    g = model.basis.map((bi, i) => model.basis.map((bj, j) => qMul(qMul(model.scales[i], model.scales[j]), q(innerProduct(bi, bj)))));
    gramCache.set(model, g);
  }
  return g;
}

/** Check that the couplings multiply linearly independent structures (otherwise they are not identifiable). */
export function assertIndependentCouplings(model: QuarticModel): void {
  const zero = model.couplings.map(() => Q0);
  if (!solveRational(gramMatrix(model), zero)) fail('invalid', `couplings ${model.couplings.join(', ')} do not multiply independent quartic structures`);
}

/**
 * Coordinates c_k with X = Σ_k c_k · scale_k · basis_k, found by orthogonal projection and then
 * verified entry by entry: a remainder means the flow generates a quartic term the model lacks.
 */
export function projectOntoCouplings(model: QuarticModel, x: Tensor, what: string): Q[] {
  const rhs = model.basis.map((b, k) => qMul(model.scales[k], q(innerProduct(b, x))));
  const c = solveRational(gramMatrix(model), rhs);
  if (!c) return fail('invalid', `couplings ${model.couplings.join(', ')} are not independent`);
  const weights = c.map((ck, k) => qMul(ck, model.scales[k]));
  for (let i = 0; i < x.data.length; i++) {
    let fitted = Q0;
    for (let k = 0; k < weights.length; k++) if (model.basis[k].data[i] !== 0n) fitted = qAdd(fitted, qMul(weights[k], q(model.basis[k].data[i])));
    if (!qIsZero(qSub(q(x.data[i]), fitted))) {
      fail('invalid', `${what} generates a quartic structure outside the couplings ${model.couplings.join(', ')} of ${model.label}; add a coupling for it`);
    }
  }
  return c;
}

/** Coefficient c with X = c·δ for a two-index tensor; fails if X is not proportional to δ. */
export function projectOntoIdentity(x: Tensor, what: string): Q {
  const n = x.n;
  let trace = 0n;
  for (let a = 0; a < n; a++) trace += x.data[a * n + a];
  const c = q(trace, n);
  for (let a = 0; a < n; a++) for (let b = 0; b < n; b++) {
    const expected = a === b ? c : Q0;
    if (!qIsZero(qSub(q(x.data[a * n + b]), expected))) fail('invalid', `${what} is not proportional to the identity in field space for this model`);
  }
  return c;
}
