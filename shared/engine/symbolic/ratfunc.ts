import { fail } from '../precision';
import {
  type Poly,
  polyAdd,
  polyConstant,
  polyConstantValue,
  polyDivideExact,
  polyEvaluate,
  polyIsZero,
  polyKey,
  polyMul,
  polyPow,
  polyPrimitive,
  polyScale,
  polyTermCount,
  polyToLatex,
  polyToString,
  polyVariables,
} from './polynomial';
import { type Q, q, qDiv, qIsZero, qPowInt } from './rational';

/**
 * Rational function numerator / Π factor^power. Factors are primitive integer polynomials with a
 * positive leading coefficient, so a coefficient such as (N+2)/(N+8)^3 has one representation.
 */
export interface Factor {
  poly: Poly;
  power: number;
}
export interface RatFunc {
  num: Poly;
  den: ReadonlyMap<string, Factor>;
}

const EMPTY: ReadonlyMap<string, Factor> = new Map();

export const ratConstant = (c: Q): RatFunc => ({ num: polyConstant(c), den: EMPTY });
export const ratFromPoly = (p: Poly): RatFunc => ({ num: p, den: EMPTY });
export const ratIsZero = (r: RatFunc): boolean => polyIsZero(r.num);

export function ratConstantValue(r: RatFunc): Q | null {
  return r.den.size === 0 ? polyConstantValue(r.num) : null;
}

function denominatorPoly(den: ReadonlyMap<string, Factor>): Poly {
  let p = polyConstant(q(1));
  for (const f of den.values()) p = polyMul(p, polyPow(f.poly, f.power));
  return p;
}

function cancel(num: Poly, den: Map<string, Factor>): RatFunc {
  if (polyIsZero(num)) return { num, den: EMPTY };
  for (const [key, f] of [...den.entries()]) {
    let power = f.power;
    let n = num;
    while (power > 0) {
      const quotient = polyDivideExact(n, f.poly);
      if (!quotient) break;
      n = quotient;
      power--;
    }
    num = n;
    if (power === 0) den.delete(key);
    else den.set(key, { poly: f.poly, power });
  }
  return { num, den };
}

export function ratMul(a: RatFunc, b: RatFunc): RatFunc {
  const den = new Map(a.den);
  for (const [key, f] of b.den) den.set(key, { poly: f.poly, power: (den.get(key)?.power ?? 0) + f.power });
  return cancel(polyMul(a.num, b.num), den);
}

export function ratScale(a: RatFunc, c: Q): RatFunc {
  return qIsZero(c) ? ratConstant(q(0)) : { num: polyScale(a.num, c), den: a.den };
}

export function ratAdd(a: RatFunc, b: RatFunc): RatFunc {
  if (ratIsZero(a)) return b;
  if (ratIsZero(b)) return a;
  const den = new Map<string, Factor>();
  for (const [key, f] of [...a.den, ...b.den]) den.set(key, { poly: f.poly, power: Math.max(den.get(key)?.power ?? 0, f.power) });
  const cofactor = (own: ReadonlyMap<string, Factor>) => {
    let p = polyConstant(q(1));
    for (const [key, f] of den) p = polyMul(p, polyPow(f.poly, f.power - (own.get(key)?.power ?? 0)));
    return p;
  };
  return cancel(polyAdd(polyMul(a.num, cofactor(a.den)), polyMul(b.num, cofactor(b.den))), den);
}

export const ratNeg = (a: RatFunc): RatFunc => ratScale(a, q(-1));
export const ratSub = (a: RatFunc, b: RatFunc): RatFunc => ratAdd(a, ratNeg(b));

/** 1/r; the numerator is split into linear factors where it has rational roots. */
export function ratInverse(r: RatFunc): RatFunc {
  if (ratIsZero(r)) fail('domain', 'division by zero');
  const { content, primitive } = polyPrimitive(r.num);
  const num = polyScale(denominatorPoly(r.den), qDiv(q(1), content));
  const den = new Map<string, Factor>();
  for (const f of splitFactors(primitive)) {
    if (polyConstantValue(f)) continue;
    const key = polyKey(f);
    den.set(key, { poly: f, power: (den.get(key)?.power ?? 0) + 1 });
  }
  return { num, den };
}

/** Divide by a polynomial factor raised to a power (used for 1/(x+j)^k shifts). */
export function ratDivideByPoly(r: RatFunc, p: Poly, power = 1): RatFunc {
  return ratMul(r, ratInverse(ratFromPoly(polyPow(p, power))));
}

/** Split a primitive polynomial into factors: rational roots of univariate ones become linear factors. */
function splitFactors(p: Poly): Poly[] {
  const vars = polyVariables(p);
  if (vars.length !== 1) return vars.length === 0 ? [] : [p];
  const v = vars[0];
  const coeffs = univariateCoefficients(p, v);
  const factors: Poly[] = [];
  let rest = p;
  let degree = coeffs.length - 1;
  for (const root of candidateRoots(coeffs)) {
    const linear = polyPrimitive(polyAdd(polyScale(polyVar(v), q(root.den)), polyConstant(q(-root.num)))).primitive;
    for (;;) {
      if (degree <= 0) break;
      const quotient = polyDivideExact(rest, linear);
      if (!quotient) break;
      factors.push(linear);
      rest = quotient;
      degree--;
    }
  }
  if (degree > 0) factors.push(polyPrimitive(rest).primitive);
  return factors;
}

function polyVar(v: string): Poly {
  return new Map([[v, { monomial: [[v, 1]] as const, coeff: q(1) }]]);
}

function univariateCoefficients(p: Poly, v: string): bigint[] {
  const out: bigint[] = [];
  for (const t of p.values()) {
    const e = t.monomial.length ? t.monomial[0][1] : 0;
    while (out.length <= e) out.push(0n);
    out[e] = t.coeff.num; // primitive ⇒ integer coefficients
  }
  void v;
  return out;
}

/** Rational roots ±p/q with p | a_0 and q | a_n, for small coefficients (otherwise none tried). */
function candidateRoots(coeffs: bigint[]): Q[] {
  const a0 = coeffs.find((c) => c !== 0n) ?? 0n;
  const lowest = coeffs.findIndex((c) => c !== 0n);
  const an = coeffs[coeffs.length - 1];
  const roots: Q[] = lowest > 0 ? [q(0)] : [];
  const abs = (x: bigint) => (x < 0n ? -x : x);
  if (abs(a0) > 100000n || abs(an) > 100000n) return roots;
  const divisors = (n: bigint) => {
    const out: bigint[] = [];
    for (let d = 1n; d <= abs(n); d++) if (abs(n) % d === 0n) out.push(d);
    return out;
  };
  for (const p of divisors(a0)) for (const qq of divisors(an)) for (const sign of [1n, -1n]) roots.push(q(sign * p, qq));
  return roots;
}

export function ratEvaluate(r: RatFunc, values: Readonly<Record<string, Q>>): Q {
  let value = polyEvaluate(r.num, values);
  for (const f of r.den.values()) {
    const d = polyEvaluate(f.poly, values);
    if (qIsZero(d)) fail('domain', `denominator ${polyToString(f.poly)} vanishes at the given parameters`);
    value = qDiv(value, qPowInt(d, f.power));
  }
  return value;
}

export function ratKey(r: RatFunc): string {
  return ratToString(r);
}

function sortedFactors(r: RatFunc): Factor[] {
  return [...r.den.entries()].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)).map(([, f]) => f);
}

/** Pieces for printing: numerator polynomial and denominator factors. */
export function ratParts(r: RatFunc): { num: Poly; factors: Factor[] } {
  return { num: r.num, factors: sortedFactors(r) };
}

export function ratToString(r: RatFunc): string {
  const num = polyToString(r.num);
  if (r.den.size === 0) return num;
  const den = sortedFactors(r)
    .map((f) => {
      const base = polyTermCount(f.poly) > 1 ? `(${polyToString(f.poly)})` : polyToString(f.poly);
      return f.power === 1 ? base : `${base}^${f.power}`;
    })
    .join('*');
  const numText = polyTermCount(r.num) > 1 ? `(${num})` : num;
  return `${numText}/${r.den.size > 1 || sortedFactors(r)[0].power > 1 ? `(${den})` : den}`;
}

export function factorToLatex(f: Factor): string {
  const base = polyTermCount(f.poly) > 1 ? `(${polyToLatex(f.poly)})` : polyToLatex(f.poly);
  return f.power === 1 ? base : `${base}^{${f.power}}`;
}
