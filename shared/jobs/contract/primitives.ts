import { z } from 'zod';
import { JOB_LIMITS } from './limits';

/**
 * Names every JavaScript object already carries (constructor, toString, __proto__, …). Engine code keys
 * plain objects by symbol name, so such a name would read a built-in instead of a value: refused everywhere.
 */
const OBJECT_PROPERTY_NAMES: ReadonlySet<string> = new Set([...Object.getOwnPropertyNames(Object.prototype), 'prototype']);

export function isObjectPropertyName(name: string): boolean {
  return OBJECT_PROPERTY_NAMES.has(name);
}

/**
 * The calculation job contract, shared by the CLI, the API and the notebook.
 * Every object is strict: unknown fields are rejected.
 */
/** Room for a number written to maxDigits digits with its sign, point, exponent and leading zeros. */
const MAX_DECIMAL_LENGTH = JOB_LIMITS.maxDigits + 100;

export const DecimalString = z
  .string()
  .max(MAX_DECIMAL_LENGTH)
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

/** Flow jobs: loop order and digits (flow, fixedpoints, exponents, scan, compare). */
export const Loops = z.union([z.literal(1), z.literal(2), z.literal(3)]).default(2);
export type LoopOrder = 1 | 2 | 3;
export const FlowDigits = Digits.max(JOB_LIMITS.maxFlowDigits).default(JOB_LIMITS.defaultFlowDigits);

/** The name of a fixed point a job asks for ("fixedPoint"), as the fixedpoints job lists them. */
export const FixedPointName = z.string().max(JOB_LIMITS.maxFixedPointName);

export const ErrorCode = z.enum(['invalid-job', 'pole', 'domain', 'not-affine', 'not-representable', 'singular', 'limit', 'parse', 'internal']);

export const JobError = z.strictObject({
  error: z.strictObject({ code: ErrorCode, message: z.string() }),
});

export const SymbolicCoefficient = z.strictObject({ expr: z.string(), latex: z.string() });

export const Coefficient = z.union([z.string(), SymbolicCoefficient]);
export type Coefficient = z.infer<typeof Coefficient>;

export type JobError = z.infer<typeof JobError>;
