import {
  type Affine,
  type GammaFactor,
  type Q,
  affineAdd,
  affineConstant,
  affineNeg,
  affineParameter,
  affineScale,
  fail,
  isConstantAffine,
  q,
  splitEps,
} from '../engine/index';
import { isObjectPropertyName } from '../engine/models/custom';
import { type ExpressionNode, exactConstant, functionName, parseExpression } from '../engine/symbolic/parse';
import { JOB_LIMITS } from './contract';


const RESERVED = new Set(['pi', 'e', 'i', 'gamma', 'psi', 'zeta', 'log', 'eulergamma', 'Infinity', 'NaN']);

function parseText(text: string): NodeLike {
  if (text.length > JOB_LIMITS.maxExpressionLength) fail('limit', 'expression too long');
  return parseExpression(text, JSON.stringify(text.slice(0, 80)));
}

type NodeLike = ExpressionNode;

function constantValue(node: NodeLike): Q {
  return sizedQ(exactConstant(node));
}

const bitsOf = (n: bigint): number => (n < 0n ? -n : n).toString(2).length;

/** Exact arithmetic on the numbers of an expression stays small: refused once a number passes the bit limit. */
function sizedQ(x: Q): Q {
  if (Math.max(bitsOf(x.num), bitsOf(x.den)) > JOB_LIMITS.maxNumberBits) fail('limit', `a number in the expression grows beyond ${JOB_LIMITS.maxNumberBits} bits; use smaller numbers or powers`);
  return x;
}

function sized(a: Affine): Affine {
  sizedQ(a.constant);
  for (const [, c] of a.terms) sizedQ(c);
  return a;
}

/** A parameter name, refused when it is one of the built-in names every JavaScript object carries. */
export function checkParameterName(name: string): string {
  if (isObjectPropertyName(name)) fail('invalid', `"${name}" cannot name a parameter (it is a built-in property name); choose another name`);
  return name;
}

/** Affine expression in eps and parameters; `definitions` substitutes names such as d. */
export function parseAffine(text: string, definitions: Readonly<Record<string, Affine>> = {}): Affine {
  return toAffine(parseText(text), definitions, text);
}

function toAffine(node: NodeLike, defs: Readonly<Record<string, Affine>>, source: string): Affine {
  return sized(affineOf(node, defs, source));
}

function affineOf(node: NodeLike, defs: Readonly<Record<string, Affine>>, source: string): Affine {
  const notAffine = (): never => fail('not-affine', `${JSON.stringify(source.slice(0, 80))} is not affine in eps and the parameters`);
  switch (node.type) {
    case 'ConstantNode':
      return affineConstant(constantValue(node));
    case 'SymbolNode': {
      const name = checkParameterName(node.name as string);
      if (Object.hasOwn(defs, name)) return defs[name];
      if (RESERVED.has(name)) return notAffine();
      return affineParameter(name);
    }
    case 'ParenthesisNode':
      return toAffine(node.content as NodeLike, defs, source);
    case 'OperatorNode': {
      const args = node.args ?? [];
      const parts = args.map((a) => toAffine(a, defs, source));
      if (node.fn === 'unaryMinus') return affineNeg(parts[0]);
      if (node.fn === 'unaryPlus') return parts[0];
      if (node.op === '+') return affineAdd(parts[0], parts[1]);
      if (node.op === '-') return affineAdd(parts[0], affineNeg(parts[1]));
      if (node.op === '*') {
        if (isConstantAffine(parts[0])) return affineScale(parts[1], parts[0].constant);
        if (isConstantAffine(parts[1])) return affineScale(parts[0], parts[1].constant);
        return notAffine();
      }
      if (node.op === '/') {
        if (!isConstantAffine(parts[1])) return notAffine();
        if (parts[1].constant.num === 0n) fail('domain', 'division by zero in an argument');
        return affineScale(parts[0], q(parts[1].constant.den, parts[1].constant.num));
      }
      return notAffine();
    }
    default:
      return notAffine();
  }
}

export interface GammaProduct {
  prefactor: Q;
  factors: GammaFactor[];
}

/** A product/quotient/integer power of gamma(…) factors and numbers. */
export function parseGammaProduct(text: string, definitions: Readonly<Record<string, Affine>> = {}): GammaProduct {
  const product = toProduct(parseText(text), definitions, text);
  if (product.factors.length > JOB_LIMITS.maxGammaFactors) fail('limit', `at most ${JOB_LIMITS.maxGammaFactors} gamma factors`);
  return product;
}

function toProduct(node: NodeLike, defs: Readonly<Record<string, Affine>>, source: string): GammaProduct {
  const shapeError = (): never => fail('invalid', 'expr must be a product, quotient or integer power of gamma(...) factors and numbers');
  switch (node.type) {
    case 'ConstantNode':
      return { prefactor: constantValue(node), factors: [] };
    case 'ParenthesisNode':
      return toProduct(node.content as NodeLike, defs, source);
    case 'FunctionNode': {
      const name = functionName(node);
      if (name !== 'gamma' || node.args?.length !== 1) return shapeError();
      const arg = toAffine(node.args[0], defs, source);
      return { prefactor: q(1), factors: [{ arg: splitEps(arg), power: 1 }] };
    }
    case 'OperatorNode': {
      const args = node.args ?? [];
      if (node.fn === 'unaryMinus') {
        const inner = toProduct(args[0], defs, source);
        return { prefactor: q(-inner.prefactor.num, inner.prefactor.den), factors: inner.factors };
      }
      if (node.fn === 'unaryPlus') return toProduct(args[0], defs, source);
      if (node.op === '*' || node.op === '/') {
        const left = toProduct(args[0], defs, source);
        const right = toProduct(args[1], defs, source);
        if (node.op === '*') return { prefactor: mulQ(left.prefactor, right.prefactor), factors: [...left.factors, ...right.factors] };
        if (right.prefactor.num === 0n) fail('domain', 'division by zero');
        return { prefactor: mulQ(left.prefactor, q(right.prefactor.den, right.prefactor.num)), factors: [...left.factors, ...right.factors.map((f) => ({ arg: f.arg, power: -f.power }))] };
      }
      if (node.op === '^') {
        const base = toProduct(args[0], defs, source);
        const exponent = toAffine(args[1], {}, source);
        if (!isConstantAffine(exponent) || exponent.constant.den !== 1n) fail('invalid', 'powers must be integers');
        const n = Number(exponent.constant.num);
        if (Math.abs(n) > JOB_LIMITS.maxIntegerPower) fail('limit', `integer powers are limited to |n| ≤ ${JOB_LIMITS.maxIntegerPower}`);
        if (base.prefactor.num === 0n && n < 0) fail('domain', 'division by zero');
        if (Math.max(bitsOf(base.prefactor.num), bitsOf(base.prefactor.den)) * Math.abs(n) > JOB_LIMITS.maxNumberBits + 1) fail('limit', `a number in the expression grows beyond ${JOB_LIMITS.maxNumberBits} bits; use smaller numbers or powers`);
        if (base.factors.some((f) => Math.abs(f.power * n) > JOB_LIMITS.maxGammaPower)) fail('limit', `a gamma factor may be raised to a power of at most ${JOB_LIMITS.maxGammaPower} in all`);
        const pre = n >= 0 ? q(base.prefactor.num ** BigInt(n), base.prefactor.den ** BigInt(n)) : q(base.prefactor.den ** BigInt(-n), base.prefactor.num ** BigInt(-n));
        return { prefactor: pre, factors: base.factors.map((f) => ({ arg: f.arg, power: f.power * n })) };
      }
      return shapeError();
    }
    default:
      return shapeError();
  }
}

const mulQ = (a: Q, b: Q): Q => sizedQ(q(a.num * b.num, a.den * b.den));

/** Definitions such as d = 2*s − eps, parsed against the parameters. */
export function parseDefinitions(d: string | undefined): Record<string, Affine> {
  return d === undefined ? {} : { d: parseAffine(d) };
}
