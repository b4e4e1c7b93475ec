import { z } from 'zod';
import { QuadraticOperator } from './fixedPoints';
import { ModelInput } from './model';
import { Coefficient, DecimalString, FlowDigits, Loops } from './primitives';

/** Every critical exponent and scaling dimension the engine gives, in the order results list them. */
export const SERIES_QUANTITIES = ['nuInv', 'omega', 'eta', 'Delta_phi', 'Delta_phi2', 'Delta_phi3', 'Delta_phi4', 'nu', 'gamma', 'alpha', 'beta', 'delta'] as const;
export const Quantity = z.enum(SERIES_QUANTITIES);
export type Quantity = (typeof SERIES_QUANTITIES)[number];

/** `exponents`: the exponents at one fixed point as ε-series, with values and Padé values at the physical ε. */
export const ExponentsJob = z.strictObject({
  job: z.literal('exponents'),
  model: ModelInput,
  d: DecimalString.optional(),
  s: DecimalString.optional(),
  loops: Loops,
  digits: FlowDigits,
  fixedPoint: z.string().max(100).optional(),
});
export type ExponentsJob = z.infer<typeof ExponentsJob>;

const PerQuantity = <T extends z.ZodType>(value: T) => z.record(Quantity, value);

/** d ≥ 2s: the Gaussian point is IR-stable and the Landau values are exact. */
export const MeanFieldExponents = z.strictObject({
  eps: z.string(),
  meanField: z.literal(true),
  statement: z.string(),
  fixedPoint: z.literal('Gaussian'),
  values: PerQuantity(z.string()),
});

export const SeriesExponents = z.strictObject({
  eps: z.string(),
  meanField: z.literal(false),
  fixedPoint: z.string(),
  /** Quantity → coefficients of ε^0, ε^1, … at fixed s. */
  series: PerQuantity(z.array(Coefficient)),
  /** Quantity → how it follows from the RG functions. */
  relations: PerQuantity(z.string()),
  quadraticOperators: z.array(QuadraticOperator).optional(),
  /** At the physical ε (numeric s, N and d only). */
  values: PerQuantity(z.string()).optional(),
  pade: PerQuantity(z.string().nullable()).optional(),
});

export const ExponentsResult = z.union([MeanFieldExponents, SeriesExponents]);
export type ExponentsResult = z.infer<typeof ExponentsResult>;
