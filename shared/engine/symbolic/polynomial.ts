import { fail } from '../precision';
import { lcm } from './util';
import { type Affine, joinSigned, latexName, latexRational } from './affine';
import { type Q, Q0, q, qAdd, qDiv, qIsZero, qMul, qPowInt, qToString } from './rational';

/** Multivariate polynomial over Q; a monomial is a sorted list of [variable, exponent ≥ 1]. */
export type PolyMonomial = ReadonlyArray<readonly [string, number]>;
export interface PolyTerm {
  monomial: PolyMonomial;
  coeff: Q;
}
export type Poly = ReadonlyMap<string, PolyTerm>;

const monomialKey = (m: PolyMonomial): string => m.map(([v, e]) => (e === 1 ? v : `${v}^${e}`)).join('*');

function build(terms: Iterable<PolyTerm>): Poly {
  const out = new Map<string, PolyTerm>();
  for (const t of terms) {
    const key = monomialKey(t.monomial);
    const prev = out.get(key);
    const coeff = prev ? qAdd(prev.coeff, t.coeff) : t.coeff;
    if (qIsZero(coeff)) out.delete(key);
    else out.set(key, { monomial: t.monomial, coeff });
  }
  return out;
}

export const polyZero = (): Poly => new Map();
export const polyConstant = (c: Q): Poly => build([{ monomial: [], coeff: c }]);
export const polyVariable = (name: string): Poly => build([{ monomial: [[name, 1]], coeff: q(1) }]);

export function polyFromAffine(a: Affine): Poly {
  return build([{ monomial: [], coeff: a.constant }, ...a.terms.map(([v, c]) => ({ monomial: [[v, 1]] as PolyMonomial, coeff: c }))]);
}

export const polyIsZero = (p: Poly): boolean => p.size === 0;

export function polyConstantValue(p: Poly): Q | null {
  if (p.size === 0) return Q0;
  if (p.size === 1) {
    const t = p.get('');
    if (t) return t.coeff;
  }
  return null;
}

export const polyAdd = (a: Poly, b: Poly): Poly => build([...a.values(), ...b.values()]);
export const polyNeg = (a: Poly): Poly => polyScale(a, q(-1));
export const polySub = (a: Poly, b: Poly): Poly => polyAdd(a, polyNeg(b));
export const polyScale = (a: Poly, c: Q): Poly => (qIsZero(c) ? polyZero() : build([...a.values()].map((t) => ({ monomial: t.monomial, coeff: qMul(t.coeff, c) }))));

function multiplyMonomials(a: PolyMonomial, b: PolyMonomial): PolyMonomial {
  const m = new Map<string, number>();
  for (const [v, e] of [...a, ...b]) m.set(v, (m.get(v) ?? 0) + e);
  return [...m.entries()].sort(([x], [y]) => (x < y ? -1 : x > y ? 1 : 0));
}

export function polyMul(a: Poly, b: Poly): Poly {
  const terms: PolyTerm[] = [];
  for (const s of a.values()) for (const t of b.values()) terms.push({ monomial: multiplyMonomials(s.monomial, t.monomial), coeff: qMul(s.coeff, t.coeff) });
  return build(terms);
}

export function polyPow(a: Poly, n: number): Poly {
  let r = polyConstant(q(1));
  for (let i = 0; i < n; i++) r = polyMul(r, a);
  return r;
}

export function polyEquals(a: Poly, b: Poly): boolean {
  return polyIsZero(polySub(a, b));
}

export function polyVariables(p: Poly): string[] {
  const vars = new Set<string>();
  for (const t of p.values()) for (const [v] of t.monomial) vars.add(v);
  return [...vars].sort();
}

function degreeIn(m: PolyMonomial, v: string): number {
  return m.find(([x]) => x === v)?.[1] ?? 0;
}

function withoutVariable(m: PolyMonomial, v: string, reduceBy: number): PolyMonomial {
  return m.map(([x, e]) => (x === v ? ([x, e - reduceBy] as const) : ([x, e] as const))).filter(([, e]) => e > 0);
}

/** Exact quotient p/f, or null when f does not divide p (needs f's leading coefficient in some variable to be a number). */
export function polyDivideExact(p: Poly, f: Poly): Poly | null {
  const fc = polyConstantValue(f);
  if (fc) return qIsZero(fc) ? null : polyScale(p, qDiv(q(1), fc));
  for (const v of polyVariables(f)) {
    const df = Math.max(...[...f.values()].map((t) => degreeIn(t.monomial, v)));
    const leading = [...f.values()].filter((t) => degreeIn(t.monomial, v) === df);
    if (leading.length !== 1 || leading[0].monomial.length !== 1) continue;
    const lc = leading[0].coeff;
    let rest = p;
    let quotient = polyZero();
    for (let guard = 0; guard < 10000 && !polyIsZero(rest); guard++) {
      const dp = Math.max(...[...rest.values()].map((t) => degreeIn(t.monomial, v)));
      if (dp < df) return null;
      const top = [...rest.values()].filter((t) => degreeIn(t.monomial, v) === dp);
      const step = build(top.map((t) => ({ monomial: withoutVariable(t.monomial, v, df), coeff: qDiv(t.coeff, lc) })));
      quotient = polyAdd(quotient, step);
      rest = polySub(rest, polyMul(step, f));
    }
    return polyIsZero(rest) ? quotient : null;
  }
  return null;
}

/** p = c·primitive(p) with integer coprime coefficients and a positive leading coefficient. */
export function polyPrimitive(p: Poly): { content: Q; primitive: Poly } {
  if (polyIsZero(p)) fail('domain', 'primitive part of zero');
  const terms = sortedTerms(p);
  let den = 1n;
  for (const t of terms) den = lcm(den, t.coeff.den);
  let g = 0n;
  for (const t of terms) g = gcdBig(g, (t.coeff.num * den) / t.coeff.den);
  if (terms[0].coeff.num < 0n) g = -g;
  const content = q(g, den);
  return { content, primitive: polyScale(p, qDiv(q(1), content)) };
}

function gcdBig(a: bigint, b: bigint): bigint {
  a = a < 0n ? -a : a;
  b = b < 0n ? -b : b;
  while (b) [a, b] = [b, a % b];
  return a;
}

/** Terms in a fixed order: higher total degree first, then by variable names. */
export function sortedTerms(p: Poly): PolyTerm[] {
  const deg = (m: PolyMonomial) => m.reduce((s, [, e]) => s + e, 0);
  return [...p.values()].sort((a, b) => deg(b.monomial) - deg(a.monomial) || (monomialKey(a.monomial) < monomialKey(b.monomial) ? -1 : monomialKey(a.monomial) > monomialKey(b.monomial) ? 1 : 0));
}

export function polyKey(p: Poly): string {
  return polyToString(p);
}

export function polyEvaluate(p: Poly, values: Readonly<Record<string, Q>>): Q {
  let sum = Q0;
  for (const t of p.values()) {
    let term = t.coeff;
    for (const [v, e] of t.monomial) {
      const x = values[v];
      if (!x) fail('invalid', `no value given for parameter ${v}`);
      term = qMul(term, qPowInt(x, e));
    }
    sum = qAdd(sum, term);
  }
  return sum;
}

export function polySubstitute(p: Poly, name: string, value: Poly): Poly {
  let out = polyZero();
  for (const t of p.values()) {
    const e = degreeIn(t.monomial, name);
    const rest = build([{ monomial: withoutVariable(t.monomial, name, e), coeff: t.coeff }]);
    out = polyAdd(out, polyMul(rest, polyPow(value, e)));
  }
  return out;
}

/** Number of terms (for deciding on parentheses). */
export const polyTermCount = (p: Poly): number => p.size;

export function polyToString(p: Poly): string {
  if (polyIsZero(p)) return '0';
  return joinSigned(
    sortedTerms(p).map((t) => {
      const vars = t.monomial.map(([v, e]) => (e === 1 ? v : `${v}^${e}`)).join('*');
      if (!vars) return qToString(t.coeff);
      const c = t.coeff;
      if (c.num === 1n && c.den === 1n) return vars;
      if (c.num === -1n && c.den === 1n) return `-${vars}`;
      if (c.den === 1n) return `${c.num}*${vars}`;
      if (c.num === 1n || c.num === -1n) return `${c.num < 0n ? '-' : ''}${vars}/${c.den}`;
      return `${c.num}*${vars}/${c.den}`;
    }),
  );
}

export function polyToLatex(p: Poly): string {
  if (polyIsZero(p)) return '0';
  return joinSigned(
    sortedTerms(p).map((t) => {
      const vars = t.monomial.map(([v, e]) => (e === 1 ? latexName(v) : `${latexName(v)}^{${e}}`)).join(' ');
      if (!vars) return latexRational(t.coeff);
      const c = t.coeff;
      if (c.num === 1n && c.den === 1n) return vars;
      if (c.num === -1n && c.den === 1n) return `-${vars}`;
      return `${latexRational(c)}${vars.startsWith('\\') ? ' ' : ''}${vars}`;
    }),
  );
}
