import { z } from 'zod';
import { isObjectPropertyName } from '../engine/models/custom';
import { JOB_LIMITS } from './limits';

/**
 * The calculation job contract, shared by the CLI, the API and the notebook.
 * Every object is strict: unknown fields are rejected.
 */
export const DecimalString = z
  .string()
  .max(1100)
  .regex(/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d{1,6})?$/, 'expected a decimal number as a string, e.g. "1.5"');

export const Digits = z.number().int().min(JOB_LIMITS.minDigits).max(JOB_LIMITS.maxDigits);

/** The first name in an expression that every JavaScript object already carries (constructor, __proto__, …), if any. */
export function builtInNameIn(text: string): string | null {
  for (const [name] of text.matchAll(/[A-Za-z_$][A-Za-z0-9_$]*/g)) if (isObjectPropertyName(name)) return name;
  return null;
}

/** Expression text; names such as `constructor` would read built-ins instead of values, so they are refused here. */
export const ExpressionText = z
  .string()
  .min(1)
  .max(JOB_LIMITS.maxExpressionLength)
  .superRefine((text, ctx) => {
    const name = builtInNameIn(text);
    if (name) ctx.addIssue({ code: 'custom', message: `"${name}" cannot be used as a name (it is a built-in property name); choose another name` });
  });

/** An affine expression in eps and parameters, e.g. "2*s - eps". */
export const AffineText = ExpressionText;

export const ParameterValues = z.record(
  z
    .string()
    .regex(/^[A-Za-z][A-Za-z0-9_]*$/)
    .refine((name) => !isObjectPropertyName(name), 'this name is a built-in property name; choose another parameter name'),
  DecimalString,
);

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

export const ErrorCode = z.enum(['invalid-job', 'pole', 'domain', 'not-affine', 'not-representable', 'singular', 'limit', 'parse', 'internal']);

export const JobError = z.strictObject({
  error: z.strictObject({ code: ErrorCode, message: z.string() }),
});

export const SpecialResult = z.strictObject({ value: z.string() });

export const SymbolicCoefficient = z.strictObject({ expr: z.string(), latex: z.string() });

/** Coefficient of eps^lowest first, through eps^order (coeffs.length = order − lowest + 1). */
export const SeriesResult = z.strictObject({
  lowest: z.number().int(),
  order: z.number().int(),
  coeffs: z.union([z.array(z.string()), z.array(SymbolicCoefficient)]),
  /** Powers of π and 2 multiplying the series (fourier, startriangle), as affine text in eps and parameters. */
  prefactor: z.strictObject({ piExponent: z.string(), twoExponent: z.string().optional() }).optional(),
});

export const PadeEntry = z.strictObject({
  L: z.number().int(),
  M: z.number().int(),
  numerator: z.array(z.string()).optional(),
  denominator: z.array(z.string()).optional(),
  value: z.string().optional(),
  poles: z.array(z.string()),
  flagged: z.boolean(),
  error: z.string().optional(),
});

export const PadeResult = z.union([PadeEntry, z.strictObject({ table: z.array(PadeEntry) })]);

export const CalcResult = z.union([SpecialResult, SeriesResult, PadeResult, JobError]);

export type JobError = z.infer<typeof JobError>;
export type SpecialResult = z.infer<typeof SpecialResult>;
export type SeriesResult = z.infer<typeof SeriesResult>;
export type PadeEntry = z.infer<typeof PadeEntry>;
export type PadeResult = z.infer<typeof PadeResult>;
export type CalcResult = z.infer<typeof CalcResult>;
