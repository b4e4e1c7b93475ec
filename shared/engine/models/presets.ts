import { fail } from '../precision/errors';
import { q } from '../symbolic/rational';
import { type ModelFamily, type QuarticModel, NEGLIGIBLE_COUPLING } from './model';
import { type Tensor, tensorFrom } from './tensor';

import { MAX_FIELDS } from '../../jobs/contract/limits';

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
