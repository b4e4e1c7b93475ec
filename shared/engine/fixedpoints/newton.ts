import { solveLinear } from '../linalg';
import { type Real } from '../precision';
import { type CoefficientRing } from '../series';

const norm = (v: Real[]) => Math.max(...v.map((x) => Math.abs(Number(x.toString()))));

/**
 * Newton's method for f(g) = 0 in full precision. At a root of multiplicity m along one direction
 * plain Newton converges linearly with ratio (m − 1)/m; when two successive step ratios agree on
 * such a ratio the step is multiplied by m (Schröder's modification), which restores fast
 * convergence. Returns the point, whether the last step was negligible and its size (a multiple
 * root is determined only to about (working precision)^{1/m}: the steps stall there), or null when the
 * Jacobian is singular or the iteration diverges (|g| > `bound`).
 */
export function newtonSolve(ring: CoefficientRing<Real>, system: (g: Real[]) => { value: Real[]; jacobian: Real[][] }, start: Real[], isNegligible: (c: Real) => boolean, maxIterations: number, bound = 1e6): { root: Real[]; converged: boolean; lastStep: number } | null {
  let g = start;
  const ratios: number[] = [];
  let previous = Infinity;
  for (let iter = 0; iter < maxIterations; iter++) {
    const { value, jacobian } = system(g);
    if (value.every((x) => x.isZero())) return { root: g, converged: true, lastStep: 0 };
    const step = solveLinear(ring, jacobian, value, (c) => c.isZero(), (c) => Math.abs(Number(c.toString())));
    if (!step) return value.every(isNegligible) ? { root: g, converged: true, lastStep: 0 } : null;
    const size = norm(step);
    ratios.push(size / previous);
    previous = size;
    const [r1, r2] = ratios.slice(-2);
    const multiplicity = ratios.length >= 2 && r2 > 0.4 && r2 < 0.95 && Math.abs(r1 - r2) < 0.03 ? Math.min(6, Math.round(1 / (1 - r2))) : 1;
    g = g.map((x, i) => ring.sub(x, multiplicity > 1 ? ring.scale(step[i], BigInt(multiplicity)) : step[i]));
    if (multiplicity > 1) ratios.length = 0;
    if (g.some((x) => !x.isFinite() || x.abs().gt(bound))) return null;
    if (step.every(isNegligible)) return { root: g, converged: true, lastStep: size };
  }
  return { root: g, converged: false, lastStep: previous };
}
