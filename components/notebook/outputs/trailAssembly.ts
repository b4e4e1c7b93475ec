import Decimal from 'decimal.js';
import type { CouplingTerm, TrailEntry } from '../../../shared/jobs/contract';

/**
 * How the pole parts of the trail's graphs assemble into the counterterms (Z-factors) and then into β and
 * γ_{φ²}, as docs/physics.md §1 states it: u₀ = u + Σ_k a_k/ε^k with a_k = −Σ_G W_G·(K R̄ I_G)_k over the
 * four-point graphs (the tensor weight W_G carries the sign and 1/|Aut|), β = −εu + Σ_L L·a₁⁽ᴸ⁾; the φ²
 * insertion likewise gives Z_t and γ_{φ²} = (g·∂) z₁. Only numeric trails assemble (symbolic N or s do not).
 */
const Precise = Decimal.clone({ precision: 60 });
const SHOWN_DIGITS = 20;

export interface PoleSum {
  /** Power k of 1/ε → coupling polynomial a_k. */
  poles: Map<number, CouplingTerm[]>;
  /** The RG function the simple poles give (β or γ_{φ²} without the −εg term). */
  derived: CouplingTerm[];
}

const parseNumber = (text: string): Decimal | null => {
  const fraction = /^\s*([+-]?\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  if (fraction) return new Precise(fraction[1]).div(fraction[2]);
  return /^\s*[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?\s*$/.test(text) ? new Precise(text.trim()) : null;
};

/** Total degree of a monomial in the couplings: "u^2" → 2, "u*v^2" → 3. */
export function degreeOf(monomial: string): number {
  return monomial.split('*').reduce((sum, factor) => sum + Number(/\^(\d+)$/.exec(factor)?.[1] ?? 1), 0);
}

function addTo(target: Map<string, Decimal>, monomial: string, value: Decimal) {
  target.set(monomial, (target.get(monomial) ?? new Precise(0)).plus(value));
}

const asTerms = (sums: Map<string, Decimal>): CouplingTerm[] =>
  [...sums].filter(([, value]) => !value.isZero()).sort(([a], [b]) => degreeOf(a) - degreeOf(b)).map(([monomial, value]) => ({ monomial, coeff: value.toSignificantDigits(SHOWN_DIGITS).toString() }));

/**
 * The pole parts of the graphs of one function summed into a_k (k = 1, 2, …) for one projection (a coupling,
 * or "δ_ab"), and what the simple poles give: `loops` weighs each a₁⁽ᴸ⁾ by L (β), `degree` by the monomial's degree (g·∂, γ_{φ²}).
 * Null when a weight or pole coefficient is not a number.
 */
export function assemblePoles(trail: TrailEntry[], fn: TrailEntry['function'], projection: string, weighBy: 'loops' | 'degree'): PoleSum | null {
  const poles = new Map<number, Map<string, Decimal>>();
  const derived = new Map<string, Decimal>();
  for (const graph of trail.filter((entry) => entry.function === fn)) {
    if (!Array.isArray(graph.weight)) return null;
    for (const { monomial, projections } of graph.weight) {
      const weight = projections[projection] === undefined ? new Precise(0) : parseNumber(projections[projection]);
      if (!weight) return null;
      for (const [index, coefficient] of graph.pole.coeffs.entries()) {
        const k = -(graph.pole.lowest + index);
        if (k < 1) continue;
        const pole = typeof coefficient === 'string' ? parseNumber(coefficient) : null;
        if (!pole) return null;
        const term = weight.neg().times(pole);
        if (!poles.has(k)) poles.set(k, new Map());
        addTo(poles.get(k)!, monomial, term);
        if (k === 1) addTo(derived, monomial, term.times(weighBy === 'loops' ? graph.loops : degreeOf(monomial)));
      }
    }
  }
  return { poles: new Map([...poles].map(([k, sums]) => [k, asTerms(sums)])), derived: asTerms(derived) };
}

/** Whether two coupling polynomials agree to `digits` significant digits in every coefficient. */
export function samePolynomial(a: CouplingTerm[], b: CouplingTerm[], digits = 12): boolean {
  const value = (terms: CouplingTerm[]) => new Map(terms.flatMap((term) => {
    const number = typeof term.coeff === 'string' ? parseNumber(term.coeff) : null;
    return number && !number.isZero() ? [[term.monomial, number] as const] : [];
  }));
  const left = value(a);
  const right = value(b);
  if (left.size !== right.size) return false;
  return [...left].every(([monomial, number]) => right.has(monomial) && number.minus(right.get(monomial)!).abs().lte(number.abs().times(`1e-${digits}`)));
}
