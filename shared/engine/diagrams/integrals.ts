import { type ExpansionContext, type GammaFactor, bubbleFactors, gammaProductSeries } from '../integrals';
import { LaurentSeries } from '../series';
import { type Affine, type Q, affine, affineAdd, affineScale, affineSub, affineToLatex, q } from '../symbolic';

/**
 * A massless momentum integral built from nested one-loop bubbles: its value is
 * (p²)^{−index} · Π G(a_i, b_i) / (4π)^{d·loops/2}. Lines in series carry one momentum and their
 * powers add; a bubble of two lines with powers x, y is G(x, y)·(p²)^{d/2−x−y} (docs/physics.md §4).
 */
export interface MomentumIntegral {
  index: Affine;
  bubbles: ReadonlyArray<readonly [Affine, Affine]>;
  loops: number;
}

/** The dimension and propagator power the integrals are built with (d = 2s − ε, power s/2). */
export interface IntegralKit {
  s: Affine;
  d: Affine;
  propagator(): MomentumIntegral;
  bubble(x: MomentumIntegral, y: MomentumIntegral): MomentumIntegral;
  inSeries(x: MomentumIntegral, y: MomentumIntegral): MomentumIntegral;
}

export const EPS_NAME = 'eps';

/** d = 2s − ε with s either the parameter "s" or a given rational. */
export function integralKit(s: Affine): IntegralKit {
  const d = affineAdd(affineScale(s, q(2)), affine(q(0), { [EPS_NAME]: q(-1) }));
  const halfD = affineScale(d, q(1, 2));
  return {
    s,
    d,
    propagator: () => ({ index: affineScale(s, q(1, 2)), bubbles: [], loops: 0 }),
    bubble: (x, y) => ({ index: affineSub(affineAdd(x.index, y.index), halfD), bubbles: [...x.bubbles, ...y.bubbles, [x.index, y.index]], loops: x.loops + y.loops + 1 }),
    inSeries: (x, y) => ({ index: affineAdd(x.index, y.index), bubbles: [...x.bubbles, ...y.bubbles], loops: x.loops + y.loops }),
  };
}

/** Γ-function factors of Γ(s)^loops · Π G(a_i, b_i): the integral in units of the coupling u. */
export function integralFactors(kit: IntegralKit, m: MomentumIntegral): GammaFactor[] {
  const normalization: GammaFactor = { arg: { x: kit.s, c: q(0) }, power: m.loops };
  return [normalization, ...m.bubbles.flatMap(([a, b]) => bubbleFactors(a, b, kit.d))];
}

export function integralSeries<C>(ctx: ExpansionContext<C>, kit: IntegralKit, m: MomentumIntegral, order: number): LaurentSeries<C> {
  return gammaProductSeries(ctx, integralFactors(kit, m), order);
}

/** (p²/μ²)^{−kε/2} = exp(−k ℓ ε / 2) through ε^order, ℓ = ln(p²/μ²) rational. */
export function logarithmFactor<C>(ctx: ExpansionContext<C>, k: number, ell: Q, order: number): LaurentSeries<C> {
  const { ring } = ctx;
  if (k === 0 || ell.num === 0n) return LaurentSeries.constant(ring, ring.one(), order);
  const c = ring.fromRational(-BigInt(k) * ell.num, 2n * ell.den);
  return LaurentSeries.of(ring, 0, [ring.zero(), c], Math.max(order, 1)).exp().truncate(order);
}

const latexAffine = (a: Affine) => affineToLatex(a).replace(/\\mathrm\{eps\}/g, '\\varepsilon');

/** LaTeX of the integral in units of u: Γ(s)^L Π G(a,b) (p²)^{−index}. */
export function integralLatex(kit: IntegralKit, m: MomentumIntegral): string {
  const gammas = m.loops === 0 ? '' : m.loops === 1 ? '\\Gamma(s)\\,' : `\\Gamma(s)^{${m.loops}}\\,`;
  const bubbles = m.bubbles.map(([a, b]) => `G\\!\\left(${latexAffine(a)},\\,${latexAffine(b)}\\right)`).join('\\,');
  return `${gammas}${bubbles}\\,(p^2)^{${latexAffine(affineScale(m.index, q(-1)))}}`.replace(/\\Gamma\(s\)/g, `\\Gamma(${latexAffine(kit.s)})`);
}
