import { toExactRational } from '../precision';
import { type Q, q, qCompare, qMul, qSub } from '../symbolic';

/**
 * The short-range theory's Δσ (= Δ_φ at s = 2) for the presets where it is known, so the crossover
 * s* = d − 2Δσ is marked without typing it. Only values that can be attributed are listed.
 */
export interface ShortRangeReference {
  /** O(N) preset with this N, in this dimension. */
  N: number;
  d: number;
  system: string;
  deltaSigma: string;
  /** Uncertainty in the last digits as published, e.g. "(10)"; empty for an exact value. */
  uncertainty: string;
  source: string;
}

export const SHORT_RANGE_DELTA_SIGMA: readonly ShortRangeReference[] = [
  // exact: η = 1/4 of the 2D Ising model (Onsager 1944; Yang 1952) — common practice
  { N: 1, d: 2, system: '2D Ising', deltaSigma: '0.125', uncertainty: '', source: 'exact (Onsager; Yang), Δσ = 1/8' },
  { N: 1, d: 3, system: '3D Ising', deltaSigma: '0.5181489', uncertainty: '(10)', source: 'conformal bootstrap, Kos, Poland, Simmons-Duffin, Vichi, JHEP 08 (2016) 036' },
  // recalled from memory, not checked against the paper
  { N: 2, d: 3, system: '3D O(2)', deltaSigma: '0.519088', uncertainty: '(22)', source: 'conformal bootstrap, Chester et al., JHEP 06 (2020) 142 (value recalled from memory)' },
  // recalled from memory, not checked against the paper
  { N: 3, d: 3, system: '3D O(3)', deltaSigma: '0.518936', uncertainty: '(67)', source: 'conformal bootstrap, Chester et al., Phys. Rev. D 104 (2021) 105013 (value recalled from memory)' },
];

/** The model as a job names it (only the O(N) preset has built-in values). */
export interface ModelName {
  preset: string;
  N?: unknown;
}

/** The built-in Δσ for an O(N) preset in dimension d, or null. */
export function builtInDeltaSigma(model: ModelName, d: Q): ShortRangeReference | null {
  if (model.preset !== 'on' || (typeof model.N !== 'number' && typeof model.N !== 'string') || model.N === 'N') return null;
  let n: Q;
  try {
    n = toExactRational(model.N as number | string);
  } catch {
    return null;
  }
  return SHORT_RANGE_DELTA_SIGMA.find((r) => qCompare(n, q(r.N)) === 0 && qCompare(d, q(r.d)) === 0) ?? null;
}

/** The crossover to short-range behaviour: s* = d − 2Δσ, with where Δσ came from. */
export interface Crossover {
  sStar: Q;
  deltaSigma: string;
  /** "given" or the built-in reference. */
  source: string;
  builtIn: boolean;
}

/** s* from a given Δσ, else from the built-in table (null when neither applies). */
export function crossoverFor(model: ModelName, d: Q, given?: string): Crossover | null {
  if (given !== undefined) return { sStar: crossoverS(d, toExactRational(given)), deltaSigma: given, source: `Δσ = ${given} as given`, builtIn: false };
  const reference = builtInDeltaSigma(model, d);
  if (!reference) return null;
  return {
    sStar: crossoverS(d, toExactRational(reference.deltaSigma)),
    deltaSigma: reference.deltaSigma,
    source: `built in: ${reference.system} Δσ = ${reference.deltaSigma}${reference.uncertainty}, ${reference.source}`,
    builtIn: true,
  };
}

/** s* = d − 2Δσ of the short-range theory (crossover to short-range behaviour). */
export function crossoverS(d: Q, deltaSigma: Q): Q {
  return qSub(d, qMul(q(2), deltaSigma));
}
