import { type DerivedFlow } from '../diagrams/renormalization';
import { type FixedPoint } from '../fixedpoints/fixedPoints';
import { type CouplingPolynomial } from '../models/couplingPolynomial';
import { fail } from '../precision/errors';
import type Decimal from 'decimal.js';
import { type Real, realContext } from '../precision/real';
import { LaurentSeries } from '../series/laurent';
import { Expression } from '../symbolic/expression';
import { polyFromAffine } from '../symbolic/polynomial';
import { ratFromPoly } from '../symbolic/ratfunc';

import { SERIES_QUANTITIES, type Quantity } from '../../jobs/contract/exponents';

export { SERIES_QUANTITIES, type Quantity };

/** How each exponent follows from the RG functions (stated in results). */
export const RELATIONS: Record<Quantity, string> = {
  nuInv: '1/ν = s − γ_{φ²}(g*)',
  omega: 'ω = smallest eigenvalue of ∂β_i/∂g_j at g* (symbolic N with two couplings: the eigenvalue other than the radial one, ε + O(ε²))',
  eta: 'η = 2 − s + 2γ_φ(g*)',
  Delta_phi: 'Δ_φ = (d − 2 + η)/2 = (d − s)/2 + γ_φ',
  Delta_phi2: 'Δ_{φ²} = d − 1/ν',
  Delta_phi3: 'Δ_{φ³} = d − Δ_φ (shadow relation of the non-local equation of motion)',
  Delta_phi4: 'Δ_{φ⁴} = d + ω',
  nu: 'ν = 1/(1/ν)',
  gamma: 'γ = ν(2 − η) (Fisher)',
  alpha: 'α = 2 − dν (hyperscaling)',
  beta: 'β = ν(d − 2 + η)/2 = ν Δ_φ (value for s < 2: the truncated ν times the exact Δ_φ = (d − s)/2)',
  delta: 'δ = (d + 2 − η)/(d − 2 + η) = Δ_{φ³}/Δ_φ (value for s < 2: exactly (d + s)/(d − s), both dimensions being exact)',
};

/** p(g(ε)) for a coupling polynomial evaluated on coupling series. */
export function onSeries<C>(p: CouplingPolynomial<C>, g: readonly LaurentSeries<C>[], order: number): LaurentSeries<C> {
  const ring = p.ring;
  let sum = LaurentSeries.of(ring, 0, [], order);
  for (const t of p.terms.values()) {
    let term = LaurentSeries.constant(ring, t.coeff, order);
    t.powers.forEach((e, k) => {
      for (let i = 0; i < e; i++) term = term.mul(g[k]);
    });
    sum = sum.add(term.truncate(order));
  }
  return sum;
}

export type ExponentSeries<C> = Record<Quantity, LaurentSeries<C>>;

/** s as a coefficient: a number, or the parameter s as a symbolic expression. */
function sCoefficient<C>(flow: DerivedFlow<C>): C {
  const calc = flow.calculus;
  if (calc.sValue) return calc.ctx.ring.fromRational(calc.sValue.num, calc.sValue.den);
  return Expression.ratfunc(ratFromPoly(polyFromAffine(calc.s))) as unknown as C;
}

/**
 * Every exponent at a fixed point as an ε-series at fixed s through ε^loops, derived from the
 * RG functions and the scaling relations in RELATIONS (d = 2s − ε).
 */
export function exponentSeries<C>(flow: DerivedFlow<C>, point: FixedPoint<C>, singletGamma?: LaurentSeries<C>): ExponentSeries<C> {
  const { ring } = flow.calculus.ctx;
  const order = flow.loops;
  if (!point.couplingSeries) fail('not-representable', `fixed point ${point.name} has no real ε-series`);
  const g = point.couplingSeries;
  if (!flow.gammaPhi2 && !singletGamma) fail('not-representable', `Δ_φ² is not defined for this model: ${flow.gammaPhi2Note ?? 'the φ² insertion mixes'}`);
  const constant = (c: C) => LaurentSeries.constant(ring, c, order);
  const number = (n: bigint, m = 1n) => constant(ring.fromRational(n, m));
  const s = constant(sCoefficient(flow));
  const eps = LaurentSeries.variable(ring, order);
  const d = s.scale(2n).sub(eps);
  const gammaPhi = onSeries(flow.gammaPhi, g, order);
  // singletGamma: γ of φ_aφ_a when it is an eigen-operator only at this fixed point (quadratic matrix)
  const gammaPhi2 = singletGamma ? singletGamma.truncate(order) : onSeries(flow.gammaPhi2 as CouplingPolynomial<C>, g, order);
  const omega = smallestEigenvalueSeries(point, order);
  const eta = number(2n).sub(s).add(gammaPhi.scale(2n));
  const nuInv = s.sub(gammaPhi2);
  const deltaPhi = d.sub(s).scale(1n, 2n).add(gammaPhi);
  const nu = nuInv.inverse().truncate(order);
  const deltaPhi3 = d.sub(deltaPhi);
  return {
    nuInv,
    omega,
    eta,
    Delta_phi: deltaPhi,
    Delta_phi2: d.sub(nuInv),
    Delta_phi3: deltaPhi3,
    Delta_phi4: d.add(omega),
    nu,
    gamma: nu.mul(number(2n).sub(eta)).truncate(order),
    alpha: number(2n).sub(d.mul(nu)).truncate(order),
    beta: nu.mul(deltaPhi).truncate(order),
    delta: deltaPhi3.mul(deltaPhi.inverse()).truncate(order),
  };
}

function smallestEigenvalueSeries<C>(point: FixedPoint<C>, order: number): LaurentSeries<C> {
  const series = point.eigenvalueSeries;
  if (!series || series.length === 0 || series.some((e) => e === null)) return fail('not-representable', `the stability eigenvalues of ${point.name} have no ε-series (degenerate or complex)`);
  if (series.length === 1) return (series[0] as LaurentSeries<C>).truncate(order);
  const all = series as LaurentSeries<C>[];
  const leading = all.map((e) => Number(String(e.coefficient(1))));
  if (leading.every(Number.isFinite)) return all[leading.indexOf(Math.min(...leading))].truncate(order);
  // symbolic N: the radial eigenvalue is ε + O(ε²); ω is the other one when exactly one other exists
  const ring = all[0].ring;
  const others = all.filter((e) => !ring.isZero(ring.sub(e.coefficient(1), ring.one())));
  if (others.length === 1 && all.length === 2) return others[0].truncate(order);
  return fail('not-representable', `ω at ${point.name}: which stability eigenvalue is smallest depends on N; give N as a number (e.g. "N":3)`);
}

/** Landau (Gaussian) values, exact for d ≥ 2s where the quartic coupling is irrelevant. */
export function meanFieldValues(d: string, s: string): Record<Quantity, string> & { statement: string } {
  const R = realContext(40);
  const S = new R(s);
  const text = (x: Real) => x.toSignificantDigits(30).toString();
  const values = meanFieldReals(new R(d), S);
  return {
    statement: `d = ${d} ≥ 2s = ${text(S.times(2))}: the Gaussian fixed point is IR-stable and mean-field exponents are exact (α, β, δ take their Landau values; hyperscaling does not hold above the upper critical dimension)`,
    ...(Object.fromEntries(SERIES_QUANTITIES.map((k) => [k, text(values[k])])) as Record<Quantity, string>),
  };
}

/** Landau (Gaussian) values as numbers in the precision of d and s (shared by the exponents job and scans). */
export function meanFieldReals(D: Real, S: Real): Record<Quantity, Real> {
  const R = D.constructor as typeof Decimal;
  return {
    nuInv: S,
    nu: new R(1).div(S),
    eta: new R(2).minus(S),
    gamma: new R(1),
    alpha: new R(0),
    beta: new R('0.5'),
    delta: new R(3),
    omega: D.minus(S.times(2)),
    Delta_phi: D.minus(S).div(2),
    Delta_phi2: D.minus(S),
    Delta_phi3: D.plus(S).div(2),
    Delta_phi4: D.minus(S).times(2),
  };
}

/**
 * For s < 2 there is no field renormalization: Δ_φ = (d − s)/2 and Δ_{φ³} = (d + s)/2 hold to all
 * orders (physics-notes §2), so δ = Δ_{φ³}/Δ_φ = (d + s)/(d − s) exactly and β = ν Δ_φ with the
 * exact Δ_φ (ν its truncated value). Returns the exact value of k, or null when k has none.
 */
export function exactLongRangeValue(k: Quantity, D: Real, S: Real, nu: () => Real): Real | null {
  if (!S.lt(2)) return null;
  switch (k) {
    case 'Delta_phi':
      return D.minus(S).div(2);
    case 'Delta_phi3':
      return D.plus(S).div(2);
    case 'delta':
      return D.plus(S).div(D.minus(S));
    case 'beta':
      return nu().times(D.minus(S).div(2));
    default:
      return null;
  }
}
