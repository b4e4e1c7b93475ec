import { type Calculus, type DerivedFlow, deriveFlow, numericCalculus, symbolicCalculus } from '../diagrams';
import { type ModelSpec, CouplingPolynomial, familyPointOf, isFamily } from '../models';
import { type Real, fail } from '../precision';
import { type Expression, type Q, q, qCompare } from '../symbolic';
import { type PoleSource, familyFlow, familyPointFlow } from './family';

export interface FlowRequest {
  model: ModelSpec;
  /** Propagator power; null keeps s symbolic. */
  s: Q | null;
  loops: 1 | 2 | 3;
  digits: number;
  /** For a preset at a numeric N without tensors: the ε-series of its family's fixed points, to name those with a pole at N (omittedFixedPoints). */
  poleSources?: (flow: DerivedFlow<Expression>) => PoleSource[];
}

export type AnyFlow = { mode: 'numeric'; flow: DerivedFlow<Real> } | { mode: 'symbolic'; flow: DerivedFlow<Expression> };

/** 0 < s ≤ 2 (s = 2 is the short-range theory; beyond it the propagator is not reflection positive). */
export function checkPropagatorPower(s: Q): void {
  if (qCompare(s, q(0)) <= 0) fail('domain', 's must be positive');
  if (qCompare(s, q(2)) > 0) fail('domain', 's must be at most 2 (s = 2 is the short-range theory)');
}

/**
 * Numbers when s and N are given, exact expressions otherwise. Symbolic-N families are derived once
 * and kept; a preset at a numeric N without tensors is its family evaluated exactly at N.
 */
export function flowFor(request: FlowRequest): AnyFlow {
  if (request.s) checkPropagatorPower(request.s);
  const point = familyPointOf(request.model);
  if (point) return familyPointFlow({ point, s: request.s, loops: request.loops, digits: request.digits, poleSources: request.poleSources });
  if (isFamily(request.model)) return { mode: 'symbolic', flow: familyFlow(request.model, request.s, request.loops) };
  if (request.s) {
    const calc: Calculus<Real> = numericCalculus(request.s, request.digits);
    return { mode: 'numeric', flow: deriveFlow(request.model, calc, request.loops) };
  }
  return { mode: 'symbolic', flow: deriveFlow(request.model, symbolicCalculus(request.s), request.loops) };
}

/** β_k(g; ε) = −ε g_k + beta_k(g), evaluated. */
export function betaAt<C>(flow: DerivedFlow<C>, g: readonly C[], eps: C): C[] {
  const { ring } = flow.calculus.ctx;
  return flow.beta.map((b, k) => ring.sub(b.evaluate(g), ring.mul(eps, g[k])));
}

/** ∂ beta_i / ∂ g_j as polynomials (the −ε δ_ij part is added by the caller). */
export function jacobianPolynomials<C>(flow: DerivedFlow<C>): CouplingPolynomial<C>[][] {
  return flow.beta.map((b) => flow.couplings.map((_, j) => b.derivative(j)));
}

export function stabilityMatrixAt<C>(flow: DerivedFlow<C>, g: readonly C[], eps: C): C[][] {
  const { ring } = flow.calculus.ctx;
  return jacobianPolynomials(flow).map((row, i) => row.map((p, j) => (i === j ? ring.sub(p.evaluate(g), eps) : p.evaluate(g))));
}
