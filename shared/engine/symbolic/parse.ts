import { create, parseDependencies } from 'mathjs';
import { fail, toExactRational } from '../precision';
import { type Q } from './rational';

// Numbers are read as BigNumber: a literal keeps every digit it was written with (precision only
// rounds arithmetic, and the tree is never evaluated), so each constant converts to an exact rational.
const math = create({ parseDependencies }, { number: 'BigNumber', precision: 64 });
// The first parse instantiates mathjs's lazy factories (about 0.1 s): pay it at load, not inside a request.
math.parse('0');

/** A node of a parsed expression: numbers, names, operators, brackets and function calls. */
export interface ExpressionNode {
  type: string;
  op?: string;
  fn?: string | { name?: string };
  name?: string;
  args?: ExpressionNode[];
  content?: ExpressionNode;
  value?: unknown;
}

/**
 * The one reader of expression text (potentials, Γ-products, affine arguments). `what` names the
 * text in the error message, e.g. "the potential".
 */
export function parseExpression(text: string, what: string): ExpressionNode {
  try {
    return math.parse(text) as unknown as ExpressionNode;
  } catch (e) {
    return fail('parse', `cannot parse ${what}: ${(e as Error).message}`);
  }
}

/** The exact value of a number in the text: decimals become rationals digit for digit (0.1 = 1/10). */
export function exactConstant(node: ExpressionNode): Q {
  if (node.type !== 'ConstantNode') return fail('parse', `expected a number, found ${node.type}`);
  return toExactRational(String(node.value));
}

/** The name of a function call node (gamma, psi, …), if it is one. */
export function functionName(node: ExpressionNode): string | undefined {
  return typeof node.fn === 'object' ? node.fn?.name : node.fn;
}
