import { fail } from '../precision';
import { LaurentSeries } from '../series';
import { type Affine, type Q, affine, affineToString, isConstantAffine, q, qIsInteger, qIsZero, qPowInt } from '../symbolic';
import { type ExpansionContext } from './values';

/** An argument x + c·ε of Γ: x affine in the parameters, c rational. */
export interface GammaArgument {
  x: Affine;
  c: Q;
}

/** Γ(arg)^power inside a product. */
export interface GammaFactor {
  arg: GammaArgument;
  power: number;
}

export function poleIndex(x: Affine): bigint | null {
  if (!isConstantAffine(x) || !qIsInteger(x.constant) || x.constant.num > 0n) return null;
  return -x.constant.num;
}

/** Σ_{k=1}^{depth} ψ^(k−1)(x)·c^k ε^k / k!  = ln Γ(x+cε) − ln Γ(x)   (Taylor series of ln Γ). */
function logGammaIncrement<C>(ctx: ExpansionContext<C>, x: Affine, c: Q, depth: number): LaurentSeries<C> {
  const { ring } = ctx;
  const coeffs: C[] = [ring.zero()];
  let factorial = 1n;
  for (let k = 1; k <= depth; k++) {
    factorial *= BigInt(k);
    const ck = qPowInt(c, k);
    coeffs.push(ring.scale(ctx.psi(k - 1, x), ck.num, ck.den * factorial));
  }
  return LaurentSeries.of(ring, 0, coeffs, depth);
}

/**
 * Laurent expansion of Γ(x + cε)^{±1} to `depth` terms beyond its leading power.
 * At a pole x = −n: Γ(−n+δ) = Γ(1+δ) / (δ(δ−1)…(δ−n)), leading term (−1)^n/(n!·δ) (DLMF 5.2.1).
 */
export function gammaSeries<C>(ctx: ExpansionContext<C>, arg: GammaArgument, depth: number, reciprocal = false): LaurentSeries<C> {
  const { ring } = ctx;
  const x = ctx.resolve(arg.x);
  const n = poleIndex(x);
  if (qIsZero(arg.c)) {
    if (n !== null) fail('pole', `Gamma(${affineToString(arg.x)}) sits on a pole independent of eps`);
    const value = ctx.gamma(x);
    return LaurentSeries.constant(ring, reciprocal ? ring.inverse(value) : value, depth);
  }
  if (n === null) {
    const increment = logGammaIncrement(ctx, x, arg.c, depth);
    const value = ctx.gamma(x);
    const exp = (reciprocal ? increment.neg() : increment).exp();
    return exp.mulCoefficient(reciprocal ? ring.inverse(value) : value);
  }
  // pole of order one at ε = 0
  const one = affine(q(1));
  const gammaOnePlus = gammaSeries(ctx, { x: one, c: arg.c }, depth, reciprocal);
  let product = gammaOnePlus;
  for (let j = 1n; j <= n; j++) {
    const linear = LaurentSeries.of(ring, 0, [ring.fromRational(-j), ring.fromRational(arg.c.num, arg.c.den)], depth);
    product = reciprocal ? product.mul(linear) : product.mul(linear.inverse());
  }
  const delta = LaurentSeries.of(ring, 1, [ring.fromRational(arg.c.num, arg.c.den)], 1 + depth);
  return reciprocal ? product.mul(delta) : product.mul(delta.inverse());
}

/** Leading power of Γ(arg)^power: −power at a pole that moves with ε, otherwise 0. */
export function leadingPower(ctx: ExpansionContext<unknown>, f: GammaFactor): number {
  const x = ctx.resolve(f.arg.x);
  if (poleIndex(x) !== null) {
    if (qIsZero(f.arg.c)) fail('pole', `Gamma(${affineToString(f.arg.x)}) sits on a pole independent of eps`);
    return -f.power;
  }
  return 0;
}

/**
 * prefactor × Π Γ(x_i + c_i ε)^{p_i} through ε^order; each factor is expanded just deep enough
 * (order minus the total leading power), so the product is exact through ε^order.
 */
export function gammaProductSeries<C>(ctx: ExpansionContext<C>, factors: GammaFactor[], order: number, prefactor: Q = q(1)): LaurentSeries<C> {
  const { ring } = ctx;
  if (qIsZero(prefactor)) return LaurentSeries.of(ring, 0, [], order);
  const lowest = factors.reduce((s, f) => s + leadingPower(ctx, f), 0);
  const depth = order - lowest;
  if (depth < 0) return LaurentSeries.of(ring, order + 1, [], order);
  let result = LaurentSeries.constant(ring, ring.fromRational(prefactor.num, prefactor.den), Infinity);
  for (const f of factors) {
    if (f.power === 0) continue;
    const base = gammaSeries(ctx, f.arg, depth, f.power < 0);
    result = result.mul(base.powInteger(Math.abs(f.power)));
  }
  if (result.isExact) result = LaurentSeries.of(ring, 0, result.coefficients(), order);
  return result.truncate(order);
}
