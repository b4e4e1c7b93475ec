import { flowAt } from '../flows';
import { type DerivedFlow } from '../diagrams';
import { type Crossover, type Quantity, exponentSeriesPartial, fixedPointNotices, powerCoefficients, scanRegimeNotices } from '../exponents';
import { type FixedPoint, findFixedPoints } from '../fixedpoints';
import { type ModelSpec } from '../models';
import { type Real, EngineError } from '../precision';
import { type LaurentSeries } from '../series';
import { type Expression, type Q, q, qCompare } from '../symbolic';
import { type ExternalPoint, type PrimaryCoefficients, type ScanPoint, isShortRangePoint, meanFieldPoint, padeFields, printedValues, scanPade, walkGrid } from './scan';

/**
 * Scans of models with several couplings: the flow is derived once symbolically in s; at each
 * grid point its coefficients are evaluated (each ψ/Γ atom once), the fixed points are solved at
 * that ε (one-loop roots, ε-series, Newton on the truncated β from the series value), one is
 * chosen, and the exponent series are evaluated at ε.
 */
export interface FlowScanRequest {
  model: ModelSpec;
  /** The flow symbolic in s (numeric N). */
  flow: DerivedFlow<Expression>;
  d: Q;
  sValues: Q[];
  quantities: readonly Quantity[];
  digits: number;
  shortRangeS: Q | null;
  /** Where s* came from (for the notices). */
  crossover?: Crossover | null;
  /** The point s = 2 (the short-range theory), from the flow derived there. */
  shortRangePoint?: (eps: Q) => ExternalPoint;
  /** Picks the fixed point at a grid point (throws EngineError when none fits). */
  choose: (points: FixedPoint<Real>[]) => FixedPoint<Real>;
  onProgress?: (fraction: number) => void;
  /** Keep each point's numeric series coefficients at its fixed point (ScanPoint.coefficients). */
  keepCoefficients?: boolean;
}

export interface FlowScanPoint extends ScanPoint {
  /** The fixed point used at this s (null when none could be chosen; values are then null). */
  fixedPoint: string | null;
  note?: string;
}

/** The symbolic-in-s flow as numbers at one s (coefficients evaluated with shared atoms). */
export function flowAtS(flow: DerivedFlow<Expression>, s: Q, digits: number): DerivedFlow<Real> {
  return flowAt(flow, { s }, digits, { withTrail: false });
}

export function scanFlow(request: FlowScanRequest): FlowScanPoint[] {
  const crossover = request.crossover ?? null;
  return walkGrid(request, (s, eps, regime): FlowScanPoint => {
    if (regime === 'mean-field') {
      // s ≤ d/2: the Gaussian point is IR-stable and the mean-field values are exact (no series at ε ≤ 0)
      return { ...meanFieldPoint(request.d, s, eps, request.quantities, request.digits, crossover), fixedPoint: 'Gaussian', note: 'mean-field (Gaussian) values, exact for s ≤ d/2' };
    }
    const regimeNotices = scanRegimeNotices(request.d, s, crossover);
    if (request.shortRangePoint && isShortRangePoint(s)) {
      try {
        const { fixedPoint, ...external } = request.shortRangePoint(eps);
        return { s, eps, regime, ...external, notices: [...regimeNotices, ...external.notices], fixedPoint };
      } catch (e) {
        if (!(e instanceof EngineError)) throw e;
        return { s, eps, regime, values: request.quantities.map(() => null), pade: request.quantities.map(() => null), notices: regimeNotices, fixedPoint: null, note: e.message };
      }
    }
    const flow = flowAtS(request.flow, s, request.digits);
    const { ring } = flow.calculus.ctx;
    const epsReal = ring.fromRational(eps.num, eps.den);
    const empty = { s, eps, regime, values: request.quantities.map(() => null), pade: request.quantities.map(() => null), notices: regimeNotices };
    try {
      // at ε ≤ 0 there is no non-trivial root to polish: choose by the ε-series (leading-order stability)
      const positive = qCompare(eps, q(0)) > 0;
      const points = findFixedPoints(request.model, flow, { eps: positive ? epsReal : null });
      const point = request.choose(points);
      const { series, unavailable } = exponentSeriesPartial(flow, point);
      const coefficient = (k: Quantity) => (series[k] ? powerCoefficients(series[k] as LaurentSeries<Real>) : null);
      const primaries: PrimaryCoefficients = { nuInv: coefficient('nuInv'), omega: coefficient('omega') as Real[], eta: coefficient('eta') as Real[] };
      const values = printedValues(request.quantities, primaries, request.d, s, epsReal, request.digits);
      const kept = request.quantities.map((k) => coefficient(k));
      const checked = kept.map((c) => (c ? scanPade(c, epsReal, request.digits) : null));
      const notices = [...regimeNotices, ...fixedPointNotices(point, positive)];
      const missing = request.quantities.find((k) => unavailable[k]);
      return {
        ...empty,
        values,
        ...padeFields(checked),
        notices,
        fixedPoint: point.name,
        ...(missing ? { note: unavailable[missing] } : {}),
        ...(request.keepCoefficients ? { coefficients: kept.map((c) => c ?? []), primaryCoefficients: primaries } : {}),
      };
    } catch (e) {
      if (!(e instanceof EngineError)) throw e;
      return { ...empty, fixedPoint: null, note: e.message };
    }
  });
}
