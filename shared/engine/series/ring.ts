/**
 * The operations a Laurent series needs from its coefficients. Two implementations exist:
 * numeric (arbitrary-precision decimals) and symbolic (exact canonical expressions), so every
 * series algorithm is written once.
 */
export interface CoefficientRing<C> {
  readonly kind: 'numeric' | 'symbolic';
  zero(): C;
  one(): C;
  fromRational(num: bigint, den?: bigint): C;
  add(a: C, b: C): C;
  sub(a: C, b: C): C;
  mul(a: C, b: C): C;
  neg(a: C): C;
  /** Multiply by the rational num/den. */
  scale(a: C, num: bigint, den?: bigint): C;
  /** Exact multiplicative inverse; throws EngineError('not-representable' | 'domain') when impossible. */
  inverse(a: C): C;
  /** Exact zero test (numeric mode: the stored value is exactly zero). */
  isZero(a: C): boolean;
  /** exp, log and rational powers of a constant coefficient (may be unavailable symbolically). */
  exp(a: C): C;
  log(a: C): C;
  powRational(a: C, num: bigint, den: bigint): C;
}
