import { isObjectPropertyName } from '../../jobs/contract/primitives';
import { fail, rationalToReal } from '../precision';
import { type ExpressionNode, type Poly, type Q, Q0, exactConstant, parseExpression, polyAdd, polyConstant, polyConstantValue, polyMul, polyPow, polyScale, polyVariable, q, qDiv, qMul } from '../symbolic';
import { type QuarticModel, NEGLIGIBLE_COUPLING } from './model';
import { MAX_FIELDS } from './presets';
import { assertIndependentCouplings } from './projection';
import { type Tensor, forEachIndex, zeroTensor } from './tensor';

const FIELD = /^phi([1-9][0-9]*)$/;
const COUPLING = /^[A-Za-z][A-Za-z0-9_]*$/;
const RESERVED = new Set(['pi', 'e', 'i', 'E', 'PI', 'Infinity', 'NaN', 'phi', 'eps', 'N', 's', 'd']);
export const MAX_POTENTIAL_LENGTH = 2000;

type NodeLike = ExpressionNode;

export { isObjectPropertyName };

/** What a potential may ask of the expansion; checked on the parse tree before anything is multiplied out. */
export const POTENTIAL_LIMITS = {
  /** Quartic in the fields. */
  maxFieldDegree: 4,
  /** Each term linear in one coupling. */
  maxCouplingDegree: 1,
  /** Upper bound on the terms any sub-expression can expand to. */
  maxTerms: 20_000,
  /** Upper bound on term-by-term products summed over every multiplication and power. */
  maxExpansionWork: 200_000,
  /** Upper bound on the size of any coefficient (numerator or denominator), in bits. */
  maxCoefficientBits: 4096,
} as const;

/** Upper bounds on what a sub-expression expands to: degrees, number of terms, coefficient size in bits. */
interface ExpansionBound {
  fieldDegree: number;
  couplingDegree: number;
  terms: number;
  numeratorBits: number;
  denominatorBits: number;
}

const bitsOf = (n: bigint): number => (n < 0n ? -n : n).toString(2).length;

/**
 * Walks the parse tree and refuses the potential when any sub-expression could exceed the limits, so a
 * potential such as ((phi1+…+phi6)^4)^3 is refused in microseconds instead of being multiplied out.
 */
function assertExpansionBounded(tree: NodeLike, fields: number): void {
  const couplings = new Set<string>();
  collectSymbols(tree, fields, couplings);
  // monomials of degree ≤ fieldDegree in the fields, times at most one coupling
  const distinctTerms = (b: ExpansionBound) => binomial(fields + Math.min(b.fieldDegree, POTENTIAL_LIMITS.maxFieldDegree), Math.min(b.fieldDegree, POTENTIAL_LIMITS.maxFieldDegree)) * (b.couplingDegree > 0 ? 1 + couplings.size : 1);
  const budget = { work: 0 };
  const visit = (node: NodeLike): ExpansionBound => {
    const b = boundOf(node, fields, visit, budget);
    const terms = Math.min(b.terms, distinctTerms(b));
    checkBound({ ...b, terms }, budget.work);
    return { ...b, terms };
  };
  visit(tree);
}

function checkBound(b: ExpansionBound, work: number): void {
  if (b.fieldDegree > POTENTIAL_LIMITS.maxFieldDegree) fail('limit', `the potential must be quartic in the fields, but a part of it has degree up to ${b.fieldDegree}; multiply out fewer fields (at most degree ${POTENTIAL_LIMITS.maxFieldDegree})`);
  if (b.couplingDegree > POTENTIAL_LIMITS.maxCouplingDegree) fail('limit', `each term takes exactly one coupling factor, but a part of the potential multiplies up to ${b.couplingDegree} couplings together`);
  if (b.terms > POTENTIAL_LIMITS.maxTerms) fail('limit', `the potential could expand to ${b.terms} terms (at most ${POTENTIAL_LIMITS.maxTerms}); use fewer couplings or smaller brackets`);
  if (work > POTENTIAL_LIMITS.maxExpansionWork) fail('limit', `multiplying out the potential takes up to ${work} term products (at most ${POTENTIAL_LIMITS.maxExpansionWork}); write it with fewer or smaller brackets`);
  if (Math.max(b.numeratorBits, b.denominatorBits) > POTENTIAL_LIMITS.maxCoefficientBits) fail('limit', `the numbers in the potential grow too large (over ${POTENTIAL_LIMITS.maxCoefficientBits} bits); use smaller numbers or powers`);
}

function collectSymbols(node: NodeLike, fields: number, couplings: Set<string>): void {
  if (node.type === 'SymbolNode' && !FIELD.test(node.name as string)) couplings.add(node.name as string);
  if (node.type === 'SymbolNode') symbol(node.name as string, fields);
  if (node.content) collectSymbols(node.content, fields, couplings);
  for (const arg of node.args ?? []) collectSymbols(arg, fields, couplings);
}

function boundOf(node: NodeLike, fields: number, visit: (n: NodeLike) => ExpansionBound, budget: { work: number }): ExpansionBound {
  switch (node.type) {
    case 'ConstantNode': {
      const c = exactConstant(node);
      return { fieldDegree: 0, couplingDegree: 0, terms: 1, numeratorBits: bitsOf(c.num), denominatorBits: bitsOf(c.den) };
    }
    case 'SymbolNode': {
      const field = FIELD.test(node.name as string);
      return { fieldDegree: field ? 1 : 0, couplingDegree: field ? 0 : 1, terms: 1, numeratorBits: 1, denominatorBits: 1 };
    }
    case 'ParenthesisNode':
      return visit(node.content as NodeLike);
    case 'OperatorNode':
      return operatorBound(node, visit, budget);
    default:
      return fail('parse', `unsupported construct in the potential (${node.type}); use numbers, couplings, phi1…phi${fields}, + − * / ^`);
  }
}

function operatorBound(node: NodeLike, visit: (n: NodeLike) => ExpansionBound, budget: { work: number }): ExpansionBound {
  const args = node.args ?? [];
  if (node.fn === 'unaryMinus' || node.fn === 'unaryPlus') return visit(args[0]);
  if (args.length !== 2) return fail('parse', `operator ${node.op} is not allowed in the potential`);
  const a = visit(args[0]);
  const b = visit(args[1]);
  switch (node.op) {
    case '+':
    case '-':
      return {
        fieldDegree: Math.max(a.fieldDegree, b.fieldDegree),
        couplingDegree: Math.max(a.couplingDegree, b.couplingDegree),
        terms: a.terms + b.terms,
        numeratorBits: Math.max(a.numeratorBits + b.denominatorBits, b.numeratorBits + a.denominatorBits) + 1,
        denominatorBits: a.denominatorBits + b.denominatorBits,
      };
    case '*':
      budget.work += a.terms * b.terms;
      return product(a, b, a.terms * b.terms);
    case '/':
      return { ...a, numeratorBits: a.numeratorBits + b.denominatorBits, denominatorBits: a.denominatorBits + b.numeratorBits };
    case '^':
      return power(a, integerExponent(args[1]), budget);
    default:
      return fail('parse', `operator ${node.op} is not allowed in the potential`);
  }
}

function product(a: ExpansionBound, b: ExpansionBound, terms: number): ExpansionBound {
  const sumBits = Math.ceil(Math.log2(Math.max(1, Math.min(a.terms, b.terms)))) + 1;
  return {
    fieldDegree: a.fieldDegree + b.fieldDegree,
    couplingDegree: a.couplingDegree + b.couplingDegree,
    terms,
    numeratorBits: a.numeratorBits + b.numeratorBits + sumBits,
    denominatorBits: a.denominatorBits + b.denominatorBits,
  };
}

function power(base: ExpansionBound, n: number, budget: { work: number }): ExpansionBound {
  let result: ExpansionBound = { fieldDegree: 0, couplingDegree: 0, terms: 1, numeratorBits: 1, denominatorBits: 1 };
  for (let k = 0; k < n; k++) {
    budget.work += result.terms * base.terms;
    result = product(result, base, Math.min(result.terms * base.terms, POTENTIAL_LIMITS.maxExpansionWork + 1));
    checkBound(result, budget.work);
  }
  return result;
}

/** The exponent of a power: a plain integer 0…4 (possibly in brackets or with a sign). */
function integerExponent(node: NodeLike): number {
  const inner = node.type === 'ParenthesisNode' ? (node.content as NodeLike) : node;
  const negative = inner.type === 'OperatorNode' && inner.fn === 'unaryMinus';
  const constant = negative || (inner.type === 'OperatorNode' && inner.fn === 'unaryPlus') ? (inner.args ?? [])[0] : inner;
  const text = constant?.type === 'ConstantNode' ? String(constant.value) : '';
  if (!/^\d+$/.test(text) || negative || Number(text) > 4) return fail('invalid', 'powers in the potential must be integers 0…4');
  return Number(text);
}

function binomial(n: number, k: number): number {
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return Math.round(r);
}

/** The potential as a polynomial in field and coupling symbols (fields named phi1 … phin). */
function toPolynomial(node: NodeLike, fields: number): Poly {
  switch (node.type) {
    case 'ConstantNode':
      return polyConstant(exactConstant(node));
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
  if (isObjectPropertyName(name)) fail('invalid', `"${name}" cannot name a coupling (it is a built-in property name); choose another name, e.g. g1`);
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

/** Recently built models by (fields, potential): checking a notebook reads one setup for every cell that uses it. */
const RECENT_MODELS_KEPT = 32;
const recentModels = new Map<string, QuarticModel>();
let expansions = 0;

/** How many potentials have been expanded since start (models answered from the recent ones are not counted). */
export function customModelExpansions(): number {
  return expansions;
}

/**
 * Build the model from V = Σ (coupling × quartic monomial): λ_abcd = ∂⁴V/∂φ_a∂φ_b∂φ_c∂φ_d, split
 * by coupling. Only quartic monomials, each linear in exactly one coupling, are accepted.
 * The same (fields, potential) gives the same frozen model object while it is among the recent ones.
 */
export function customModel(fields: number, potential: string): QuarticModel {
  const key = `${fields}\n${potential}`;
  const recent = recentModels.get(key);
  if (recent) {
    recentModels.delete(key);
    recentModels.set(key, recent);
    return recent;
  }
  const model = frozen(expandCustomModel(fields, potential));
  recentModels.set(key, model);
  if (recentModels.size > RECENT_MODELS_KEPT) recentModels.delete(recentModels.keys().next().value as string);
  return model;
}

/** Shared between callers, so nobody may change it (tensor data are typed arrays, read-only by type only). */
function frozen(model: QuarticModel): QuarticModel {
  Object.freeze(model.couplings);
  Object.freeze(model.basis);
  for (const tensor of model.basis) Object.freeze(tensor);
  for (const scale of model.scales) Object.freeze(scale);
  Object.freeze(model.scales);
  return Object.freeze(model);
}

function expandCustomModel(fields: number, potential: string): QuarticModel {
  expansions += 1;
  if (!Number.isInteger(fields) || fields < 1) fail('invalid', 'fields must be a positive integer');
  if (fields > MAX_FIELDS) fail('limit', `at most ${MAX_FIELDS} fields`);
  if (potential.length > MAX_POTENTIAL_LENGTH) fail('limit', 'potential too long');
  const tree = parseExpression(potential, 'the potential');
  assertExpansionBounded(tree, fields);
  const polynomial = toPolynomial(tree, fields);
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
  let content = 0n;
  for (const value of entries.values()) content = gcd(content, (value.num * commonDen) / value.den);
  const tensor = zeroTensor(fields, 4);
  forEachIndex(fields, 4, (indices, flat) => {
    const counts = new Array<number>(fields).fill(0);
    for (const i of indices) counts[i]++;
    const value = entries.get(counts.join(',')) ?? Q0;
    tensor.data[flat] = (value.num * commonDen) / value.den / content;
  });
  return { tensor, scale: q(content, commonDen) };
}

function gcd(a: bigint, b: bigint): bigint {
  let x = a < 0n ? -a : a;
  let y = b < 0n ? -b : b;
  while (y) [x, y] = [y, x % y];
  return x;
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
const qToNumber = (x: Q): number => Number(rationalToReal(x, 17).toString());

export function isONSymmetric(model: QuarticModel, values: readonly number[]): boolean {
  const n = model.fields;
  const lambda = new Array<number>(n ** 4).fill(0);
  model.basis.forEach((b, k) => {
    b.data.forEach((x, i) => {
      if (x !== 0n) lambda[i] += values[k] * qToNumber(qMul(model.scales[k], q(x)));
    });
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


