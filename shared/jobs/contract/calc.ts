import { z } from 'zod';
import { JOB_LIMITS } from './limits';
import { AffineText, DecimalString, Digits, ExpressionText, JobError, ParameterValues, SymbolicCoefficient } from './primitives';

/** The calculation jobs on numbers and series: special functions, Laurent expansions, one-loop integrals, Padé. */
export const SpecialJob = z.strictObject({
  job: z.literal('special'),
  fn: z.enum(['gamma', 'lngamma', 'psi', 'zeta']),
  x: DecimalString,
  order: z.number().int().min(0).max(JOB_LIMITS.maxPsiOrder).optional(),
  digits: Digits,
});

const SeriesOrder = z.number().int().min(JOB_LIMITS.minOrder).max(JOB_LIMITS.maxOrder);

export const LaurentJob = z.strictObject({
  job: z.literal('laurent'),
  expr: ExpressionText,
  order: SeriesOrder,
  d: AffineText.optional(),
  at: ParameterValues.optional(),
  digits: Digits.optional(),
});

export const BubbleJob = z.strictObject({
  job: z.literal('bubble'),
  a: AffineText,
  b: AffineText,
  d: AffineText,
  order: SeriesOrder,
  at: ParameterValues.optional(),
  digits: Digits.optional(),
});

export const FourierJob = z.strictObject({
  job: z.literal('fourier'),
  a: AffineText,
  d: AffineText,
  order: SeriesOrder,
  at: ParameterValues.optional(),
  digits: Digits.optional(),
});

export const StarTriangleJob = z.strictObject({
  job: z.literal('startriangle'),
  deltas: z.tuple([AffineText, AffineText, AffineText]),
  d: AffineText,
  order: SeriesOrder,
  at: ParameterValues.optional(),
  digits: Digits.optional(),
});

export const PadeJob = z.strictObject({
  job: z.literal('pade'),
  coeffs: z.array(DecimalString).min(1).max(JOB_LIMITS.maxPadeCoefficients),
  L: z.number().int().min(0).max(JOB_LIMITS.maxPadeCoefficients).optional(),
  M: z.number().int().min(0).max(JOB_LIMITS.maxPadeCoefficients).optional(),
  at: DecimalString.optional(),
  interval: z.tuple([DecimalString, DecimalString]).optional(),
  digits: Digits,
});

export const CalcJob = z.discriminatedUnion('job', [SpecialJob, LaurentJob, BubbleJob, FourierJob, StarTriangleJob, PadeJob]);
export const CalcBatch = z.union([CalcJob, z.array(z.unknown()).max(JOB_LIMITS.maxBatch)]);

export type SpecialJob = z.infer<typeof SpecialJob>;
export type LaurentJob = z.infer<typeof LaurentJob>;
export type BubbleJob = z.infer<typeof BubbleJob>;
export type FourierJob = z.infer<typeof FourierJob>;
export type StarTriangleJob = z.infer<typeof StarTriangleJob>;
export type PadeJob = z.infer<typeof PadeJob>;
export type CalcJob = z.infer<typeof CalcJob>;

// ---- results --------------------------------------------------------------------------------

/** `lngamma` gives ln|Γ(x)| and the sign of Γ(x), so Γ(x) = sign·exp(value) also for negative x (DLMF 5.5.1). */
export const SpecialResult = z.strictObject({ value: z.string(), sign: z.union([z.literal(1), z.literal(-1)]).optional() });

/** Coefficient of eps^lowest first, through eps^order (coeffs.length = order − lowest + 1). */
export const SeriesResult = z.strictObject({
  lowest: z.number().int(),
  order: z.number().int(),
  coeffs: z.union([z.array(z.string()), z.array(SymbolicCoefficient)]),
  /** Powers of π and 2 multiplying the series (fourier, startriangle), as affine text in eps and parameters. */
  prefactor: z.strictObject({ piExponent: z.string(), twoExponent: z.string().optional() }).optional(),
});

/**
 * One approximant [L/M]. With "at" it is checked on the way from 0 to at (docs/physics.md on Padé
 * resummation): a real pole of the denominator between 0 and at, or a denominator whose sign at `at`
 * differs from Q(0) = 1, flags it; so does a pole inside "interval". A flagged entry has no `value`:
 * it lists its `poles` (and `signChange`) and says why in `reason`.
 */
export const PadeEntry = z.strictObject({
  L: z.number().int(),
  M: z.number().int(),
  numerator: z.array(z.string()).optional(),
  denominator: z.array(z.string()).optional(),
  /** Only for an entry that is not flagged, when the job gives "at". */
  value: z.string().optional(),
  /** Real zeros of the denominator between 0 (excluded) and at, and inside "interval". */
  poles: z.array(z.string()),
  flagged: z.boolean(),
  /** With "at": the denominator changes sign between 0 and at (or vanishes at at). */
  signChange: z.boolean().optional(),
  /** Why a flagged entry has no value (a pole, a sign change, a degenerate approximant). */
  reason: z.string().optional(),
});

/** One [L/M] when the job gives L and M; otherwise every [L/M] with L + M ≤ order (= coefficients − 1), by increasing L + M. */
export const PadeResult = z.union([PadeEntry, z.strictObject({ table: z.array(PadeEntry) })]);

export const CalcResult = z.union([SpecialResult, SeriesResult, PadeResult, JobError]);

export type SpecialResult = z.infer<typeof SpecialResult>;
export type SeriesResult = z.infer<typeof SeriesResult>;
export type PadeEntry = z.infer<typeof PadeEntry>;
export type PadeResult = z.infer<typeof PadeResult>;
export type CalcResult = z.infer<typeof CalcResult>;
