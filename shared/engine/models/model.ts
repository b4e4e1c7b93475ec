import { type Q } from '../symbolic';
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
  /**
   * Set for a preset at a numeric N without explicit tensors (N not an integer 1…MAX_FIELDS): `basis`
   * and `scales` are empty, `fields` is 0, and the flow is the family's, evaluated exactly at N.
   */
  readonly atN?: FamilyPoint;
}

/** A symbolic-N family at one exact, arbitrary real N. */
export interface FamilyPoint {
  readonly family: ModelFamily;
  readonly N: Q;
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

/** A preset evaluated from its family at a numeric N (see QuarticModel.atN). */
export const familyPointOf = (m: ModelSpec): FamilyPoint | null => (!isFamily(m) && m.atN ? m.atN : null);

/** N as exact decimal text (inputs are decimals, so the expansion terminates), else as a fraction. */
export function exactNumberText(x: Q): string {
  let den = x.den;
  let digits = 0;
  while (den % 10n === 0n) [den, digits] = [den / 10n, digits + 1];
  while (den % 2n === 0n || den % 5n === 0n) {
    if (den % 2n === 0n) den /= 2n;
    else den /= 5n;
    digits++;
  }
  if (den !== 1n) return `${x.num}/${x.den}`;
  const scaled = (x.num < 0n ? -x.num : x.num) * 10n ** BigInt(digits) / x.den;
  const text = scaled.toString().padStart(digits + 1, '0');
  const body = digits === 0 ? text : `${text.slice(0, -digits)}.${text.slice(-digits)}`;
  return `${x.num < 0n ? '-' : ''}${body}`;
}

/** "O(N) at N = 0.5", "O(0) (self-avoiding walk)", "cubic(10)". */
export function familyPointLabel(point: FamilyPoint): string {
  const text = exactNumberText(point.N);
  const integer = point.N.den === 1n;
  const base = point.family.label.replace('(N)', integer ? `(${text})` : '(N)');
  const walk = point.family.label === 'O(N)' && point.N.num === 0n ? ' (self-avoiding walk)' : '';
  return integer ? `${base}${walk}` : `${base} at N = ${text}`;
}

/** Couplings closer to zero than this count as absent when naming a fixed point. */
export const NEGLIGIBLE_COUPLING = 1e-12;
