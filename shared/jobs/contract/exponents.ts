import { z } from 'zod';
import { QuadraticOperator } from './fixedPoints';
import { FieldAnomalousSpectrum } from './flow';
import { ModelInput } from './model';
import { Coefficient, DecimalString, FixedPointName, FlowDigits, Loops } from './primitives';

/** Every critical exponent and scaling dimension the engine gives, in the order results list them. */
export const SERIES_QUANTITIES = ['nuInv', 'omega', 'eta', 'Delta_phi', 'Delta_phi2', 'Delta_phi3', 'Delta_phi4', 'nu', 'gamma', 'alpha', 'beta', 'delta'] as const;
export const Quantity = z.enum(SERIES_QUANTITIES);
export type Quantity = (typeof SERIES_QUANTITIES)[number];

/** The short-range theory's Δσ, for the crossover s* = d − 2Δσ (built in for some presets when omitted). */
export const ShortRangeInput = z.strictObject({ Delta_sigma: DecimalString });

/** `exponents`: the exponents at one fixed point as ε-series, with values and Padé values at the physical ε. */
export const ExponentsJob = z.strictObject({
  job: z.literal('exponents'),
  model: ModelInput,
  d: DecimalString.optional(),
  s: DecimalString.optional(),
  loops: Loops,
  digits: FlowDigits,
  fixedPoint: FixedPointName.optional(),
  shortRange: ShortRangeInput.optional(),
});
export type ExponentsJob = z.infer<typeof ExponentsJob>;

const PerQuantity = <T extends z.ZodType>(value: T) => z.record(Quantity, value);
const SomeQuantities = <T extends z.ZodType>(value: T) => z.partialRecord(Quantity, value);

/**
 * What a result must be read with, listed at its top: a caveat of the fixed point used (its kind as the
 * fixed-point layer names it, e.g. complex-at-eps) or of the regime (beyond-s-star, mean-field,
 * upper-critical-dimension, short-range-flow, no-singlet, not-ir-stable, …).
 */
export const Notice = z.strictObject({ kind: z.string().regex(/^[a-z][a-z0-9-]*$/).max(60), message: z.string() });
export type Notice = z.infer<typeof Notice>;

/** One Padé approximant [L/M] at the physical ε, checked for poles between 0 and ε; a flagged one has no value. */
export const PadeCheck = z.strictObject({
  L: z.number().int().min(0),
  M: z.number().int().min(1),
  value: z.string().nullable(),
  flagged: z.boolean(),
  /** Real zeros of the denominator in (0, ε]. */
  poles: z.array(z.string()),
  /** The denominator changes sign between 0 and ε. */
  signChange: z.boolean(),
  reason: z.string().nullable(),
});
export type PadeCheck = z.infer<typeof PadeCheck>;

/**
 * One Padé–Borel sum at the physical ε: the [L/M] Padé approximant of the Borel transform
 * B(t) = Σ a_k t^k/k!, Laplace-integrated (method in `borelMethod`). A flagged entry (a pole of the
 * approximant on the positive t axis, or a degenerate approximant) has no value.
 */
export const BorelCheck = z.strictObject({
  L: z.number().int().min(0),
  M: z.number().int().min(1),
  value: z.string().nullable(),
  /** Estimated absolute error of the value (null when flagged). */
  error: z.string().nullable(),
  flagged: z.boolean(),
  /** Real poles on the positive t axis. */
  poles: z.array(z.string()),
  reason: z.string().nullable(),
});
export type BorelCheck = z.infer<typeof BorelCheck>;

/** The crossover to short-range behaviour used for the notices. */
export const ShortRangeCrossover = z.strictObject({ sStar: z.string(), Delta_sigma: z.string(), source: z.string() });

/** d ≥ 2s: the Gaussian point is IR-stable and the Landau values are exact (with logarithmic corrections at d = 2s). */
export const MeanFieldExponents = z.strictObject({
  notices: z.array(Notice),
  eps: z.string(),
  meanField: z.literal(true),
  statement: z.string(),
  fixedPoint: z.literal('Gaussian'),
  values: PerQuantity(z.string()),
  relations: PerQuantity(z.string()),
  sources: PerQuantity(z.string()),
  shortRange: ShortRangeCrossover.optional(),
});

export const SeriesExponents = z.strictObject({
  notices: z.array(Notice),
  eps: z.string(),
  meanField: z.literal(false),
  fixedPoint: z.string(),
  /** Quantity → coefficients of ε^0, ε^1, … at fixed s (each quantity's own truncated series; absent when unavailable). */
  series: SomeQuantities(z.array(Coefficient)),
  /** Quantity → how it follows from the RG functions, as it holds here (s < 2, s = 2 or symbolic s). */
  relations: PerQuantity(z.string()),
  /** Quantity → what its printed value is computed from (with values only). */
  sources: PerQuantity(z.string()).optional(),
  /** Quantity → why it has no series and no value (e.g. 1/ν when the φ² insertion mixes). */
  unavailable: SomeQuantities(z.string()).optional(),
  quadraticOperators: z.array(QuadraticOperator).optional(),
  /** γ_φ and η per field direction when γ_φ is a matrix at the point (s = 2, anisotropic models). */
  fieldAnomalous: FieldAnomalousSpectrum.optional(),
  /** At the physical ε (numeric s, N and d only); null where unavailable. */
  values: PerQuantity(z.string().nullable()).optional(),
  /** Quantity → every [L/M] with M ≥ 1 and L + M ≤ loops, each checked. */
  pade: SomeQuantities(z.array(PadeCheck)).optional(),
  /** Quantity → its Padé–Borel sums, every Borel–Padé [L/M] with M ≥ 1 and L + M = loops. */
  borel: SomeQuantities(z.array(BorelCheck)).optional(),
  /** How the Padé–Borel sums are computed (transform, approximant, quadrature, error estimate). */
  borelMethod: z.string().optional(),
  shortRange: ShortRangeCrossover.optional(),
});

export const ExponentsResult = z.union([MeanFieldExponents, SeriesExponents]);
export type ExponentsResult = z.infer<typeof ExponentsResult>;
