import { type CoefficientRing } from '../series';

/** A monomial Π g_k^{powers[k]} with a coefficient in some ring (numbers or symbolic expressions). */
export interface CouplingTerm<C> {
  readonly powers: readonly number[];
  readonly coeff: C;
}

const keyOf = (powers: readonly number[]) => powers.join(',');

/** A polynomial in the model's couplings; coefficients live in a series coefficient ring. */
export class CouplingPolynomial<C> {
  readonly ring: CoefficientRing<C>;
  readonly variables: number;
  readonly terms: ReadonlyMap<string, CouplingTerm<C>>;

  constructor(ring: CoefficientRing<C>, variables: number, terms: Iterable<CouplingTerm<C>> = []) {
    this.ring = ring;
    this.variables = variables;
    const map = new Map<string, CouplingTerm<C>>();
    for (const t of terms) {
      const key = keyOf(t.powers);
      const prev = map.get(key);
      const coeff = prev ? ring.add(prev.coeff, t.coeff) : t.coeff;
      if (ring.isZero(coeff)) map.delete(key);
      else map.set(key, { powers: t.powers, coeff });
    }
    this.terms = map;
  }

  static monomial<C>(ring: CoefficientRing<C>, powers: readonly number[], coeff: C): CouplingPolynomial<C> {
    return new CouplingPolynomial(ring, powers.length, [{ powers, coeff }]);
  }

  static coupling<C>(ring: CoefficientRing<C>, variables: number, k: number): CouplingPolynomial<C> {
    return CouplingPolynomial.monomial(ring, Array.from({ length: variables }, (_, j) => (j === k ? 1 : 0)), ring.one());
  }

  add(other: CouplingPolynomial<C>): CouplingPolynomial<C> {
    return new CouplingPolynomial(this.ring, this.variables, [...this.terms.values(), ...other.terms.values()]);
  }

  sub(other: CouplingPolynomial<C>): CouplingPolynomial<C> {
    return this.add(other.scale(this.ring.fromRational(-1n)));
  }

  scale(c: C): CouplingPolynomial<C> {
    return new CouplingPolynomial(this.ring, this.variables, [...this.terms.values()].map((t) => ({ powers: t.powers, coeff: this.ring.mul(t.coeff, c) })));
  }

  mul(other: CouplingPolynomial<C>): CouplingPolynomial<C> {
    const out: CouplingTerm<C>[] = [];
    for (const a of this.terms.values()) for (const b of other.terms.values()) out.push({ powers: a.powers.map((p, k) => p + b.powers[k]), coeff: this.ring.mul(a.coeff, b.coeff) });
    return new CouplingPolynomial(this.ring, this.variables, out);
  }

  derivative(k: number): CouplingPolynomial<C> {
    const out: CouplingTerm<C>[] = [];
    for (const t of this.terms.values()) {
      if (t.powers[k] === 0) continue;
      out.push({ powers: t.powers.map((p, j) => (j === k ? p - 1 : p)), coeff: this.ring.scale(t.coeff, BigInt(t.powers[k])) });
    }
    return new CouplingPolynomial(this.ring, this.variables, out);
  }

  /** Σ_j v_j ∂_j p: the derivative along a vector field of polynomials. */
  along(vector: readonly CouplingPolynomial<C>[]): CouplingPolynomial<C> {
    let sum = new CouplingPolynomial<C>(this.ring, this.variables);
    vector.forEach((v, j) => (sum = sum.add(v.mul(this.derivative(j)))));
    return sum;
  }

  evaluate(values: readonly C[]): C {
    let sum = this.ring.zero();
    for (const t of this.terms.values()) {
      let term = t.coeff;
      t.powers.forEach((p, k) => {
        for (let i = 0; i < p; i++) term = this.ring.mul(term, values[k]);
      });
      sum = this.ring.add(sum, term);
    }
    return sum;
  }

  /** The part of total degree `degree`. */
  homogeneous(degree: number): CouplingPolynomial<C> {
    return new CouplingPolynomial(this.ring, this.variables, [...this.terms.values()].filter((t) => t.powers.reduce((s, p) => s + p, 0) === degree));
  }

  map<D>(ring: CoefficientRing<D>, f: (c: C) => D): CouplingPolynomial<D> {
    return new CouplingPolynomial(ring, this.variables, [...this.terms.values()].map((t) => ({ powers: t.powers, coeff: f(t.coeff) })));
  }

  isZero(): boolean {
    return this.terms.size === 0;
  }

  /** Terms ordered by total degree, then lexicographically by powers (for printing). */
  sortedTerms(): CouplingTerm<C>[] {
    const deg = (t: CouplingTerm<C>) => t.powers.reduce((s, p) => s + p, 0);
    return [...this.terms.values()].sort((a, b) => deg(a) - deg(b) || keyOf(b.powers).localeCompare(keyOf(a.powers)));
  }
}
