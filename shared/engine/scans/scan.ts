import type Decimal from 'decimal.js';
import { expressionValueAt } from '../flows';
import { type Real, GUARD_DIGITS, rationalToReal, realContext } from '../precision';
import { type Expression, type Q, q, qCompare, qMul, qSub } from '../symbolic';
import { type CheckedPade, checkedPade } from '../pade';
import { type Crossover, type Notice, type Quantity, crossoverS, meanFieldReals, scanRegimeNotices, valuesFromPrimaries } from '../exponents';

export { crossoverS };

/**
 * Evaluate exponent series whose coefficients are symbolic in s at many values of s: derived
 * once, then per point every distinct ψ/Γ atom is computed once and shared by all coefficients.
 */
export interface CompiledSeries {
  coefficients: Expression[];
}

export interface ScanPoint {
  s: Q;
  eps: Q;
  /** 'mean-field' for s ≤ d/2, 'short-range' for s ≥ s* and at s = 2, otherwise 'long-range'. */
  regime: 'mean-field' | 'long-range' | 'short-range';
  values: (Real | null)[];
  /** The [L/1] approximant with L = order − 1 of each series, null where it has no value (see padeDefects). */
  pade: (Real | null)[];
  /** Why a Padé value is missing (a pole between 0 and ε, a degenerate approximant); null where it has one. */
  padeDefects?: (string | null)[];
  /** With `keepCoefficients`: per quantity, the ε-series coefficients c_0, c_1, … evaluated at this s (working precision); absent at mean-field points. */
  coefficients?: Real[][];
  /** With `keepCoefficients` and `primaries`: the coefficients of 1/ν, ω and η, from which every printed value follows. */
  primaryCoefficients?: PrimaryCoefficients;
  /** What this point's values must be read with (regime, caveats of the fixed point). */
  notices: Notice[];
}

export interface PrimaryCoefficients {
  nuInv: Real[] | null;
  omega: Real[];
  eta: Real[];
}

/** The series of 1/ν (null when unavailable), ω and η: every printed value is computed from their values. */
export interface PrimarySeries {
  nuInv: CompiledSeries | null;
  omega: CompiledSeries;
  eta: CompiledSeries;
}

/** A point computed elsewhere (the s = 2 point, from the flow derived at s = 2). */
export interface ExternalPoint {
  values: (Real | null)[];
  pade: (Real | null)[];
  padeDefects: (string | null)[];
  notices: Notice[];
  fixedPoint: string;
}

export interface ScanRequest {
  d: Q;
  sValues: Q[];
  /** The series of each requested quantity (its Padé approximant and, without `primaries`, its value). */
  series: CompiledSeries[];
  /** What each series is; with it, points with s ≤ d/2 get the exact mean-field values (no Padé). */
  quantities?: readonly Quantity[];
  /** With quantities: values follow from 1/ν, ω and η by the stated relations (valuesFromPrimaries). */
  primaries?: PrimarySeries;
  /** One coupling: β = −εu + quadratic·u² + cubic·u³ + quartic·u⁴; a point where this truncated β has no real root on the branch is noted. */
  beta?: { quadratic: Expression; cubic: Expression | null; quartic?: Expression | null };
  digits: number;
  shortRangeS: Q | null;
  /** Where s* came from (for the notices); its sStar equals shortRangeS. */
  crossover?: Crossover | null;
  /** Also evaluate the [L/1] Padé approximant at each point (default true). */
  withPade?: boolean;
  /** Told the fraction of points done, about a hundred times per scan. */
  onProgress?: (fraction: number) => void;
  /** Keep each point's numeric series coefficients (ScanPoint.coefficients), e.g. for truncations and Padé variants. */
  keepCoefficients?: boolean;
  /** The point s = 2 (the short-range theory), computed from the flow derived there; without it s = 2 uses the series in s. */
  shortRangePoint?: (eps: Q) => ExternalPoint;
}

export function meanFieldEnd(d: Q): Q {
  return qMul(d, q(1, 2));
}

export type Regime = ScanPoint['regime'];

/** s = 2 is the short-range (local) theory. */
export function isShortRangePoint(s: Q): boolean {
  return qCompare(s, q(2)) >= 0;
}

/**
 * Visit every s of a scan grid with its ε = 2s − d and regime (mean-field for s ≤ d/2, short-range
 * for s ≥ s* and at s = 2), reporting progress about a hundred times.
 */
export function walkGrid<T>(
  grid: { d: Q; sValues: Q[]; shortRangeS: Q | null; onProgress?: (fraction: number) => void },
  visit: (s: Q, eps: Q, regime: Regime) => T,
): T[] {
  const half = meanFieldEnd(grid.d);
  const total = grid.sValues.length;
  const reportEvery = Math.max(1, Math.floor(total / 100));
  return grid.sValues.map((s, index) => {
    if (grid.onProgress && index % reportEvery === 0) grid.onProgress(index / total);
    const beyond = isShortRangePoint(s) || (grid.shortRangeS !== null && qCompare(s, grid.shortRangeS) >= 0);
    const regime: Regime = qCompare(s, half) <= 0 ? 'mean-field' : beyond ? 'short-range' : 'long-range';
    return visit(s, qSub(qMul(q(2), s), grid.d), regime);
  });
}

/** The exact mean-field values of the quantities at s ≤ d/2 (no Padé there). */
export function meanFieldPoint(d: Q, s: Q, eps: Q, quantities: readonly Quantity[], digits: number, crossover: Crossover | null): ScanPoint {
  const work = digits + GUARD_DIGITS;
  const out = realContext(digits);
  const mf = meanFieldReals(rationalToReal(d, work), rationalToReal(s, work));
  return {
    s,
    eps,
    regime: 'mean-field',
    values: quantities.map((k) => new out(mf[k]).toSignificantDigits(digits)),
    pade: quantities.map(() => null),
    notices: scanRegimeNotices(d, s, crossover),
  };
}

export function scanSeries(request: ScanRequest): ScanPoint[] {
  const work = request.digits + GUARD_DIGITS;
  const crossover = request.crossover ?? null;
  return walkGrid(request, (s, eps, regime) => {
    if (regime === 'mean-field' && request.quantities) return meanFieldPoint(request.d, s, eps, request.quantities, request.digits, crossover);
    if (request.shortRangePoint && isShortRangePoint(s)) {
      const { fixedPoint: _name, ...external } = request.shortRangePoint(eps);
      return { s, eps, regime, ...external, notices: [...scanRegimeNotices(request.d, s, crossover), ...external.notices] };
    }
    const atoms = new Map<string, Real>();
    const at = { s };
    const epsReal = rationalToReal(eps, work);
    const evaluate = (series: CompiledSeries) => series.coefficients.map((c) => expressionValueAt(c, at, work, atoms));
    const coefficients = request.series.map(evaluate);
    const primaries = request.quantities && request.primaries ? evaluatePrimaries(request.primaries, evaluate) : null;
    const values = primaries ? printedValues(request.quantities as readonly Quantity[], primaries, request.d, s, epsReal, request.digits) : coefficients.map((c) => rounded(sumAt(c, epsReal), request.digits));
    const padeOf = coefficients.map((c) => (request.withPade === false ? null : scanPade(c, epsReal, request.digits)));
    const notices = [...scanRegimeNotices(request.d, s, crossover), ...oneCouplingNotices(request, primaries, at, epsReal, atoms, work)];
    return {
      s,
      eps,
      regime,
      values,
      ...padeFields(padeOf),
      notices,
      ...(request.keepCoefficients ? { coefficients, ...(primaries ? { primaryCoefficients: primaries } : {}) } : {}),
    };
  });
}

function evaluatePrimaries(primaries: PrimarySeries, evaluate: (series: CompiledSeries) => Real[]): PrimaryCoefficients {
  return { nuInv: primaries.nuInv ? evaluate(primaries.nuInv) : null, omega: evaluate(primaries.omega), eta: evaluate(primaries.eta) };
}

/** Σ c_k ε^k (Horner). */
export function sumAt(coefficients: Real[], eps: Real): Real {
  return coefficients.reduceRight((v, c) => v.times(eps).plus(c), eps.mul(0));
}

function rounded(x: Real, digits: number): Real {
  return new (realContext(digits))(x).toSignificantDigits(digits);
}

/** The printed values of the requested quantities from the primaries truncated at `order` (all of them by default). */
export function printedValues(quantities: readonly Quantity[], primaries: PrimaryCoefficients, d: Q, s: Q, eps: Real, digits: number, order = Infinity): (Real | null)[] {
  const work = digits + GUARD_DIGITS;
  const truncated = (c: Real[]) => sumAt(c.slice(0, order + 1), eps);
  const values = valuesFromPrimaries({ nuInv: primaries.nuInv ? truncated(primaries.nuInv) : null, omega: truncated(primaries.omega), eta: truncated(primaries.eta) }, rationalToReal(d, work), rationalToReal(s, work));
  return quantities.map((k) => (values[k] === null ? null : rounded(values[k] as Real, digits)));
}

/** The [L/1] approximant with L = order − 1, checked between 0 and ε (null without enough coefficients). */
export function scanPade(coefficients: Real[], eps: Real, digits: number): CheckedPade | null {
  if (coefficients.length < 2) return null;
  return checkedPade(coefficients, coefficients.length - 2, 1, eps, digits);
}

export function padeFields(checked: (CheckedPade | null)[]): Pick<ScanPoint, 'pade' | 'padeDefects'> {
  const pade = checked.map((c) => c?.value ?? null);
  const defects = checked.map((c) => c?.reason ?? null);
  return defects.some((r) => r !== null) ? { pade, padeDefects: defects } : { pade };
}

/**
 * One coupling: the fixed point's branch u(ε) solves ε = E(u) = b₂u + b₃u² + b₄u³ (β/u = 0), starting at
 * u = 0. It stays real up to the physical ε exactly when E is monotone from u = 0 until it reaches ε:
 * with u_c the first zero of E′(u) = b₂ + 2b₃u + 3b₄u² in the direction of travel (sign of ε/b₂), the
 * branch is complex at ε when |ε| > |E(u_c)|. Two loops (b₄ = 0): b₂² + 4b₃ε < 0.
 */
export function branchIsComplexAt(b2: Real, b3: Real, b4: Real, eps: Real): boolean {
  if (b2.isZero() || eps.isZero()) return false;
  const direction = eps.div(b2).isPositive() ? 1 : -1;
  const R = b2.constructor as typeof Decimal;
  // zeros of E′(u) = 3b₄u² + 2b₃u + b₂
  const critical: Real[] = [];
  if (b4.isZero()) {
    if (!b3.isZero()) critical.push(b2.neg().div(b3.times(2)));
  } else {
    const disc = b3.times(b3).minus(b4.times(b2).times(3));
    if (!disc.isNegative()) {
      const root = disc.sqrt();
      critical.push(b3.neg().plus(root).div(b4.times(3)), b3.neg().minus(root).div(b4.times(3)));
    }
  }
  const ahead = critical.filter((u) => (direction > 0 ? u.isPositive() : u.isNegative()) && !u.isZero()).sort((x, y) => x.abs().comparedTo(y.abs()));
  if (ahead.length === 0) return false;
  const uc = ahead[0];
  const reach = b2.times(uc).plus(b3.times(uc.pow(2))).plus(b4.times(uc.pow(3)));
  return eps.abs().gt(new R(reach).abs());
}

function oneCouplingNotices(request: ScanRequest, primaries: PrimaryCoefficients | null, at: Record<string, Q>, eps: Real, atoms: Map<string, Real>, work: number): Notice[] {
  const notices: Notice[] = [];
  if (request.beta?.cubic || request.beta?.quartic) {
    const value = (e: Expression | null | undefined) => (e ? expressionValueAt(e, at, work, atoms) : eps.mul(0));
    const [b2, b3, b4] = [value(request.beta.quadratic), value(request.beta.cubic), value(request.beta.quartic)];
    if (branchIsComplexAt(b2, b3, b4, eps)) notices.push({ kind: 'complex-at-eps', message: 'the fixed point is complex there: the truncated β has no real root at that ε. The values are the truncated ε-series of its real branch.' });
  }
  if (primaries && !sumAt(primaries.omega, eps).isPositive()) notices.push({ kind: 'not-ir-stable', message: 'ω ≤ 0: the fixed point is not IR-stable there.' });
  return notices;
}
