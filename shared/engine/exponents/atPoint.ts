import { type DerivedFlow } from '../diagrams';
import { type FixedPoint } from '../fixedpoints';
import { type BorelValue, type CheckedPade, checkedPadeTable, padeBorelTable } from '../pade';
import { type Real } from '../precision';
import { type LaurentSeries } from '../series';
import { type Q } from '../symbolic';
import { type ExponentRegime, type ExponentSeries, type FieldGamma, type Quantity, SERIES_QUANTITIES, exponentRegime, exponentSeriesPartial, powerCoefficients, valuesFromPrimaries } from './exponents';
import { type FieldAnomalousSpectrum, fieldAnomalousSpectrum } from './fieldMatrix';
import { type Notice, fieldDirectionsNotice, fixedPointNotices, noSingletNotice, regimeNotices } from './notices';
import { type Crossover } from './shortRange';

/** Everything a result states about the exponents at one fixed point, one s and one physical ε. */
export interface ExponentsAtPoint {
  regime: ExponentRegime;
  series: Partial<ExponentSeries<Real>>;
  /** Quantity → why it has neither series nor value. */
  unavailable: Partial<Record<Quantity, string>>;
  /** Printed values (null where unavailable or undefined, e.g. a division by zero). */
  values: Record<Quantity, Real | null>;
  /** Every [L/M] (M ≥ 1, L + M ≤ loops) of each quantity's own series, checked for poles on the way to ε. */
  pade: Partial<Record<Quantity, CheckedPade[]>>;
  /** Padé–Borel sums of each quantity's own series: every Borel–Padé [L/M] with M ≥ 1 and L + M = loops (BOREL_METHOD). */
  borel: Partial<Record<Quantity, BorelValue[]>>;
  notices: Notice[];
  /** γ_φ per field direction when it is a matrix (s = 2, anisotropic models). */
  fieldSpectrum: FieldAnomalousSpectrum<Real> | null;
}

export interface PhysicalPoint {
  d: Q;
  s: Q;
  eps: Q;
  crossover: Crossover | null;
}

/**
 * The exponents at a numeric fixed point: series, values by the relations of sourcesFor, the checked
 * Padé table and the notices (the point's caveats, the regime, a missing 1/ν). The exponents job and a
 * scan's s = 2 point both come here, so they agree digit for digit.
 */
export function exponentsAtPoint(flow: DerivedFlow<Real>, point: FixedPoint<Real>, at: PhysicalPoint, digits: number, singletGamma?: LaurentSeries<Real>): ExponentsAtPoint {
  const { ring } = flow.calculus.ctx;
  const real = (x: Q) => ring.fromRational(x.num, x.den);
  const eps = real(at.eps);
  const fieldSpectrum = flow.gammaPhiMatrix ? fieldAnomalousSpectrum(flow, point, eps) : null;
  const { series, unavailable } = exponentSeriesPartial(flow, point, singletGamma, fieldGammaOf(fieldSpectrum, point.name));
  const valueOf = (k: 'nuInv' | 'omega' | 'eta') => series[k]?.evaluate(eps) ?? null;
  const values = valuesFromPrimaries({ nuInv: valueOf('nuInv'), omega: valueOf('omega') as Real, eta: valueOf('eta') }, real(at.d), real(at.s));
  for (const k of SERIES_QUANTITIES) if (values[k] === null && !unavailable[k]) unavailable[k] = 'undefined here (its relation divides by zero)';
  const pade: Partial<Record<Quantity, CheckedPade[]>> = {};
  const borel: Partial<Record<Quantity, BorelValue[]>> = {};
  for (const k of SERIES_QUANTITIES) {
    const s = series[k];
    if (!s) continue;
    pade[k] = checkedPadeTable(powerCoefficients(s), flow.loops, eps, digits);
    borel[k] = padeBorelTable(powerCoefficients(s), Math.min(flow.loops, s.order), eps, digits);
  }
  const notices = [...fixedPointNotices(point, true), ...regimeNotices(at.d, at.s, at.crossover)];
  // 1/ν is missing only when the φ² insertion mixes and no singlet is an eigen-operator here
  const fieldGamma = fieldGammaOf(fieldSpectrum, point.name);
  if (fieldGamma && !fieldGamma.proportional) notices.push(fieldDirectionsNotice(fieldGamma.reason));
  if (unavailable.nuInv) notices.push(noSingletNotice(point.name, unavailable.nuInv, !!fieldGamma && !fieldGamma.proportional));
  return { regime: exponentRegime(at.s, at.eps), series, unavailable, values, pade, borel, notices, fieldSpectrum };
}

/** One γ_φ for every field, or why η is given per field direction instead. */
export function fieldGammaOf<C>(spectrum: FieldAnomalousSpectrum<C> | null, pointName: string): FieldGamma<C> | undefined {
  if (!spectrum) return undefined;
  if (spectrum.proportional) return { proportional: true, gamma: spectrum.directions[0].gammaSeries };
  const fields = spectrum.directions.map((d) => d.field).join(', ');
  return { proportional: false, reason: `γ_φ differs between field directions at ${pointName} (${fields}): η and Δ_φ are given per direction in fieldAnomalous` };
}
