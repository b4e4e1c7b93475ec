import { type Q } from '../symbolic/rational';
import { type Tensor } from './tensor';

/**
 * A quartic model V = (1/4!) λ_{abcd} φ_a φ_b φ_c φ_d with λ = Σ_k g_k · scale_k · basis_k.
 * Basis tensors are fully symmetric with integer entries; the couplings g_k are the flowing
 * parameters (β-functions are written per coupling).
 */
export interface QuarticModel {
  readonly label: string;
  readonly fields: number;
  readonly couplings: readonly string[];
  readonly basis: readonly Tensor[];
  readonly scales: readonly Q[];
  /** Readable name of a fixed point from its (approximate) coupling values. */
  classify(values: readonly number[]): string;
}

/**
 * A preset whose field number N is left symbolic: integer members are built on demand and
 * N-dependent contractions are recovered as exact polynomials in N from several members.
 */
export interface ModelFamily {
  readonly label: string;
  readonly parameter: 'N';
  readonly couplings: readonly string[];
  /** Smallest N at which the basis tensors are linearly independent. */
  readonly smallestMember: number;
  member(N: number): QuarticModel;
  classify(values: readonly number[]): string;
}

export type ModelSpec = QuarticModel | ModelFamily;

export const isFamily = (m: ModelSpec): m is ModelFamily => 'member' in m;

/** Couplings closer to zero than this count as absent when naming a fixed point. */
export const NEGLIGIBLE_COUPLING = 1e-12;
