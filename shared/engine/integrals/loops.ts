import { fail } from '../precision';
import { type LaurentSeries } from '../series';
import { type Affine, affineAdd, affineScale, affineSub, affineToString, coefficientOf, q, qEquals, withoutParameter } from '../symbolic';
import { type GammaArgument, type GammaFactor, gammaProductSeries } from './gammaExpansion';
import { type ExpansionContext } from './values';

export const EPS = 'eps';

/** Split an affine expression in eps and the parameters into x + c·eps. */
export function splitEps(a: Affine): GammaArgument {
  return { x: withoutParameter(a, EPS), c: coefficientOf(a, EPS) };
}

const half = (a: Affine) => affineScale(a, q(1, 2));
const gammaOf = (a: Affine, power: number): GammaFactor => ({ arg: splitEps(a), power });

/**
 * One-loop G-function (docs/physics.md §4):
 * G(a,b) = Γ(d/2−a) Γ(d/2−b) Γ(a+b−d/2) / [Γ(a) Γ(b) Γ(d−a−b)], a, b, d affine in eps and parameters.
 */
export function bubbleFactors(a: Affine, b: Affine, d: Affine): GammaFactor[] {
  const h = half(d);
  return [
    gammaOf(affineSub(h, a), 1),
    gammaOf(affineSub(h, b), 1),
    gammaOf(affineSub(affineAdd(a, b), h), 1),
    gammaOf(a, -1),
    gammaOf(b, -1),
    gammaOf(affineSub(affineSub(d, a), b), -1),
  ];
}

export function bubbleSeries<C>(ctx: ExpansionContext<C>, a: Affine, b: Affine, d: Affine, order: number): LaurentSeries<C> {
  return gammaProductSeries(ctx, bubbleFactors(a, b, d), order);
}

/**
 * Fourier transform of a power: ∫ d^dx e^{ip·x} (x²)^{−a} = π^{d/2} 2^{d−2a} Γ(d/2−a)/Γ(a) (p²)^{a−d/2}.
 * Returns the Γ-prefactor series and the exponents of π and 2 (kept apart: π^{d/2} is not a Laurent
 * coefficient in the symbolic algebra).
 */
export function fourierPowerFactors(a: Affine, d: Affine): { factors: GammaFactor[]; piExponent: Affine; twoExponent: Affine } {
  return {
    factors: [gammaOf(affineSub(half(d), a), 1), gammaOf(a, -1)],
    piExponent: half(d),
    twoExponent: affineSub(d, affineScale(a, q(2))),
  };
}

/**
 * Star–triangle (uniqueness) relation, valid when δ1+δ2+δ3 = d:
 * ∫ d^dx0 Π |x0−xi|^{−2δi} = π^{d/2} Π Γ(d/2−δi)/Γ(δi) · (distances).
 */
export function starTriangleFactors(deltas: [Affine, Affine, Affine], d: Affine): { factors: GammaFactor[]; piExponent: Affine } {
  const sum = affineAdd(affineAdd(deltas[0], deltas[1]), deltas[2]);
  const excess = affineSub(sum, d);
  if (excess.terms.length > 0 || !qEquals(excess.constant, q(0))) fail('invalid', `star-triangle needs delta1+delta2+delta3 = d (they differ by ${affineToString(excess)})`);
  const factors: GammaFactor[] = [];
  for (const delta of deltas) factors.push(gammaOf(affineSub(half(d), delta), 1), gammaOf(delta, -1));
  return { factors, piExponent: half(d) };
}
