import { type FixedPoint } from '../fixedpoints';
import { type Real, realContext } from '../precision';
import { type Q, q, qCompare, qMul } from '../symbolic';
import { type Crossover } from './shortRange';

/** What a result must say at its top: a caveat of the fixed point used or of the regime. */
export interface Notice {
  kind: string;
  message: string;
}

const text = (x: Q) => {
  const R = realContext(30);
  return new R(x.num.toString()).div(x.den.toString()).toSignificantDigits(12).toString();
};

/**
 * The chosen point's caveats (filled by the fixed-point layer), plus a complex status or a stability
 * other than "IR-stable" when no caveat already says so. `atEps`: the point was solved at a physical ε
 * (without one, stability is not decided and that is not a caveat of the series).
 */
export function fixedPointNotices<C>(point: FixedPoint<C>, atEps: boolean): Notice[] {
  const notices: Notice[] = (point.caveats ?? []).map((c) => ({ kind: c.kind, message: c.message }));
  const said = new Set(notices.map((n) => n.kind));
  if (point.status === 'complex' && !said.has('complex-at-eps')) {
    notices.push({ kind: 'complex-at-eps', message: `The ${point.name} fixed point is complex at this ε: the truncated β has no real root there. The values are the truncated ε-series of its real branch.` });
  }
  if (point.status === 'degenerate' && !said.has('degenerate-one-loop')) {
    notices.push({ kind: 'degenerate-one-loop', message: `The ${point.name} fixed point is degenerate at one loop (${point.notes.join('; ') || 'it merges with another point'}).` });
  }
  // a complex point is never IR-stable, and its caveat says so
  const stabilitySaid = said.has('stability-sign-disagrees') || said.has('complex-at-eps');
  if (point.stable === false && !stabilitySaid) {
    notices.push({ kind: 'not-ir-stable', message: `The ${point.name} fixed point is not IR-stable at this ε: a stability eigenvalue is negative, so it describes a multicritical or unstable point, not the generic transition.` });
  }
  if (point.stable === null && atEps && !stabilitySaid) {
    notices.push({ kind: 'stability-undecided', message: `Whether the ${point.name} fixed point is IR-stable at this ε could not be decided.` });
  }
  return notices;
}

/** Regime notices of a result at one (d, s): the short-range theory at s = 2, the crossover to short range, the Gaussian regime, d = 2s. */
export function regimeNotices(d: Q, s: Q, crossover: Crossover | null): Notice[] {
  const twoS = qMul(q(2), s);
  const atUpper = qCompare(d, twoS) === 0;
  if (atUpper) return [upperCriticalNotice(d)];
  if (qCompare(d, twoS) > 0) return [meanFieldNotice(d, s)];
  if (qCompare(s, q(2)) >= 0) return [shortRangeFlowNotice()];
  if (crossover && qCompare(s, crossover.sStar) >= 0) return [beyondCrossoverNotice(s, crossover)];
  return [];
}

/** s = 2: the local theory and its own flow (the same kind and words in an exponents result and at a scan's s = 2 point). */
export function shortRangeFlowNotice(): Notice {
  return { kind: 'short-range-flow', message: 's = 2 is the short-range (local) theory: its point uses the flow derived at s = 2 (with field renormalization, Δ_{φ³} = Δ_φ + 2), not the long-range series.' };
}

export function upperCriticalNotice(d: Q): Notice {
  return { kind: 'upper-critical-dimension', message: `d = 2s = ${text(d)} is the upper critical dimension: the mean-field exponents hold with logarithmic corrections (the quartic coupling is marginally irrelevant).` };
}

export function meanFieldNotice(d: Q, s: Q): Notice {
  return { kind: 'mean-field', message: `d = ${text(d)} > 2s = ${text(qMul(q(2), s))}: Gaussian regime. The mean-field exponents are exact; hyperscaling (α = 2 − dν, β = νΔ_φ) does not hold above the upper critical dimension.` };
}

export function beyondCrossoverNotice(s: Q, crossover: Crossover): Notice {
  return {
    kind: 'beyond-s-star',
    message: `s = ${text(s)} ≥ s* = ${text(crossover.sStar)} (${crossover.source}): beyond the crossover the short-range fixed point governs the critical behaviour, so these long-range values do not describe it.`,
  };
}

/** The φ² insertion mixes and φ_aφ_a is no eigen-operator: what is missing and why. */
export function noSingletNotice(pointName: string, reason: string, etaPerDirection = false): Notice {
  const available = etaPerDirection ? 'ω and Δ_{φ⁴} are, and η per field direction (see fieldAnomalous)' : 'η, Δ_φ, Δ_{φ³}, ω, Δ_{φ⁴} and δ are';
  return { kind: 'no-singlet', message: `${reason}. At the ${pointName} fixed point φ_aφ_a is not an eigen-operator, so 1/ν and what needs it (ν, γ, α, β, Δ_{φ²}) are not available; ${available}. See the quadratic operators.` };
}

/** γ_φ is a matrix whose eigenvalues differ at the point (s = 2, anisotropic models). */
export function fieldDirectionsNotice(reason: string): Notice {
  return { kind: 'eta-per-field', message: `${reason}.` };
}

/** The regime notices of one scan point, worded for the whole scan (d fixed, s varies). */
export function scanRegimeNotices(d: Q, s: Q, crossover: Crossover | null): Notice[] {
  const twoS = qMul(q(2), s);
  if (qCompare(d, twoS) === 0) return [upperCriticalNotice(d)];
  if (qCompare(d, twoS) > 0) return [{ kind: 'mean-field', message: `s < d/2 = ${text(qMul(d, q(1, 2)))}: Gaussian regime. The mean-field exponents are exact; hyperscaling (α = 2 − dν, β = νΔ_φ) does not hold there.` }];
  if (qCompare(s, q(2)) >= 0) return [shortRangeFlowNotice()];
  if (crossover && qCompare(s, crossover.sStar) >= 0) {
    return [{ kind: 'beyond-s-star', message: `s ≥ s* = ${text(crossover.sStar)} (${crossover.source}): beyond the crossover the short-range fixed point governs the critical behaviour, so the long-range values there do not describe it.` }];
  }
  return [];
}

/** A scan's notices: each kind once, with the values of s where it applies. */
export function scanNotices(perPoint: { s: Q; notices: Notice[] }[], digits: number): Notice[] {
  const byKind = new Map<string, { messages: string[]; s: Q[] }>();
  for (const p of perPoint) {
    const firstOfKind = p.notices.filter((n, i) => p.notices.findIndex((m) => m.kind === n.kind) === i);
    for (const n of firstOfKind) {
      const entry = byKind.get(n.kind) ?? { messages: [], s: [] };
      entry.messages.push(n.message);
      entry.s.push(p.s);
      byKind.set(n.kind, entry);
    }
  }
  const list = (values: Q[]) => {
    const shown = values.slice(0, 6).map((x) => shortText(x, digits));
    return values.length > 6 ? `${shown.join(', ')} and ${values.length - 6} more` : shown.join(', ');
  };
  return [...byKind.entries()].map(([kind, { messages, s }]) => {
    const same = messages.every((m) => m === messages[0]);
    return { kind, message: `At s = ${list(s)}${same ? '' : ` (as said at s = ${shortText(s[0], digits)})`}: ${messages[0]}` };
  });
}

function shortText(x: Q, digits: number): string {
  const R = realContext(digits + 5);
  return (new R(x.num.toString()).div(x.den.toString()) as Real).toSignificantDigits(Math.min(digits, 12)).toString();
}
