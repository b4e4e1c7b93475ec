import { z } from 'zod';
import { ModelInput } from './model';
import { Coefficient, DecimalString, FlowDigits, Loops } from './primitives';

/** `fixedpoints`: every fixed point of the flow as ε-series, values at the physical ε and stability. */
export const FixedPointsJob = z.strictObject({ job: z.literal('fixedpoints'), model: ModelInput, d: DecimalString.optional(), s: DecimalString.optional(), loops: Loops, digits: FlowDigits });
export type FixedPointsJob = z.infer<typeof FixedPointsJob>;

/** An eigen-operator of the quadratic-operator matrix at a fixed point (Δ = d − s + γ). */
export const QuadraticOperator = z.strictObject({
  name: z.string(),
  multiplicity: z.number().int(),
  operator: z.string(),
  series: z.strictObject({ gamma: z.array(Coefficient), Delta: z.array(Coefficient) }),
  /** The series evaluated at the physical ε. */
  values: z.strictObject({ gamma: Coefficient, Delta: Coefficient }).nullable(),
  /** Eigenvalues of the matrix at the numeric root of the truncated β. */
  atRoot: z.strictObject({ gamma: z.array(Coefficient), Delta: z.array(Coefficient) }).nullable(),
});
export type QuadraticOperator = z.infer<typeof QuadraticOperator>;

export const FixedPointStatus = z.enum(['real', 'complex', 'degenerate']);

/** What a result using a fixed point must state at its top (kinds as in the engine's FixedPointCaveat). */
export const FixedPointCaveat = z.strictObject({
  kind: z.enum(['complex-at-eps', 'stability-sign-disagrees', 'degenerate-one-loop', 'complex-one-loop']),
  message: z.string(),
});
export type FixedPointCaveat = z.infer<typeof FixedPointCaveat>;

export const FixedPointEntry = z.strictObject({
  name: z.string(),
  status: FixedPointStatus,
  /** Per coupling: ε-series coefficients (ε^0, ε^1, …) and the value at the physical ε ("a + bi" when complex). */
  couplings: z.record(z.string(), z.strictObject({ series: z.array(Coefficient).nullable(), value: Coefficient.nullable() })),
  stability: z.strictObject({ series: z.array(z.array(Coefficient).nullable()).nullable(), values: z.array(z.string()).nullable() }),
  /** true: IR-stable; false: unstable or complex (not physical); null: undecided (see caveats). */
  stable: z.boolean().nullable(),
  notes: z.array(z.string()),
  caveats: z.array(FixedPointCaveat).optional(),
  quadraticOperators: z.array(QuadraticOperator).nullable().optional(),
});
export type FixedPointEntry = z.infer<typeof FixedPointEntry>;

export const FixedPointsResult = z.strictObject({
  eps: z.string(),
  meanField: z.boolean(),
  /** Present when d ≥ 2s: why only the Gaussian point is listed. */
  statement: z.string().optional(),
  fixedPoints: z.array(FixedPointEntry),
});
export type FixedPointsResult = z.infer<typeof FixedPointsResult>;
