import { type EliminationArithmetic, solveLinear } from '../linalg';
import { fail } from '../precision';
import { type Q, Q0, Q1, q, qAdd, qDiv, qIsZero, qMul, qSub } from '../symbolic';
import { type QuarticModel } from './model';
import { type Tensor, innerProduct } from './tensor';

const RATIONALS: EliminationArithmetic<Q> = { sub: qSub, mul: qMul, inverse: (a) => qDiv(Q1, a), isZero: qIsZero };

/** Exact solution of a small square system over Q; null when singular. */
export const solveRational = (matrix: Q[][], rhs: Q[]): Q[] | null => solveLinear(RATIONALS, matrix, rhs, qIsZero);

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
