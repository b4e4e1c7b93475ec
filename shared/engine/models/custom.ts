import { type MathNode, create, parseDependencies } from 'mathjs';
import { fail } from '../precision/errors';
import { toExactRational } from '../precision/real';
import { type Poly, polyAdd, polyConstant, polyConstantValue, polyMul, polyPow, polyScale, polyVariable } from '../symbolic/polynomial';
import { type Q, Q0, q, qDiv, qMul } from '../symbolic/rational';
import { type QuarticModel, NEGLIGIBLE_COUPLING } from './model';
import { MAX_FIELDS } from './presets';
import { assertIndependentCouplings } from './projection';
import { type Tensor, forEachIndex, zeroTensor } from './tensor';

const math = create({ parseDependencies });
const FIELD = /^phi([1-9][0-9]*)$/;
const COUPLING = /^[A-Za-z][A-Za-z0-9_]*$/;
const RESERVED = new Set(['pi', 'e', 'i', 'E', 'PI', 'Infinity', 'NaN', 'phi', 'eps', 'N', 's', 'd']);
export const MAX_POTENTIAL_LENGTH = 2000;

interface NodeLike {
  type: string;
  op?: string;
  fn?: string | { name?: string };
  name?: string;
  args?: NodeLike[];
  content?: NodeLike;
  value?: unknown;
}

/** The potential as a polynomial in field and coupling symbols (fields named phi1 … phin). */
function toPolynomial(node: NodeLike, fields: number): Poly {
  switch (node.type) {
    case 'ConstantNode':
      return polyConstant(toExactRational(String(node.value)));
    case 'SymbolNode':
      return symbol(node.name as string, fields);
    case 'ParenthesisNode':
      return toPolynomial(node.content as NodeLike, fields);
    case 'OperatorNode':
      return operator(node, fields);
    default:
      return fail('parse', `unsupported construct in the potential (${node.type}); use numbers, couplings, phi1…phi${fields}, + − * / ^`);
  }
}

function symbol(name: string, fields: number): Poly {
  const field = FIELD.exec(name);
  if (field) {
    const index = Number(field[1]);
    if (index > fields) fail('invalid', `${name} is not a field of a ${fields}-field model (fields are phi1…phi${fields})`);
    return polyVariable(name);
  }
  if (RESERVED.has(name) || !COUPLING.test(name)) fail('invalid', `unknown symbol ${name}: fields are phi1…phi${fields}, other names are couplings (reserved: ${[...RESERVED].join(', ')})`);
  return polyVariable(name);
}

function operator(node: NodeLike, fields: number): Poly {
  const args = (node.args ?? []).map((a) => toPolynomial(a, fields));
  if (node.fn === 'unaryMinus') return polyScale(args[0], q(-1));
  if (node.fn === 'unaryPlus') return args[0];
  switch (node.op) {
    case '+':
      return polyAdd(args[0], args[1]);
    case '-':
      return polyAdd(args[0], polyScale(args[1], q(-1)));
    case '*':
      return polyMul(args[0], args[1]);
    case '/': {
      const divisor = polyConstantValue(args[1]);
      if (!divisor || divisor.num === 0n) return fail('invalid', 'the potential may only be divided by non-zero numbers');
      return polyScale(args[0], qDiv(q(1), divisor));
    }
    case '^': {
      const e = polyConstantValue(args[1]);
      if (!e || e.den !== 1n || e.num < 0n || e.num > 4n) return fail('invalid', 'powers in the potential must be integers 0…4');
      return polyPow(args[0], Number(e.num));
    }
    default:
      return fail('parse', `operator ${node.op} is not allowed in the potential`);
  }
}

/**
 * Build the model from V = Σ (coupling × quartic monomial): λ_abcd = ∂⁴V/∂φ_a∂φ_b∂φ_c∂φ_d, split
 * by coupling. Only quartic monomials, each linear in exactly one coupling, are accepted.
 */
export function customModel(fields: number, potential: string): QuarticModel {
  if (!Number.isInteger(fields) || fields < 1) fail('invalid', 'fields must be a positive integer');
  if (fields > MAX_FIELDS) fail('limit', `at most ${MAX_FIELDS} fields`);
  if (potential.length > MAX_POTENTIAL_LENGTH) fail('limit', 'potential too long');
  let tree: MathNode;
  try {
    tree = math.parse(potential);
  } catch (e) {
    return fail('parse', `cannot parse the potential: ${(e as Error).message}`);
  }
  const polynomial = toPolynomial(tree as unknown as NodeLike, fields);
  const byCoupling = new Map<string, Map<string, { exponents: number[]; coeff: Q }>>();
  for (const term of polynomial.values()) {
    const fieldPowers = new Array<number>(fields).fill(0);
    const couplingNames: string[] = [];
    for (const [v, e] of term.monomial) {
      const field = FIELD.exec(v);
      if (field) fieldPowers[Number(field[1]) - 1] += e;
      else for (let k = 0; k < e; k++) couplingNames.push(v);
    }
    const degree = fieldPowers.reduce((s, e) => s + e, 0);
    const text = describeMonomial(fieldPowers, couplingNames);
    if (degree !== 4) fail('invalid', `only quartic terms are allowed; ${text} has degree ${degree} in the fields`);
    if (couplingNames.length !== 1) fail('invalid', `each term needs exactly one coupling factor; ${text} has ${couplingNames.length}`);
    const g = couplingNames[0];
    const monomials = byCoupling.get(g) ?? new Map();
    monomials.set(fieldPowers.join(','), { exponents: fieldPowers, coeff: term.coeff });
    byCoupling.set(g, monomials);
  }
  if (byCoupling.size === 0) fail('invalid', 'the potential has no coupling terms');
  const couplings = [...byCoupling.keys()].sort();
  const tensors = couplings.map((g) => integerTensor(fields, byCoupling.get(g) as Map<string, { exponents: number[]; coeff: Q }>));
  const model: QuarticModel = {
    label: `custom(${fields})`,
    fields,
    couplings,
    basis: tensors.map((t) => t.tensor),
    scales: tensors.map((t) => t.scale),
    classify: (values) => nameCustomPoint(couplings, values, isONSymmetric(model, values) ? fields : null),
  };
  assertIndependentCouplings(model);
  return model;
}

function describeMonomial(fieldPowers: number[], couplings: string[]): string {
  const parts = [...couplings, ...fieldPowers.flatMap((e, i) => (e === 0 ? [] : [e === 1 ? `phi${i + 1}` : `phi${i + 1}^${e}`]))];
  return parts.join('*') || '1';
}

function factorial(k: number): number {
  return k <= 1 ? 1 : k * factorial(k - 1);
}

/** λ_abcd for one coupling: coefficient × Π k_i! on every ordering of the monomial's indices. */
function integerTensor(fields: number, monomials: Map<string, { exponents: number[]; coeff: Q }>): { tensor: Tensor; scale: Q } {
  const entries = new Map<string, Q>();
  let commonDen = 1n;
  for (const { exponents, coeff } of monomials.values()) {
    const value = qMul(coeff, q(exponents.reduce((p, e) => p * factorial(e), 1)));
    entries.set(exponents.join(','), value);
    commonDen = lcm(commonDen, value.den);
  }
  const tensor = zeroTensor(fields, 4);
  forEachIndex(fields, 4, (indices, flat) => {
    const counts = new Array<number>(fields).fill(0);
    for (const i of indices) counts[i]++;
    const value = entries.get(counts.join(',')) ?? Q0;
    tensor.data[flat] = Number((value.num * commonDen) / value.den);
  });
  return { tensor, scale: q(1n, commonDen) };
}

function lcm(a: bigint, b: bigint): bigint {
  let x = a;
  let y = b;
  while (y) [x, y] = [y, x % y];
  return (a / x) * b;
}

/** "u only", "all couplings (u, v)"; an O(n)-symmetric tensor as "O(n) (u only)". */
function nameCustomPoint(couplings: readonly string[], values: readonly number[], symmetricFields: number | null): string {
  const active = couplings.filter((_, k) => Math.abs(values[k]) >= NEGLIGIBLE_COUPLING);
  if (active.length === 0) return 'Gaussian';
  const base = active.length === couplings.length ? `all couplings (${active.join(', ')})` : `${active.join(', ')} only`;
  return symmetricFields !== null ? `O(${symmetricFields}) (${base})` : base;
}

/**
 * λ = Σ g_k scale_k basis_k is O(n)-symmetric (n = all fields) when λ_abcd = c(δ_ab δ_cd + δ_ac δ_bd + δ_ad δ_bc)
 * for one c ≠ 0 (checked entry by entry, relative tolerance 1e-9).
 */
export function isONSymmetric(model: QuarticModel, values: readonly number[]): boolean {
  const n = model.fields;
  const lambda = new Array<number>(n ** 4).fill(0);
  model.basis.forEach((b, k) => {
    const f = values[k] * (Number(model.scales[k].num) / Number(model.scales[k].den));
    b.data.forEach((x, i) => (lambda[i] += f * x));
  });
  const size = Math.max(...lambda.map(Math.abs));
  if (!(size > 0)) return false;
  const c = lambda[0] / 3;
  let ok = true;
  forEachIndex(n, 4, ([a, b, cc, d], flat) => {
    const expected = c * ((a === b ? 1 : 0) * (cc === d ? 1 : 0) + (a === cc ? 1 : 0) * (b === d ? 1 : 0) + (a === d ? 1 : 0) * (b === cc ? 1 : 0));
    if (Math.abs(lambda[flat] - expected) > 1e-9 * size) ok = false;
  });
  return ok;
}


