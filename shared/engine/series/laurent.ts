import { fail } from '../precision';
import { type CoefficientRing } from './ring';

/**
 * A truncated Laurent series Σ_{k=lowest}^{order} c_k ε^k + O(ε^{order+1}).
 * `order` is the highest power whose coefficient is determined; every operation computes the
 * order its result is exact to, so an undetermined coefficient is never produced.
 * Written here because no JavaScript package offers Laurent series over exact symbolic coefficients.
 */
export class LaurentSeries<C> {
  readonly ring: CoefficientRing<C>;
  readonly lowest: number;
  readonly order: number;
  private readonly coeffs: C[];

  private constructor(ring: CoefficientRing<C>, lowest: number, coeffs: C[], order: number) {
    this.ring = ring;
    this.lowest = lowest;
    this.order = order;
    this.coeffs = coeffs;
  }

  /** coeffs[i] is the coefficient of ε^(lowest+i); known through ε^order (default: the last given). */
  static of<C>(ring: CoefficientRing<C>, lowest: number, coeffs: C[], order = lowest + coeffs.length - 1): LaurentSeries<C> {
    const padded: C[] = coeffs.slice(0, Number.isFinite(order) ? Math.max(0, order - lowest + 1) : coeffs.length);
    if (Number.isFinite(order)) while (padded.length < order - lowest + 1) padded.push(ring.zero());
    return new LaurentSeries(ring, lowest, padded, order);
  }

  static constant<C>(ring: CoefficientRing<C>, c: C, order: number): LaurentSeries<C> {
    return LaurentSeries.of(ring, 0, [c], order);
  }

  /** The expansion variable ε itself, known through ε^order. */
  static variable<C>(ring: CoefficientRing<C>, order: number): LaurentSeries<C> {
    return LaurentSeries.of(ring, 0, [ring.zero(), ring.one()], order);
  }

  /** Coefficient of ε^k (zero below the lowest power); throws if k is beyond the known order. */
  coefficient(k: number): C {
    if (k > this.order) fail('invalid', `coefficient of eps^${k} is not determined (series known through eps^${this.order})`);
    return this.coefficientOrZero(k);
  }

  /** True for an exact polynomial (no truncation), e.g. a constant factor. */
  get isExact(): boolean {
    return !Number.isFinite(this.order);
  }

  /** Highest power with a stored coefficient. */
  private last(): number {
    return this.lowest + this.coeffs.length - 1;
  }

  private requireFinite(operation: string): void {
    if (!Number.isFinite(this.order)) fail('invalid', `${operation} needs a truncation order`);
  }

  /** Determined coefficients from ε^lowest through ε^order. */
  coefficients(): C[] {
    return this.coeffs.slice();
  }

  /** Power of the first non-zero coefficient, or order+1 when all known ones vanish. */
  valuation(): number {
    for (let i = 0; i < this.coeffs.length; i++) if (!this.ring.isZero(this.coeffs[i])) return this.lowest + i;
    return Number.isFinite(this.order) ? this.order + 1 : Infinity;
  }

  /** The same series with leading zero coefficients dropped from the representation. */
  trimmed(): LaurentSeries<C> {
    const v = this.valuation();
    if (v <= this.lowest || v > this.order) return this;
    return new LaurentSeries(this.ring, v, this.coeffs.slice(v - this.lowest), this.order);
  }

  truncate(order: number): LaurentSeries<C> {
    if (order >= this.order) return this;
    return LaurentSeries.of(this.ring, this.lowest, this.coeffs.slice(0, Math.max(0, order - this.lowest + 1)), order);
  }

  map(f: (c: C) => C): LaurentSeries<C> {
    return new LaurentSeries(this.ring, this.lowest, this.coeffs.map(f), this.order);
  }

  neg(): LaurentSeries<C> {
    return this.map((c) => this.ring.neg(c));
  }

  scale(num: bigint, den = 1n): LaurentSeries<C> {
    return this.map((c) => this.ring.scale(c, num, den));
  }

  mulCoefficient(c: C): LaurentSeries<C> {
    return this.map((a) => this.ring.mul(a, c));
  }

  /** Multiply by ε^k. */
  shift(k: number): LaurentSeries<C> {
    return new LaurentSeries(this.ring, this.lowest + k, this.coeffs, this.order + k);
  }

  add(other: LaurentSeries<C>): LaurentSeries<C> {
    const order = Math.min(this.order, other.order);
    const lowest = Math.min(this.lowest, other.lowest);
    const out: C[] = [];
    const top = Math.min(order, Math.max(this.last(), other.last()));
    for (let k = lowest; k <= top; k++) out.push(this.ring.add(this.coefficientOrZero(k), other.coefficientOrZero(k)));
    return new LaurentSeries(this.ring, lowest, out, order);
  }

  sub(other: LaurentSeries<C>): LaurentSeries<C> {
    return this.add(other.neg());
  }

  private coefficientOrZero(k: number): C {
    return k < this.lowest || k > this.last() ? this.ring.zero() : this.coeffs[k - this.lowest];
  }

  mul(other: LaurentSeries<C>): LaurentSeries<C> {
    const va = this.valuation();
    const vb = other.valuation();
    if (va === Infinity || vb === Infinity) {
      const order = Math.min(this.order + (vb === Infinity ? other.lowest : vb), other.order + (va === Infinity ? this.lowest : va));
      return LaurentSeries.of(this.ring, this.lowest + other.lowest, [], order);
    }
    const order = Math.min(this.order + vb, other.order + va);
    const lowest = this.lowest + other.lowest;
    const out: C[] = [];
    const top = Math.min(order, this.last() + other.last());
    for (let k = lowest; k <= top; k++) {
      let s = this.ring.zero();
      for (let i = Math.max(this.lowest, k - other.last()); i <= Math.min(this.last(), k - other.lowest); i++) {
        const a = this.coeffs[i - this.lowest];
        const b = other.coeffs[k - i - other.lowest];
        if (this.ring.isZero(a) || this.ring.isZero(b)) continue;
        s = this.ring.add(s, this.ring.mul(a, b));
      }
      out.push(s);
    }
    return new LaurentSeries(this.ring, lowest, out, order);
  }

  /** 1/f, exact to the relative depth of f. */
  inverse(): LaurentSeries<C> {
    this.requireFinite('inverse');
    const v = this.valuation();
    if (v > this.order) fail('domain', 'inverse of a series with no known non-zero coefficient');
    const depth = this.order - v;
    const a = (k: number) => this.coefficientOrZero(v + k);
    const leadInverse = this.ring.inverse(a(0));
    const b: C[] = [leadInverse];
    for (let n = 1; n <= depth; n++) {
      let s = this.ring.zero();
      for (let k = 1; k <= n; k++) if (!this.ring.isZero(a(k))) s = this.ring.add(s, this.ring.mul(a(k), b[n - k]));
      b.push(this.ring.neg(this.ring.mul(leadInverse, s)));
    }
    return new LaurentSeries(this.ring, -v, b, -v + depth);
  }

  div(other: LaurentSeries<C>): LaurentSeries<C> {
    return this.mul(other.inverse());
  }

  powInteger(n: number): LaurentSeries<C> {
    if (!Number.isInteger(n)) fail('invalid', 'integer power expected');
    if (n < 0) return this.inverse().powInteger(-n);
    let result = LaurentSeries.constant(this.ring, this.ring.one(), Infinity);
    let base: LaurentSeries<C> = this;
    let e = n;
    while (e > 0) {
      if (e & 1) result = result.mul(base);
      e >>= 1;
      if (e > 0) base = base.mul(base);
    }
    return n === 0 ? LaurentSeries.constant(this.ring, this.ring.one(), this.isExact ? Infinity : this.order - this.valuation()) : result;
  }

  /** f^(num/den) for a series whose leading power times num/den is an integer. */
  powRational(num: bigint, den: bigint): LaurentSeries<C> {
    if (den === 1n) return this.powInteger(Number(num));
    this.requireFinite('fractional power');
    const v = this.valuation();
    if (v > this.order) fail('domain', 'power of a series with no known non-zero coefficient');
    if ((BigInt(v) * num) % den !== 0n) fail('not-representable', 'fractional power would leave Laurent series');
    const depth = this.order - v;
    const lead = this.coeffs[v - this.lowest];
    const leadInverse = this.ring.inverse(lead);
    const w = (k: number) => this.ring.mul(this.coefficientOrZero(v + k), leadInverse);
    // (1+U)^α: n f_n = Σ_{k=1}^n (α k − (n − k)) w_k f_{n−k}
    const f: C[] = [this.ring.one()];
    for (let n = 1; n <= depth; n++) {
      let s = this.ring.zero();
      for (let k = 1; k <= n; k++) {
        const wk = w(k);
        if (this.ring.isZero(wk)) continue;
        const factorNum = num * BigInt(k) - BigInt(n - k) * den;
        s = this.ring.add(s, this.ring.scale(this.ring.mul(wk, f[n - k]), factorNum, den));
      }
      f.push(this.ring.scale(s, 1n, BigInt(n)));
    }
    const newLowest = Number((BigInt(v) * num) / den);
    const leadPower = this.ring.powRational(lead, num, den);
    return new LaurentSeries(this.ring, newLowest, f.map((c) => this.ring.mul(c, leadPower)), newLowest + depth);
  }

  /** exp(f) for f without negative powers. */
  exp(): LaurentSeries<C> {
    this.requireFinite('exp');
    if (this.valuation() < 0) fail('domain', 'exp of a series with a pole');
    const u = (k: number) => this.coefficientOrZero(k);
    const e: C[] = [this.ring.one()];
    for (let n = 1; n <= this.order; n++) {
      let s = this.ring.zero();
      for (let k = 1; k <= n; k++) if (!this.ring.isZero(u(k))) s = this.ring.add(s, this.ring.scale(this.ring.mul(u(k), e[n - k]), BigInt(k)));
      e.push(this.ring.scale(s, 1n, BigInt(n)));
    }
    const c0 = u(0);
    const factor = this.ring.isZero(c0) ? null : this.ring.exp(c0);
    return new LaurentSeries(this.ring, 0, factor ? e.map((c) => this.ring.mul(c, factor)) : e, this.order);
  }

  /** log(f) for f with a non-zero constant term and no poles. */
  log(): LaurentSeries<C> {
    this.requireFinite('log');
    if (this.valuation() !== 0) fail('domain', 'log needs a series with non-zero constant term and no poles');
    const a0 = this.coefficientOrZero(0);
    const a0Inverse = this.ring.inverse(a0);
    const a = (k: number) => this.ring.mul(this.coefficientOrZero(k), a0Inverse);
    // L' = A'/A  ⇒  n L_n = n a_n − Σ_{k=1}^{n−1} k L_k a_{n−k}
    const l: C[] = [this.ring.log(a0)];
    for (let n = 1; n <= this.order; n++) {
      let s = this.ring.scale(a(n), BigInt(n));
      for (let k = 1; k < n; k++) s = this.ring.sub(s, this.ring.scale(this.ring.mul(l[k], a(n - k)), BigInt(k)));
      l.push(this.ring.scale(s, 1n, BigInt(n)));
    }
    return new LaurentSeries(this.ring, 0, l, this.order);
  }

  /** f^g = exp(g·log f). */
  pow(exponent: LaurentSeries<C>): LaurentSeries<C> {
    return exponent.mul(this.log()).exp();
  }

  /** f(g(ε)) for g with g(0) = 0. */
  compose(inner: LaurentSeries<C>): LaurentSeries<C> {
    const vg = inner.valuation();
    if (vg < 1) fail('domain', 'composition needs an inner series without constant term or poles');
    if (vg > inner.order) fail('domain', 'composition with a series with no known non-zero coefficient');
    let result = LaurentSeries.constant(this.ring, this.ring.zero(), Infinity);
    // Horner down to the constant term, so a series starting at ε^k (k > 0) keeps its factor g^k.
    for (let k = Math.min(this.order, this.last()); k >= 0; k--) {
      result = result.mul(inner).add(LaurentSeries.constant(this.ring, this.coefficientOrZero(k), Infinity));
    }
    if (this.lowest < 0) {
      const innerInverse = inner.inverse();
      let power = LaurentSeries.constant(this.ring, this.ring.one(), Infinity);
      for (let k = -1; k >= this.lowest; k--) {
        power = power.mul(innerInverse);
        result = result.add(power.mulCoefficient(this.coefficient(k)));
      }
    }
    const truncationOrder = Number.isFinite(this.order) ? (this.order + 1) * vg - 1 : Infinity;
    return result.truncate(truncationOrder);
  }

  /** The inverse function h with f(h(x)) = x, for f = a_1 ε + a_2 ε² + … with a_1 invertible. */
  reversion(): LaurentSeries<C> {
    this.requireFinite('reversion');
    if (this.valuation() !== 1) fail('domain', 'reversion needs a series starting at eps^1');
    const a1Inverse = this.ring.inverse(this.coefficient(1));
    const n = this.order;
    const h: C[] = [this.ring.zero(), a1Inverse];
    for (let m = 2; m <= n; m++) {
      const trial = LaurentSeries.of(this.ring, 0, h, m);
      const composed = this.truncate(m).compose(trial);
      const excess = composed.coefficient(m);
      h.push(this.ring.neg(this.ring.mul(excess, a1Inverse)));
    }
    return LaurentSeries.of(this.ring, 0, h, n);
  }

  /** Σ c_k x^k over the known coefficients (the truncated sum). */
  evaluate(x: C): C {
    let sum = this.ring.zero();
    for (let k = Math.min(this.order, this.last()); k >= Math.max(0, this.lowest); k--) sum = this.ring.add(this.ring.mul(sum, x), this.coefficient(k));
    if (this.lowest < 0) {
      const xInverse = this.ring.inverse(x);
      let power = this.ring.one();
      for (let k = -1; k >= this.lowest; k--) {
        power = this.ring.mul(power, xInverse);
        sum = this.ring.add(sum, this.ring.mul(power, this.coefficient(k)));
      }
    }
    return sum;
  }
}
