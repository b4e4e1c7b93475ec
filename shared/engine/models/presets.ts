import { fail } from '../precision';
import { type Q, q, qCompare } from '../symbolic';
import { type ModelFamily, type QuarticModel, NEGLIGIBLE_COUPLING, exactNumberText, familyPointLabel } from './model';
import { type Tensor, tensorFrom } from './tensor';

import { MAX_FIELDS } from '../../jobs/contract/limits';
import { MAX_ABS_N } from '../../jobs/contract/model';

export { MAX_FIELDS };

const delta = (a: number, b: number) => (a === b ? 1 : 0);

/** δ_ab δ_cd + δ_ac δ_bd + δ_ad δ_bc (the O(N)-invariant quartic structure, times 3). */
export function pairingTensor(n: number): Tensor {
  return tensorFrom(n, 4, ([a, b, c, d]) => delta(a, b) * delta(c, d) + delta(a, c) * delta(b, d) + delta(a, d) * delta(b, c));
}

/** δ_abcd: 1 iff all four indices are equal (the cubic-anisotropy structure). */
export function diagonalTensor(n: number): Tensor {
  return tensorFrom(n, 4, ([a, b, c, d]) => (a === b && b === c && c === d ? 1 : 0));
}

function checkFieldCount(N: number): void {
  if (!Number.isInteger(N) || N < 1) fail('invalid', `N must be a positive integer, got ${N}`);
  if (N > MAX_FIELDS) fail('limit', `at most ${MAX_FIELDS} fields (got N = ${N}); use "N":"N" for the symbolic O(N) result`);
}

const isZero = (x: number) => Math.abs(x) < NEGLIGIBLE_COUPLING;

function nameONPoint(N: number | 'N', [u]: readonly number[]): string {
  if (isZero(u)) return 'Gaussian';
  return N === 1 ? 'Ising' : 'O(N)';
}

/** O(N): λ_abcd = u (δ_ab δ_cd + δ_ac δ_bd + δ_ad δ_bc)/3, so that N = 1 has λ_1111 = u. */
export function onModel(N: number): QuarticModel {
  checkFieldCount(N);
  return {
    label: `O(${N})`,
    fields: N,
    couplings: ['u'],
    basis: [pairingTensor(N)],
    scales: [q(1, 3)],
    classify: (values) => nameONPoint(N, values),
  };
}

function nameCubicPoint([u, v]: readonly number[]): string {
  if (isZero(u) && isZero(v)) return 'Gaussian';
  if (isZero(v)) return 'O(N)';
  if (isZero(u)) return 'decoupled Ising';
  return 'cubic';
}

/** Cubic anisotropy: the O(N) structure with coupling u plus v δ_abcd. */
export function cubicModel(N: number): QuarticModel {
  checkFieldCount(N);
  if (N < 2) fail('invalid', 'the cubic model needs N ≥ 2 (at N = 1 the two couplings coincide)');
  return {
    label: `cubic(${N})`,
    fields: N,
    couplings: ['u', 'v'],
    basis: [pairingTensor(N), diagonalTensor(N)],
    scales: [q(1, 3), q(1)],
    classify: nameCubicPoint,
  };
}

export const onFamily: ModelFamily = {
  label: 'O(N)',
  parameter: 'N',
  couplings: ['u'],
  smallestMember: 1,
  member: onModel,
  classify: (values) => nameONPoint('N', values),
};

export const cubicFamily: ModelFamily = {
  label: 'cubic(N)',
  parameter: 'N',
  couplings: ['u', 'v'],
  smallestMember: 2,
  member: cubicModel,
  classify: nameCubicPoint,
};

export { MAX_ABS_N };

/** Whether a preset at this N is built from explicit tensors (an integer 1…MAX_FIELDS, cubic from 2). */
export function hasExplicitTensors(preset: 'on' | 'cubic', N: Q): boolean {
  return N.den === 1n && N.num >= (preset === 'cubic' ? 2n : 1n) && N.num <= BigInt(MAX_FIELDS);
}

/**
 * The O(N) or cubic preset at any real N: explicit tensors for small integers (they also give the
 * quadratic-operator matrix), otherwise the symbolic-N family evaluated exactly at N.
 */
export function presetModel(preset: 'on' | 'cubic', N: Q): QuarticModel {
  if (qCompare(N, q(MAX_ABS_N)) > 0 || qCompare(N, q(-MAX_ABS_N)) < 0) fail('limit', `|N| must be at most ${MAX_ABS_N} (got N = ${exactNumberText(N)})`);
  if (hasExplicitTensors(preset, N)) return preset === 'on' ? onModel(Number(N.num)) : cubicModel(Number(N.num));
  if (preset === 'cubic' && N.num === 1n && N.den === 1n) fail('invalid', 'the cubic model needs N ≠ 1 (at N = 1 its two couplings multiply the same structure); use the O(N) preset with N = 1');
  return familyPointModel(preset, N);
}

/** The preset's symbolic-N family at N, without tensors (presetModel uses it for every N without explicit tensors). */
export function familyPointModel(preset: 'on' | 'cubic', N: Q): QuarticModel {
  const family = preset === 'on' ? onFamily : cubicFamily;
  const atN = { family, N };
  const ising = preset === 'on' && N.num === 1n && N.den === 1n;
  return { label: familyPointLabel(atN), fields: 0, couplings: family.couplings, basis: [], scales: [], classify: (values) => nameONPointOr(ising, family, values), atN };
}

function nameONPointOr(ising: boolean, family: ModelFamily, values: readonly number[]): string {
  return ising ? nameONPoint(1, values) : family.classify(values);
}
