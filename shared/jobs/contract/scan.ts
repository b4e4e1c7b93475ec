import { z } from 'zod';
import { Notice, Quantity, SERIES_QUANTITIES, ShortRangeInput } from './exponents';
import { MAX_SCAN_POINTS } from './limits';
import { ModelInput } from './model';
import { DecimalString, FixedPointName, FlowDigits, Loops } from './primitives';

/** `scan`: exponents along a range of s at fixed d (ε = 2s − d changes along the scan). */
export const ScanJob = z.strictObject({
  job: z.literal('scan'),
  model: ModelInput,
  d: DecimalString,
  s: z.strictObject({ from: DecimalString, to: DecimalString, points: z.number().int().min(2).max(MAX_SCAN_POINTS) }),
  quantities: z.array(Quantity).min(1).max(SERIES_QUANTITIES.length).default(['nuInv', 'omega']),
  loops: Loops,
  digits: FlowDigits,
  /** Δσ of the short-range theory; built in for 2D Ising and 3D Ising, O(2), O(3) when omitted. */
  shortRange: ShortRangeInput.optional(),
  fixedPoint: FixedPointName.optional(),
});
export type ScanJob = z.infer<typeof ScanJob>;

export const ScanRegime = z.enum(['mean-field', 'long-range', 'short-range']);

export const ScanPointResult = z.strictObject({
  s: z.string(),
  eps: z.string(),
  regime: ScanRegime,
  /** True outside the long-range window (mean-field or beyond s*). */
  flagged: z.boolean(),
  /** Several couplings: the fixed point followed at this s (null when none could be chosen). */
  fixedPoint: z.string().nullable().optional(),
  values: z.partialRecord(Quantity, z.string().nullable()),
  /** The [L/1] approximant (L = loops − 1) where it passes the pole check (null otherwise). */
  pade: z.partialRecord(Quantity, z.string().nullable()),
  /** Why a Padé value is missing (a pole between 0 and ε, a degenerate approximant). */
  padeDefects: z.partialRecord(Quantity, z.string()).optional(),
  /** Kinds of the scan's notices that apply at this point. */
  notices: z.array(z.string()).optional(),
  note: z.string().optional(),
});
export type ScanPointResult = z.infer<typeof ScanPointResult>;

export const ScanResult = z.strictObject({
  /** Each notice once, naming the values of s where it applies; points list the kinds that apply to them. */
  notices: z.array(Notice),
  d: z.string(),
  fixedPoint: z.string().nullable(),
  quantities: z.array(Quantity),
  /** s = d/2 (end of the mean-field region, d = 2s: upper critical dimension) and s* (short-range crossover) when known, with where Δσ came from. */
  marks: z.strictObject({ meanFieldEnd: z.string(), meanFieldEndNote: z.string(), sStar: z.string().optional(), sStarSource: z.string().optional() }),
  points: z.array(ScanPointResult),
});
export type ScanResult = z.infer<typeof ScanResult>;
