/**
 * Rungbook calculation engine: pure TypeScript, no I/O. The public surface for code outside the engine,
 * taken from each layer's index.ts (docs/engine.md, "Layers").
 * Layers, lowest first (each imports only from those before it in this list):
 * precision → special → series → symbolic → integrals → linalg → pade → models → diagrams → flows →
 * fixedpoints → exponents → scans → data.
 */
export {
  type EngineErrorCode,
  type Real,
  type RealInput,
  EngineError,
  GUARD_DIGITS,
  MAX_DIGITS,
  MIN_DIGITS,
  bitsForDigits,
  fail,
  fixedToReal,
  gcd,
  powerOfTen,
  rationalToReal,
  realContext,
  reduce,
  toExactRational,
  toReal,
} from './precision';
export * as special from './special';
export { type CoefficientRing, LaurentSeries, numericRing } from './series';
export {
  type Affine,
  type Q,
  Expression,
  affine,
  affineAdd,
  affineConstant,
  affineKey,
  affineNeg,
  affineParameter,
  affineScale,
  affineShift,
  affineSub,
  affineToLatex,
  affineToString,
  coefficientOf,
  evaluateAffine,
  evaluateExpression,
  eulerGammaExpr,
  expressionToLatex,
  expressionToString,
  gammaExpr,
  integerShift,
  isConstantAffine,
  joinSigned,
  latexName,
  latexRational,
  log2Expr,
  piExpr,
  psiExpr,
  q,
  substituteAffine,
  symbolicRing,
  withoutParameter,
  zetaExpr,
} from './symbolic';
export * from './integrals';
export * from './pade';
