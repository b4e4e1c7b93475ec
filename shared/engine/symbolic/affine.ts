import { fail } from '../precision';
import { type Q, Q0, q, qAdd, qFloor, qIsZero, qMul, qSub, qToString } from './rational';

/** c + Σ a_i·p_i with rational coefficients in named parameters (the arguments of ψ and Γ atoms). */
export interface Affine {
  constant: Q;
  terms: ReadonlyArray<readonly [string, Q]>; // sorted by name, non-zero coefficients
}

export function affine(constant: Q, terms: Record<string, Q> | ReadonlyArray<readonly [string, Q]> = []): Affine {
  const entries = Array.isArray(terms) ? terms : Object.entries(terms);
  const merged = new Map<string, Q>();
  for (const [name, c] of entries) merged.set(name, qAdd(merged.get(name) ?? Q0, c));
  const sorted = [...merged.entries()].filter(([, c]) => !qIsZero(c)).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return { constant, terms: sorted };
}

export const affineConstant = (c: Q): Affine => ({ constant: c, terms: [] });
export const affineParameter = (name: string): Affine => ({ constant: Q0, terms: [[name, q(1)]] });

export function affineAdd(a: Affine, b: Affine): Affine {
  return affine(qAdd(a.constant, b.constant), [...a.terms, ...b.terms]);
}

export function affineScale(a: Affine, c: Q): Affine {
  return affine(qMul(a.constant, c), a.terms.map(([n, v]) => [n, qMul(v, c)] as const));
}

export const affineNeg = (a: Affine): Affine => affineScale(a, q(-1));
export const affineSub = (a: Affine, b: Affine): Affine => affineAdd(a, affineNeg(b));
export const affineShift = (a: Affine, c: Q): Affine => ({ constant: qAdd(a.constant, c), terms: a.terms });
export const isConstantAffine = (a: Affine): boolean => a.terms.length === 0;

export function coefficientOf(a: Affine, name: string): Q {
  return a.terms.find(([n]) => n === name)?.[1] ?? Q0;
}

/** Drop one parameter (returns the rest). */
export function withoutParameter(a: Affine, name: string): Affine {
  return { constant: a.constant, terms: a.terms.filter(([n]) => n !== name) };
}

/** Replace a parameter by an affine expression. */
export function substituteAffine(a: Affine, name: string, value: Affine): Affine {
  const c = coefficientOf(a, name);
  if (qIsZero(c)) return a;
  return affineAdd(withoutParameter(a, name), affineScale(value, c));
}

export function evaluateAffine(a: Affine, values: Readonly<Record<string, Q>>): Q {
  let sum = a.constant;
  for (const [name, c] of a.terms) {
    const v = values[name];
    if (!v) fail('invalid', `no value given for parameter ${name}`);
    sum = qAdd(sum, qMul(c, v));
  }
  return sum;
}

/** Split the constant as ⌊c⌋ + frac, so arguments differing by integers share one canonical base. */
export function integerShift(a: Affine): { base: Affine; shift: bigint } {
  const n = qFloor(a.constant);
  return { base: { constant: qSub(a.constant, q(n)), terms: a.terms }, shift: n };
}

export function affineKey(a: Affine): string {
  return affineToString(a);
}

/** mathjs-parsable text, e.g. `s/2 + 1/3`, `2*s - 1`. */
export function affineToString(a: Affine): string {
  const parts: string[] = [];
  for (const [name, c] of a.terms) parts.push(scaledName(name, c));
  if (!qIsZero(a.constant) || parts.length === 0) parts.push(qToString(a.constant));
  return joinSigned(parts);
}

function scaledName(name: string, c: Q): string {
  if (c.num === 1n && c.den === 1n) return name;
  if (c.num === -1n && c.den === 1n) return `-${name}`;
  if (c.den === 1n) return `${c.num}*${name}`;
  if (c.num === 1n) return `${name}/${c.den}`;
  if (c.num === -1n) return `-${name}/${c.den}`;
  return `${c.num}*${name}/${c.den}`;
}

export function joinSigned(parts: string[]): string {
  return parts.reduce((acc, p, i) => (i === 0 ? p : p.startsWith('-') ? `${acc} - ${p.slice(1)}` : `${acc} + ${p}`), '');
}

export function affineToLatex(a: Affine): string {
  const parts: string[] = [];
  for (const [name, c] of a.terms) parts.push(latexScaled(latexName(name), c));
  if (!qIsZero(a.constant) || parts.length === 0) parts.push(latexRational(a.constant));
  return joinSigned(parts);
}

export function latexRational(c: Q): string {
  if (c.den === 1n) return c.num.toString();
  const sign = c.num < 0n ? '-' : '';
  return `${sign}\\tfrac{${c.num < 0n ? -c.num : c.num}}{${c.den}}`;
}

function latexScaled(name: string, c: Q): string {
  if (c.num === 1n && c.den === 1n) return name;
  if (c.num === -1n && c.den === 1n) return `-${name}`;
  if (c.den === 1n) return `${c.num}${name}`;
  const sign = c.num < 0n ? '-' : '';
  const n = c.num < 0n ? -c.num : c.num;
  return `${sign}\\tfrac{${n === 1n ? name : `${n}${name}`}}{${c.den}}`;
}

export function latexName(name: string): string {
  const greek = ['alpha', 'beta', 'gamma', 'delta', 'epsilon', 'sigma', 'lambda', 'mu', 'nu', 'tau', 'kappa'];
  if (greek.includes(name)) return `\\${name}`;
  if (name.length === 1) return name;
  return `\\mathrm{${name}}`;
}
