import { fail } from '../precision';
import { zetaEvenRationalFactor } from '../special';
import { type Affine, affineShift, integerShift, isConstantAffine } from './affine';
import { Expression } from './expression';
import { polyConstant, polyFromAffine, polyMul } from './polynomial';
import { type Q, q, qAdd, qEquals, qIsZero, qPowInt } from './rational';
import { ratConstant, ratDivideByPoly, ratFromPoly } from './ratfunc';

/*
 * Canonical constructors for atoms. Every ψ or Γ whose argument differs from another by an integer
 * is rewritten on the base argument with constant part in [0,1) (pure numbers: (0,1]), using
 * ψ^(k)(x+1) = ψ^(k)(x) + (−1)^k k!/x^(k+1) and Γ(x+1) = xΓ(x) (DLMF 5.15.5, 5.5.1);
 * special values ψ(1) = −γ, ψ^(k)(1) = (−1)^(k+1) k! ζ(k+1), ψ(1/2) = −γ − 2 ln 2,
 * ψ^(k)(1/2) = (−1)^(k+1) k! (2^(k+1)−1) ζ(k+1) (DLMF 5.4.12, 5.4.13, 5.15.2, 5.15.3),
 * Γ(1/2) = π^(1/2), and ζ(2m) = rational·π^(2m) (DLMF 25.6.2).
 */

export const piExpr = (): Expression => Expression.atomPower({ kind: 'pi' });
export const log2Expr = (): Expression => Expression.atomPower({ kind: 'log2' });
export const eulerGammaExpr = (): Expression => Expression.atomPower({ kind: 'eulergamma' });

export function zetaExpr(n: number): Expression {
  if (!Number.isInteger(n) || n < 2) fail('domain', `zeta(${n}) is not a finite constant`);
  if (n % 2 === 0) return piExpr().pow(q(n)).scale(zetaEvenRationalFactor(n));
  return Expression.atomPower({ kind: 'zeta', n });
}

/** P(x), the tetrahedron period (docs/tetrahedron.md): exactly 6ζ(3) at x = 2, an atom otherwise. */
export function tetrahedronExpr(x: Affine): Expression {
  if (isConstantAffine(x) && qEquals(x.constant, q(2))) return zetaExpr(3).scale(q(6));
  return Expression.atomPower({ kind: 'tetrahedron', arg: x });
}

function factorial(n: number): bigint {
  let f = 1n;
  for (let i = 2n; i <= BigInt(n); i++) f *= i;
  return f;
}

const sign = (k: number): bigint => (k % 2 === 0 ? 1n : -1n);

/** ψ^(k)(x) for x affine in parameters. */
export function psiExpr(k: number, x: Affine): Expression {
  if (!Number.isInteger(k) || k < 0) fail('domain', `psi order must be a non-negative integer, got ${k}`);
  const { base, shift } = integerShift(x);
  if (isConstantAffine(x) && qIsZero(base.constant) && shift <= 0n) fail('pole', `psi has a pole at ${shift}`);
  let start = base;
  let steps = shift;
  if (isConstantAffine(x) && qIsZero(base.constant)) {
    start = affineShift(base, q(1)); // integers reduce to ψ(1)
    steps = shift - 1n;
  }
  let value = psiBase(k, start);
  // ψ^(k)(b+n) = ψ^(k)(b) + Σ_{j=0}^{n−1} (−1)^k k!/(b+j)^(k+1);  negative n subtracts Σ_{j=1}^{|n|} at b−j
  const kFactorial = factorial(k);
  const count = steps < 0n ? -steps : steps;
  for (let j = 1n; j <= count; j++) {
    const offset = steps > 0n ? j - 1n : -j;
    const at = affineShift(start, q(offset));
    const term = shiftTerm(at, k, sign(k) * kFactorial);
    value = steps > 0n ? value.add(term) : value.sub(term);
  }
  return value;
}

function shiftTerm(at: Affine, k: number, numerator: bigint): Expression {
  if (isConstantAffine(at)) {
    if (qIsZero(at.constant)) fail('pole', 'psi shift passes through a pole');
    return Expression.rational(qPowInt(at.constant, -(k + 1))).scale(q(numerator));
  }
  return Expression.ratfunc(ratDivideByPoly(ratConstant(q(numerator)), polyFromAffine(at), k + 1));
}

function psiBase(k: number, b: Affine): Expression {
  if (isConstantAffine(b)) {
    if (qEquals(b.constant, q(1))) return k === 0 ? eulerGammaExpr().neg() : zetaExpr(k + 1).scale(q(-sign(k) * factorial(k)));
    if (qEquals(b.constant, q(1, 2))) {
      if (k === 0) return eulerGammaExpr().neg().sub(log2Expr().scale(q(2)));
      return zetaExpr(k + 1).scale(q(-sign(k) * factorial(k) * ((1n << BigInt(k + 1)) - 1n)));
    }
  }
  return Expression.atomPower({ kind: 'psi', order: k, arg: b });
}

/** Γ(x) for x affine in parameters (a single term: rational function × atom power). */
export function gammaExpr(x: Affine): Expression {
  const { base, shift } = integerShift(x);
  if (isConstantAffine(x)) {
    if (qIsZero(base.constant)) {
      if (shift <= 0n) fail('pole', `Gamma has a pole at ${shift}`);
      return Expression.rational(q(factorial(Number(shift - 1n))));
    }
  }
  const baseValue = isConstantAffine(base) && qEquals(base.constant, q(1, 2)) ? piExpr().pow(q(1, 2)) : Expression.atomPower({ kind: 'gamma', arg: base });
  if (shift === 0n) return baseValue;
  if (isConstantAffine(base)) {
    let factor: Q = q(1);
    if (shift > 0n) for (let j = 0n; j < shift; j++) factor = mulQ(factor, qAdd(base.constant, q(j)));
    else for (let j = 1n; j <= -shift; j++) factor = divQ(factor, qAdd(base.constant, q(-j)));
    return baseValue.scale(factor);
  }
  let product = polyConstant(q(1));
  if (shift > 0n) {
    for (let j = 0n; j < shift; j++) product = polyMul(product, polyFromAffine(affineShift(base, q(j))));
    return baseValue.mulRatFunc(ratFromPoly(product));
  }
  for (let j = 1n; j <= -shift; j++) product = polyMul(product, polyFromAffine(affineShift(base, q(-j))));
  return baseValue.mulRatFunc(ratDivideByPoly(ratConstant(q(1)), product));
}

const mulQ = (a: Q, b: Q): Q => q(a.num * b.num, a.den * b.den);
const divQ = (a: Q, b: Q): Q => q(a.num * b.den, a.den * b.num);
