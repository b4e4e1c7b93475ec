import { z } from 'zod';
import { ModelInput } from './model';
import { Coefficient, DecimalString, FlowDigits, Loops } from './primitives';

/** `flow`: β-functions, γ_φ, γ_{φ²} (or the quadratic-operator matrix) and the derivation trail. */
export const FlowJob = z.strictObject({ job: z.literal('flow'), model: ModelInput, loops: Loops, s: DecimalString.optional(), digits: FlowDigits });
export type FlowJob = z.infer<typeof FlowJob>;

/** A Laurent series in ε: coefficients of ε^lowest, ε^(lowest+1), … */
export const SeriesCoefficients = z.strictObject({ lowest: z.number().int(), coeffs: z.array(Coefficient) });

/** One term of a polynomial in the couplings: monomial text ("u^2", "u*v", "eps*u") and its coefficient. */
export const CouplingTerm = z.strictObject({ monomial: z.string(), coeff: Coefficient });
export type CouplingTerm = z.infer<typeof CouplingTerm>;

export const TrailEntry = z.strictObject({
  graph: z.string(),
  title: z.string(),
  function: z.string(),
  loops: z.number().int(),
  sign: z.number(),
  symmetryFactor: z.string(),
  labellings: z.number().int(),
  /** Tensor weight per coupling monomial, projected on each coupling (or on δ_ab for two-point graphs). */
  weight: z.union([z.array(z.strictObject({ monomial: z.string(), projections: z.record(z.string(), z.string()) })), z.strictObject({ note: z.string() })]),
  integral: z.string(),
  rearrangement: z.string(),
  laurent: SeriesCoefficients,
  counterterms: z.array(z.strictObject({ subgraph: z.string(), pole: SeriesCoefficients, reduced: z.string() })),
  subtracted: SeriesCoefficients,
  pole: SeriesCoefficients,
  note: z.string().optional(),
});
export type TrailEntry = z.infer<typeof TrailEntry>;

/**
 * γ_φ per eigen-direction of the field matrix at a fixed point, η = 2 − s + 2γ_φ for each (output
 * of formatFieldAnomalous in flowJobs.ts). One direction "every field" when γ_φ ∝ δ at the point.
 */
export const FieldAnomalousSpectrum = z.strictObject({
  proportional: z.boolean(),
  directions: z.array(
    z.strictObject({
      field: z.string(),
      multiplicity: z.number().int(),
      series: z.strictObject({ gamma: z.array(z.string()), eta: z.array(z.string()) }),
      values: z.strictObject({ gamma: z.string(), eta: z.string() }).nullable(),
      atRoot: z.strictObject({ gamma: z.array(z.string()), eta: z.array(z.string()) }).nullable(),
    }),
  ),
});
export type FieldAnomalousSpectrum = z.infer<typeof FieldAnomalousSpectrum>;

export const FlowResult = z.strictObject({
  model: z.string(),
  s: z.string(),
  couplings: z.array(z.string()),
  loops: z.number().int(),
  convention: z.string(),
  beta: z.record(z.string(), z.array(CouplingTerm)),
  gamma_phi: z.array(CouplingTerm),
  /** Present when γ_φ is a matrix not ∝ δ_ab (s = 2, anisotropic models); gamma_phi is then tr γ_φ / n. */
  gamma_phi_matrix: z
    .strictObject({
      convention: z.string(),
      fields: z.array(z.string()),
      matrix: z.array(z.array(z.array(CouplingTerm))),
    })
    .optional(),
  gamma_phi2: z.union([z.array(CouplingTerm), z.strictObject({ note: z.string() })]),
  gamma_quadratic: z
    .strictObject({
      convention: z.string(),
      operators: z.array(z.string()),
      matrix: z.array(z.array(z.array(CouplingTerm))),
    })
    .optional(),
  fieldRenormalization: z.boolean(),
  checks: z.array(z.string()),
  trail: z.array(TrailEntry),
});
export type FlowResult = z.infer<typeof FlowResult>;
