import { fail } from '../precision';
import { type Affine, affineKey } from './affine';
import { type Q, Q0, q, qAdd, qIsInteger, qIsZero, qMul, qToString } from './rational';
import { type RatFunc, ratAdd, ratConstant, ratConstantValue, ratInverse, ratIsZero, ratMul, ratScale } from './ratfunc';

/** The transcendental building blocks of a symbolic coefficient. */
export type Atom =
  | { kind: 'pi' }
  | { kind: 'log2' }
  | { kind: 'eulergamma' }
  | { kind: 'zeta'; n: number } // odd n ≥ 3 (even values reduce to π^n)
  | { kind: 'psi'; order: number; arg: Affine }
  | { kind: 'gamma'; arg: Affine }
  /** P(s): the period of the non-reducible three-loop graph (docs/tetrahedron.md); P(2) = 6ζ(3) is reduced on construction. */
  | { kind: 'tetrahedron'; arg: Affine };

export function atomKey(a: Atom): string {
  switch (a.kind) {
    case 'pi':
      return 'pi';
    case 'log2':
      return 'log(2)';
    case 'eulergamma':
      return 'eulergamma';
    case 'zeta':
      return `zeta(${a.n})`;
    case 'psi':
      return `psi(${a.order}, ${affineKey(a.arg)})`;
    case 'gamma':
      return `gamma(${affineKey(a.arg)})`;
    case 'tetrahedron':
      return `tetrahedron(${affineKey(a.arg)})`;
  }
}

/** Ordering of atoms inside a monomial and of monomials inside a sum (printing order). */
const KIND_RANK: Record<Atom['kind'], number> = { pi: 0, log2: 1, eulergamma: 2, zeta: 3, psi: 4, gamma: 5, tetrahedron: 6 };

export interface Power {
  atom: Atom;
  exponent: Q;
}
/** Product of atom powers, sorted by atom key; exponents non-zero (π may have half-integer powers). */
export type Monomial = ReadonlyArray<Power>;

export function monomialKey(m: Monomial): string {
  return m.map((p) => (p.exponent.num === 1n && p.exponent.den === 1n ? atomKey(p.atom) : `${atomKey(p.atom)}^${qToString(p.exponent)}`)).join('*');
}

function compareAtoms(a: Atom, b: Atom): number {
  const r = KIND_RANK[a.kind] - KIND_RANK[b.kind];
  if (r !== 0) return r;
  const ka = atomKey(a);
  const kb = atomKey(b);
  return ka < kb ? -1 : ka > kb ? 1 : 0;
}

export function multiplyMonomials(a: Monomial, b: Monomial): Monomial {
  const map = new Map<string, Power>();
  for (const p of [...a, ...b]) {
    const key = atomKey(p.atom);
    const prev = map.get(key);
    map.set(key, { atom: p.atom, exponent: prev ? qAdd(prev.exponent, p.exponent) : p.exponent });
  }
  return [...map.values()].filter((p) => !qIsZero(p.exponent)).sort((x, y) => compareAtoms(x.atom, y.atom));
}

export function monomialPower(m: Monomial, e: Q): Monomial {
  return m.map((p) => ({ atom: p.atom, exponent: qMul(p.exponent, e) }));
}

export interface Term {
  coeff: RatFunc;
  monomial: Monomial;
}

/**
 * A symbolic coefficient: Σ ratfunc × monomial, keyed by monomial, in canonical form
 * (like monomials collected, zero terms dropped). Build atoms through ./canonical so that
 * shifted arguments are reduced before they reach this map.
 */
export class Expression {
  readonly terms: ReadonlyMap<string, Term>;

  constructor(terms: Iterable<Term>) {
    const map = new Map<string, Term>();
    for (const t of terms) {
      const key = monomialKey(t.monomial);
      const prev = map.get(key);
      const coeff = prev ? ratAdd(prev.coeff, t.coeff) : t.coeff;
      if (ratIsZero(coeff)) map.delete(key);
      else map.set(key, { coeff, monomial: t.monomial });
    }
    this.terms = map;
  }

  static rational(c: Q): Expression {
    return new Expression(qIsZero(c) ? [] : [{ coeff: ratConstant(c), monomial: [] }]);
  }

  static ratfunc(r: RatFunc): Expression {
    return new Expression([{ coeff: r, monomial: [] }]);
  }

  static atomPower(atom: Atom, exponent: Q = q(1)): Expression {
    return new Expression([{ coeff: ratConstant(q(1)), monomial: [{ atom, exponent }] }]);
  }

  isZero(): boolean {
    return this.terms.size === 0;
  }

  /** The value when the expression is a plain rational number, else null. */
  rationalValue(): Q | null {
    if (this.terms.size === 0) return Q0;
    if (this.terms.size !== 1) return null;
    const t = this.terms.get('');
    return t ? ratConstantValue(t.coeff) : null;
  }

  add(other: Expression): Expression {
    return new Expression([...this.terms.values(), ...other.terms.values()]);
  }

  neg(): Expression {
    return this.scale(q(-1));
  }

  sub(other: Expression): Expression {
    return this.add(other.neg());
  }

  scale(c: Q): Expression {
    return new Expression([...this.terms.values()].map((t) => ({ coeff: ratScale(t.coeff, c), monomial: t.monomial })));
  }

  mulRatFunc(r: RatFunc): Expression {
    return new Expression([...this.terms.values()].map((t) => ({ coeff: ratMul(t.coeff, r), monomial: t.monomial })));
  }

  mul(other: Expression): Expression {
    const out: Term[] = [];
    for (const a of this.terms.values()) for (const b of other.terms.values()) out.push({ coeff: ratMul(a.coeff, b.coeff), monomial: multiplyMonomials(a.monomial, b.monomial) });
    return new Expression(out);
  }

  /** Exact inverse of a single term (a sum of several monomials has no inverse in this algebra). */
  inverse(): Expression {
    if (this.terms.size === 0) fail('domain', 'division by zero');
    if (this.terms.size > 1) fail('not-representable', 'symbolic division by a sum of several terms is not supported');
    const [t] = this.terms.values();
    return new Expression([{ coeff: ratInverse(t.coeff), monomial: monomialPower(t.monomial, q(-1)) }]);
  }

  /** Integer or (for a bare monomial) rational power. */
  pow(e: Q): Expression {
    if (qIsInteger(e)) {
      let n = Number(e.num);
      let base: Expression = this;
      if (n < 0) {
        base = this.inverse();
        n = -n;
      }
      let result = Expression.rational(q(1));
      for (let i = 0; i < n; i++) result = result.mul(base);
      return result;
    }
    if (this.terms.size === 1) {
      const [t] = this.terms.values();
      const c = ratConstantValue(t.coeff);
      if (c && c.num === 1n && c.den === 1n) return new Expression([{ coeff: t.coeff, monomial: monomialPower(t.monomial, e) }]);
    }
    return fail('not-representable', 'fractional power of a symbolic coefficient');
  }

  equals(other: Expression): boolean {
    return this.sub(other).isZero();
  }
}
