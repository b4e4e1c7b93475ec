import { type Real, GUARD_DIGITS, rationalToReal, realContext } from '../precision/real';
import { evaluateAtom } from '../symbolic/evaluate';
import { type Expression, atomKey } from '../symbolic/expression';
import { type Q, qCompare, qSub, qMul, q } from '../symbolic/rational';
import { ratEvaluate } from '../symbolic/ratfunc';
import { evaluatePade, padeApproximant } from '../pade/pade';
import { type Quantity, exactLongRangeValue, meanFieldReals } from '../exponents/exponents';

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
  /** 'mean-field' for s ≤ d/2, 'short-range' for s ≥ s*, otherwise 'long-range'. */
  regime: 'mean-field' | 'long-range' | 'short-range';
  values: Real[];
  pade: (Real | null)[];
  /** With `keepCoefficients`: per quantity, the ε-series coefficients c_0, c_1, … evaluated at this s (working precision); absent at mean-field points. */
  coefficients?: Real[][];
}

export function evaluateAtPoint(e: Expression, at: Record<string, Q>, digits: number, atoms: Map<string, Real>): Real {
  const R = realContext(digits);
  let sum = new R(0);
  for (const t of e.terms.values()) {
    let term = rationalToReal(ratEvaluate(t.coeff, at), digits);
    for (const p of t.monomial) {
      const key = atomKey(p.atom);
      let base = atoms.get(key);
      if (!base) {
        base = evaluateAtom(p.atom, at, digits);
        atoms.set(key, base);
      }
      term = term.times(p.exponent.den === 1n ? base.pow(p.exponent.num.toString()) : base.pow(new R(p.exponent.num.toString()).div(p.exponent.den.toString())));
    }
    sum = sum.plus(term);
  }
  return sum;
}

export interface ScanRequest {
  d: Q;
  sValues: Q[];
  series: CompiledSeries[];
  /** What each series is; with it, points with s ≤ d/2 get the exact mean-field values (no Padé). */
  quantities?: readonly Quantity[];
  /** The ν series: with quantities, δ and β take their exact long-range values for s < 2 (β = ν·(d − s)/2). */
  nu?: CompiledSeries;
  digits: number;
  shortRangeS: Q | null;
  /** Also evaluate the [L/1] Padé approximant at each point (default true). */
  withPade?: boolean;
  /** Told the fraction of points done, about a hundred times per scan. */
  onProgress?: (fraction: number) => void;
  /** Keep each point's numeric series coefficients (ScanPoint.coefficients), e.g. for truncations and Padé variants. */
  keepCoefficients?: boolean;
}

export function meanFieldEnd(d: Q): Q {
  return qMul(d, q(1, 2));
}

/** s* = d − 2Δσ of the short-range theory (crossover to short-range behaviour). */
export function crossoverS(d: Q, deltaSigma: Q): Q {
  return qSub(d, qMul(q(2), deltaSigma));
}

export type Regime = ScanPoint['regime'];

/**
 * Visit every s of a scan grid with its ε = 2s − d and regime (mean-field for s ≤ d/2, short-range
 * for s ≥ s*), reporting progress about a hundred times.
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
    const regime: Regime = qCompare(s, half) <= 0 ? 'mean-field' : grid.shortRangeS && qCompare(s, grid.shortRangeS) >= 0 ? 'short-range' : 'long-range';
    return visit(s, qSub(qMul(q(2), s), grid.d), regime);
  });
}

export function scanSeries(request: ScanRequest): ScanPoint[] {
  const work = request.digits + GUARD_DIGITS;
  const R = realContext(work);
  const out = realContext(request.digits);
  return walkGrid(request, (s, eps, regime) => {
    if (regime === 'mean-field' && request.quantities) {
      const mf = meanFieldReals(rationalToReal(request.d, work), rationalToReal(s, work));
      return { s, eps, regime, values: request.quantities.map((k) => new out(mf[k]).toSignificantDigits(request.digits)), pade: request.quantities.map(() => null) };
    }
    const atoms = new Map<string, Real>();
    const at = { s };
    const epsReal = rationalToReal(eps, work);
    const values: Real[] = [];
    const pade: (Real | null)[] = [];
    const kept: Real[][] = [];
    for (const series of request.series) {
      const coeffs = series.coefficients.map((c) => evaluateAtPoint(c, at, work, atoms));
      if (request.keepCoefficients) kept.push(coeffs);
      let v = new R(0);
      for (let k = coeffs.length - 1; k >= 0; k--) v = v.times(epsReal).plus(coeffs[k]);
      values.push(new out(v).toSignificantDigits(request.digits));
      pade.push(request.withPade === false ? null : padeValue(coeffs, epsReal, request.digits));
    }
    if (request.quantities && request.nu) {
      const nuCoeffs = request.nu.coefficients.map((c) => evaluateAtPoint(c, at, work, atoms));
      const nu = () => nuCoeffs.reduceRight((v, c) => v.times(epsReal).plus(c), new R(0));
      request.quantities.forEach((k, i) => {
        const exact = exactLongRangeValue(k, rationalToReal(request.d, work), rationalToReal(s, work), nu);
        if (exact) values[i] = new out(exact).toSignificantDigits(request.digits);
      });
    }
    return request.keepCoefficients ? { s, eps, regime, values, pade, coefficients: kept } : { s, eps, regime, values, pade };
  });
}

/** [1/1] (or [L/1] with L = order − 1) at ε, or null when degenerate. */
export function padeValue(coeffs: Real[], eps: Real, digits: number): Real | null {
  if (coeffs.length < 3) return null;
  try {
    return evaluatePade(padeApproximant(coeffs, coeffs.length - 2, 1, digits), eps, digits);
  } catch {
    return null;
  }
}
