/**
 * Rungbook calculation engine: pure TypeScript, no I/O.
 * Layers (each imports only from those above it in this list):
 * precision → special → series → symbolic → integrals → pade.
 */
export * from './precision/errors';
export * from './precision/real';
export * as special from './special/index';
export { LaurentSeries } from './series/laurent';
export { numericRing } from './series/numeric';
export type { CoefficientRing } from './series/ring';
export * from './symbolic/affine';
export { Expression } from './symbolic/expression';
export * from './symbolic/canonical';
export { expressionToLatex, expressionToString } from './symbolic/format';
export { evaluateExpression } from './symbolic/evaluate';
export { symbolicRing } from './symbolic/ring';
export { type Q, q } from './symbolic/rational';
export * from './integrals/index';
export * from './pade/pade';
