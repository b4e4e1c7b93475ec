import { LaurentSeries } from '../series';
import { q } from '../symbolic';
import { type Calculus } from './calculus';
import { type CatalogueEntry } from './catalogue';
import { type IntegralKit, integralLatex, integralSeries, logarithmFactor } from './integrals';

/** Raised when the pole structure contradicts renormalizability: a bug, never a user error. */
export class ConsistencyError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ConsistencyError';
  }
}

export interface CountertermTrail<C> {
  title: string;
  /** Pole part K[γ] of the subgraph. */
  pole: LaurentSeries<C>;
  /** The reduced graph G/γ. */
  reduced: LaurentSeries<C>;
  reducedLatex: string;
}

/** One graph through the R-operation: expansion, subtraction of subdivergences, pole part. */
export interface SubtractedGraph<C> {
  entry: CatalogueEntry;
  integralLatex: string;
  laurent: LaurentSeries<C>;
  counterterms: CountertermTrail<C>[];
  /** R̄G = G − Σ_γ K[γ]·G/γ at p² = μ². */
  subtracted: LaurentSeries<C>;
  /** K R̄G: the minimal-subtraction pole part. */
  pole: LaurentSeries<C>;
}

/** Negative powers only, as an exact Laurent polynomial. */
export function polePart<C>(f: LaurentSeries<C>): LaurentSeries<C> {
  const ring = f.ring;
  if (f.lowest >= 0) return LaurentSeries.of(ring, 0, [], Infinity);
  const coeffs = f.coefficients().slice(0, -f.lowest);
  return LaurentSeries.of(ring, f.lowest, coeffs, Infinity);
}

/** Each integral carries (p²/μ²)^{−ε·loops/2}; ℓ = ln(p²/μ²) tests that no ℓ/ε terms survive. */
function subtractedAt<C>(calc: Calculus<C>, kit: IntegralKit, entry: CatalogueEntry, ell: bigint, order: number): { rbar: LaurentSeries<C>; parts: CountertermTrail<C>[]; laurent: LaurentSeries<C> } {
  const { ctx } = calc;
  const m = entry.integral(kit);
  const laurent = integralSeries(ctx, kit, m, order);
  let rbar = laurent.mul(logarithmFactor(ctx, m.loops, q(ell), order - laurent.lowest));
  const parts: CountertermTrail<C>[] = [];
  for (const sub of entry.subdivergences) {
    const subIntegral = sub.subgraph(kit);
    const reducedIntegral = sub.reduced(kit);
    const pole = polePart(integralSeries(ctx, kit, subIntegral, order + subIntegral.loops));
    const reduced = integralSeries(ctx, kit, reducedIntegral, order + subIntegral.loops);
    const reducedWithLog = reduced.mul(logarithmFactor(ctx, reducedIntegral.loops, q(ell), order + subIntegral.loops - reduced.lowest));
    rbar = rbar.sub(pole.mul(reducedWithLog));
    parts.push({ title: sub.title, pole, reduced, reducedLatex: integralLatex(kit, reducedIntegral) });
  }
  return { rbar: rbar.truncate(order), parts, laurent };
}

export function subtractGraph<C>(calc: Calculus<C>, kit: IntegralKit, entry: CatalogueEntry, order = 0): SubtractedGraph<C> {
  const atScale = subtractedAt(calc, kit, entry, 0n, order);
  const pole = polePart(atScale.rbar);
  const shifted = polePart(subtractedAt(calc, kit, entry, 1n, Math.min(order, -1)).rbar);
  const difference = pole.sub(shifted);
  for (const c of difference.coefficients()) {
    if (!calc.isNegligible(c)) throw new ConsistencyError(`graph ${entry.graph.id}: a ln(p²)/ε term survives the subtraction of subdivergences (non-local divergence)`);
  }
  return { entry, integralLatex: integralLatex(kit, entry.integral(kit)), laurent: atScale.laurent, counterterms: atScale.parts, subtracted: atScale.rbar, pole };
}
