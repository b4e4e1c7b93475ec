import { type DerivedFlow } from '../diagrams';
import { type FixedPoint } from '../fixedpoints';
import { type CouplingPolynomial } from '../models';
import { type Real, fail, realContext } from '../precision';
import type Decimal from 'decimal.js';
import { LaurentSeries } from '../series';
import { type Q, Expression, polyFromAffine, q, qCompare, ratFromPoly } from '../symbolic';

import { SERIES_QUANTITIES, type Quantity } from '../../jobs/contract/exponents';

export { SERIES_QUANTITIES, type Quantity };

/**
 * Where a result stands: the long-range theory (0 < s < 2), the short-range theory (s = 2, with field
 * renormalization), series symbolic in s (generic s < 2), or the Gaussian regime d ≥ 2s.
 */
export type ExponentRegime = 'long-range' | 'short-range' | 'any-s' | 'mean-field';

const RELATIONS_COMMON: Record<Quantity, string> = {
  nuInv: '1/ν = s − γ_{φ²}(g*)',
  omega: 'ω = smallest eigenvalue of ∂β_i/∂g_j at g* (symbolic N with two couplings: the eigenvalue other than the radial one, ε + O(ε²))',
  eta: 'η = 2 − s + 2γ_φ(g*)',
  Delta_phi: 'Δ_φ = (d − 2 + η)/2 = (d − s)/2 + γ_φ',
  Delta_phi2: 'Δ_{φ²} = d − 1/ν',
  Delta_phi3: 'Δ_{φ³} = d − Δ_φ (shadow relation of the non-local equation of motion, s < 2; at s = 2: Δ_{φ³} = Δ_φ + 2)',
  Delta_phi4: 'Δ_{φ⁴} = d + ω',
  nu: 'ν = 1/(1/ν)',
  gamma: 'γ = ν(2 − η) (Fisher)',
  alpha: 'α = 2 − dν (hyperscaling)',
  beta: 'β = νΔ_φ = ν(d − 2 + η)/2 (hyperscaling)',
  delta: 'δ = (d − Δ_φ)/Δ_φ = (d + 2 − η)/(d − 2 + η) (hyperscaling; for s < 2 also Δ_{φ³}/Δ_φ by the shadow relation)',
};

/** How each exponent follows from the RG functions, as it holds in the regime of the result. */
export function relationsFor(regime: ExponentRegime): Record<Quantity, string> {
  switch (regime) {
    case 'long-range':
      return {
        ...RELATIONS_COMMON,
        eta: 'η = 2 − s + 2γ_φ(g*) = 2 − s exactly (no field renormalization for s < 2)',
        Delta_phi3: 'Δ_{φ³} = d − Δ_φ (shadow relation of the non-local equation of motion, s < 2)',
        delta: 'δ = (d − Δ_φ)/Δ_φ = (d + 2 − η)/(d − 2 + η) = Δ_{φ³}/Δ_φ (hyperscaling and the shadow relation)',
      };
    case 'short-range':
      return {
        ...RELATIONS_COMMON,
        eta: 'η = 2 − s + 2γ_φ(g*) (field renormalization at s = 2)',
        Delta_phi3: 'Δ_{φ³} = Δ_φ + 2 (at s = 2, φ³ is a descendant of φ by the local equation of motion)',
        delta: 'δ = (d − Δ_φ)/Δ_φ = (d + 2 − η)/(d − 2 + η) (hyperscaling)',
      };
    case 'mean-field':
      return {
        nuInv: '1/ν = s (Gaussian: γ_{φ²} = 0)',
        omega: 'ω = d − 2s = −ε (the quartic coupling is irrelevant)',
        eta: 'η = 2 − s (Gaussian)',
        Delta_phi: RELATIONS_COMMON.Delta_phi,
        Delta_phi2: RELATIONS_COMMON.Delta_phi2,
        Delta_phi3: 'Δ_{φ³} = 3Δ_φ (Gaussian composite operator)',
        Delta_phi4: RELATIONS_COMMON.Delta_phi4,
        nu: RELATIONS_COMMON.nu,
        gamma: RELATIONS_COMMON.gamma,
        alpha: 'α = 0 (Landau; the hyperscaling value 2 − dν agrees only at d = 2s)',
        beta: 'β = 1/2 (Landau; νΔ_φ agrees only at d = 2s)',
        delta: 'δ = Δ_{φ³}/Δ_φ = 3 (Landau)',
      };
    case 'any-s':
      return RELATIONS_COMMON;
  }
}

/** How each exponent follows from the RG functions (series symbolic in s; see relationsFor). */
export const RELATIONS: Record<Quantity, string> = relationsFor('any-s');

/**
 * Where each printed value comes from: 1/ν, ω and η are the truncated series at the physical ε (η is
 * exact for s < 2); every other value is computed from those printed values by its relation, so each
 * stated relation holds for the printed numbers. The series of every quantity stay its own expansion.
 */
export function sourcesFor(regime: ExponentRegime): Record<Quantity, string> {
  const sources = unorderedSources(regime);
  return Object.fromEntries(SERIES_QUANTITIES.map((k) => [k, sources[k]])) as Record<Quantity, string>;
}

function unorderedSources(regime: ExponentRegime): Record<Quantity, string> {
  const derived = {
    Delta_phi: '(d − 2 + η)/2 from the value of η',
    Delta_phi2: 'd − 1/ν from the value of 1/ν',
    Delta_phi4: 'd + ω from the value of ω',
    nu: '1/(1/ν) from the value of 1/ν (not the truncated series of ν)',
    gamma: 'ν(2 − η) from the values of ν and η',
  };
  if (regime === 'mean-field') {
    return {
      ...derived,
      nuInv: 'Landau value s',
      omega: 'Landau value d − 2s',
      eta: 'Landau value 2 − s',
      Delta_phi3: '3Δ_φ',
      alpha: 'Landau value 0',
      beta: 'Landau value 1/2',
      delta: 'Δ_{φ³}/Δ_φ = 3',
    };
  }
  const shortRange = regime === 'short-range';
  return {
    ...derived,
    nuInv: 'truncated ε-series of 1/ν at the physical ε',
    omega: 'truncated ε-series of ω at the physical ε',
    eta: shortRange ? 'truncated ε-series of η at the physical ε' : 'exact: 2 − s (the truncated series equals it)',
    Delta_phi3: shortRange ? 'Δ_φ + 2 from the value of Δ_φ' : 'd − Δ_φ from the value of Δ_φ',
    alpha: '2 − dν from the value of ν',
    beta: 'νΔ_φ from the values of ν and Δ_φ',
    delta: '(d − Δ_φ)/Δ_φ from the value of Δ_φ',
  };
}

/** The regime of a numeric s (null: symbolic s) at ε = 2s − d (null: series only). */
export function exponentRegime(s: Q | null, eps: Q | null): ExponentRegime {
  if (eps && qCompare(eps, q(0)) <= 0) return 'mean-field';
  if (!s) return 'any-s';
  return qCompare(s, q(2)) >= 0 ? 'short-range' : 'long-range';
}

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

/** The quantities that need 1/ν (unavailable when the φ² insertion mixes and no singlet is an eigen-operator). */
export const NEED_NU_INV: readonly Quantity[] = ['nuInv', 'Delta_phi2', 'nu', 'gamma', 'alpha', 'beta'];

/** The quantities that need one η for every field (unavailable when γ_φ differs between field directions at the point). */
export const NEED_SINGLE_ETA: readonly Quantity[] = ['eta', 'Delta_phi', 'Delta_phi3', 'gamma', 'beta', 'delta'];

/** γ_φ at a fixed point when it is a matrix (s = 2, anisotropic models): one series for every field, or the reason there is none. */
export type FieldGamma<C> = { proportional: true; gamma: LaurentSeries<C> } | { proportional: false; reason: string };

export interface PartialExponentSeries<C> {
  series: Partial<ExponentSeries<C>>;
  /** Quantity → why it has no series. */
  unavailable: Partial<Record<Quantity, string>>;
}

/**
 * Every exponent at a fixed point as an ε-series at fixed s through ε^loops, derived from the
 * RG functions and the scaling relations in RELATIONS (d = 2s − ε). Throws when one is unavailable.
 */
export function exponentSeries<C>(flow: DerivedFlow<C>, point: FixedPoint<C>, singletGamma?: LaurentSeries<C>): ExponentSeries<C> {
  const { series, unavailable } = exponentSeriesPartial(flow, point, singletGamma);
  const missing = Object.values(unavailable)[0];
  if (missing) fail('not-representable', missing);
  return series as ExponentSeries<C>;
}

/**
 * As exponentSeries, but when the φ² insertion mixes and no singlet γ is given, the quantities that
 * do not need 1/ν are still given and the others are listed in `unavailable` with the reason.
 */
export function exponentSeriesPartial<C>(flow: DerivedFlow<C>, point: FixedPoint<C>, singletGamma?: LaurentSeries<C>, fieldGamma?: FieldGamma<C>): PartialExponentSeries<C> {
  const { ring } = flow.calculus.ctx;
  const order = flow.loops;
  if (!point.couplingSeries) fail('not-representable', `fixed point ${point.name} has no real ε-series`);
  const g = point.couplingSeries;
  const constant = (c: C) => LaurentSeries.constant(ring, c, order);
  const number = (n: bigint, m = 1n) => constant(ring.fromRational(n, m));
  const s = constant(sCoefficient(flow));
  const eps = LaurentSeries.variable(ring, order);
  const d = s.scale(2n).sub(eps);
  const gammaPhi = fieldGamma?.proportional ? fieldGamma.gamma.truncate(order) : onSeries(flow.gammaPhi, g, order);
  const omega = smallestEigenvalueSeries(point, order);
  const eta = number(2n).sub(s).add(gammaPhi.scale(2n));
  const deltaPhi = d.sub(s).scale(1n, 2n).add(gammaPhi);
  // s = 2: φ³ is a descendant of φ (local equation of motion); s < 2: the shadow of φ (non-local one)
  const shortRange = flow.calculus.sValue !== undefined && flow.calculus.sValue !== null && qCompare(flow.calculus.sValue, q(2)) >= 0;
  const deltaPhi3 = shortRange ? deltaPhi.add(number(2n)) : d.sub(deltaPhi);
  const series: Partial<ExponentSeries<C>> = {
    omega,
    eta,
    Delta_phi: deltaPhi,
    Delta_phi3: deltaPhi3,
    Delta_phi4: d.add(omega),
    delta: d.sub(deltaPhi).mul(deltaPhi.inverse()).truncate(order),
  };
  // singletGamma: γ of φ_aφ_a when it is an eigen-operator only at this fixed point (quadratic matrix)
  const gammaPhi2 = singletGamma ? singletGamma.truncate(order) : flow.gammaPhi2 ? onSeries(flow.gammaPhi2, g, order) : null;
  const unavailable: Partial<Record<Quantity, string>> = {};
  if (fieldGamma && !fieldGamma.proportional) for (const k of NEED_SINGLE_ETA) unavailable[k] = fieldGamma.reason;
  if (!gammaPhi2) {
    const reason = `Δ_φ² is not defined for this model: ${flow.gammaPhi2Note ?? 'the φ² insertion mixes'}`;
    for (const k of NEED_NU_INV) unavailable[k] ??= reason;
  }
  if (!gammaPhi2) {
    for (const k of Object.keys(unavailable) as Quantity[]) delete series[k];
    return { series, unavailable };
  }
  const nuInv = s.sub(gammaPhi2);
  const nu = nuInv.inverse().truncate(order);
  Object.assign(series, {
    nuInv,
    Delta_phi2: d.sub(nuInv),
    nu,
    gamma: nu.mul(number(2n).sub(eta)).truncate(order),
    alpha: number(2n).sub(d.mul(nu)).truncate(order),
    beta: nu.mul(deltaPhi).truncate(order),
  });
  for (const k of Object.keys(unavailable) as Quantity[]) delete series[k];
  return { series, unavailable };
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

/** Landau (Gaussian) values, exact for d ≥ 2s where the quartic coupling is irrelevant (marginal at d = 2s). */
export function meanFieldValues(d: string, s: string, digits = 30): Record<Quantity, string> & { statement: string } {
  const R = realContext(digits + 10);
  const S = new R(s);
  const D = new R(d);
  const text = (x: Real) => x.toSignificantDigits(digits).toString();
  const values = meanFieldReals(D, S);
  const statement = D.eq(S.times(2))
    ? `d = 2s = ${text(D)} is the upper critical dimension: the Gaussian fixed point is IR-stable and the mean-field exponents hold with logarithmic corrections (the quartic coupling is marginally irrelevant)`
    : `d = ${d} > 2s = ${text(S.times(2))}: the Gaussian fixed point is IR-stable and mean-field exponents are exact (α, β, δ take their Landau values; hyperscaling does not hold above the upper critical dimension)`;
  return { statement, ...(Object.fromEntries(SERIES_QUANTITIES.map((k) => [k, text(values[k])])) as Record<Quantity, string>) };
}

/** Landau (Gaussian) values as numbers in the precision of d and s (shared by the exponents job and scans). */
export function meanFieldReals(D: Real, S: Real): Record<Quantity, Real> {
  const R = D.constructor as typeof Decimal;
  const deltaPhi = D.minus(S).div(2);
  return {
    nuInv: S,
    nu: new R(1).div(S),
    eta: new R(2).minus(S),
    gamma: new R(1),
    alpha: new R(0),
    beta: new R('0.5'),
    delta: new R(3),
    omega: D.minus(S.times(2)),
    Delta_phi: deltaPhi,
    Delta_phi2: D.minus(S),
    // Gaussian composite: Δ_{φ³} = 3Δ_φ (equal to the shadow value (d + s)/2 only at d = 2s)
    Delta_phi3: deltaPhi.times(3),
    Delta_phi4: D.minus(S).times(2),
  };
}

/** The values every other printed value is computed from: the truncated series at ε (1/ν null when unavailable). */
export interface PrimaryValues {
  nuInv: Real | null;
  omega: Real;
  /** Null when γ_φ differs between field directions (s = 2, anisotropic point). */
  eta: Real | null;
}

/**
 * Every printed value from 1/ν, ω and η at the physical ε by the relations of sourcesFor, so each
 * stated relation holds for the printed numbers. For s < 2, η = 2 − s exactly (no field
 * renormalization), which makes Δ_φ = (d − s)/2, Δ_{φ³} = (d + s)/2 and δ = (d + s)/(d − s) exact.
 * A value that would divide by zero is null.
 */
export function valuesFromPrimaries(primaries: PrimaryValues, D: Real, S: Real): Record<Quantity, Real | null> {
  const R = D.constructor as typeof Decimal;
  const two = new R(2);
  const shortRange = S.gte(2);
  const eta = shortRange ? primaries.eta : two.minus(S);
  const deltaPhi = eta === null ? null : D.minus(two).plus(eta).div(2);
  const nuInv = primaries.nuInv;
  const nu = nuInv && !nuInv.isZero() ? new R(1).div(nuInv) : null;
  return {
    nuInv,
    omega: primaries.omega,
    eta,
    Delta_phi: deltaPhi,
    Delta_phi2: nuInv ? D.minus(nuInv) : null,
    Delta_phi3: deltaPhi === null ? null : shortRange ? deltaPhi.plus(two) : D.minus(deltaPhi),
    Delta_phi4: D.plus(primaries.omega),
    nu,
    gamma: nu && eta !== null ? nu.times(two.minus(eta)) : null,
    alpha: nu ? two.minus(D.times(nu)) : null,
    beta: nu && deltaPhi !== null ? nu.times(deltaPhi) : null,
    delta: deltaPhi === null || deltaPhi.isZero() ? null : D.minus(deltaPhi).div(deltaPhi),
  };
}

/** c_0 … c_order of a series (zeros below its lowest stored power). */
export function powerCoefficients<C>(series: LaurentSeries<C>): C[] {
  const ring = series.ring;
  const zeros = Array.from({ length: Math.max(0, series.lowest) }, () => ring.zero());
  return [...zeros, ...series.coefficients().slice(Math.max(0, -series.lowest))];
}
