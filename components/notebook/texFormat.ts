/** Turning engine results into TeX and plain text. */
import Decimal from 'decimal.js';
import { monomialTex } from '../../shared/notebook/exports';
import { DIGITS_TO_RECOGNISE, rationalOf } from '../../shared/notebook/latex/numbers';
import { shortenDecimal } from './displayPrecision';

export interface SymbolicCoefficient {
  expr: string;
  latex: string;
}
export type Coefficient = string | SymbolicCoefficient;

export const isSymbolic = (value: unknown): value is SymbolicCoefficient =>
  typeof value === 'object' && value !== null && typeof (value as SymbolicCoefficient).latex === 'string' && typeof (value as SymbolicCoefficient).expr === 'string';

export const isCoefficient = (value: unknown): value is Coefficient => typeof value === 'string' || isSymbolic(value);

const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
export const isDecimal = (value: unknown): value is string => typeof value === 'string' && DECIMAL.test(value.trim());

/** A decimal shortened to `significant` digits for formulas; tables keep every digit. */
export function shortDecimal(value: string, significant = 10): string {
  if (!isDecimal(value)) return value;
  const number = Number(value);
  if (!Number.isFinite(number) || number === 0) return value.replace(/^\+/, '');
  const digits = value.replace(/^[+-]/, '').replace(/[eE].*$/, '').replace('.', '').replace(/^0+/, '');
  if (digits.length <= significant) return value.replace(/^\+/, '');
  return String(Number(number.toPrecision(significant)));
}

/** Every digit: what copies and exports carry (shortDecimal with this keeps the text). */
export const FULL_PRECISION = Number.POSITIVE_INFINITY;

/**
 * The fraction p/q (q > 1) a long decimal is the rounding of, e.g. "-0.45454545454545454545" → [-5, 11]; null when
 * none is. One rule for the app and the LaTeX export (shared/notebook/latex/numbers.ts): at least
 * DIGITS_TO_RECOGNISE digits and q ≤ MAX_DENOMINATOR. Short decimals (1.75) stay as typed here.
 */
const significantDigits = (value: string) => value.replace(/^[+-]/, '').replace(/[eE].*$/, '').replace('.', '').replace(/^0+/, '').length;

export function exactFraction(value: string): [number, number] | null {
  if (!isDecimal(value) || /[eE]/.test(value) || significantDigits(value) < DIGITS_TO_RECOGNISE) return null;
  const rational = rationalOf(value);
  return rational && rational.q > 1n ? [Number(rational.p), Number(rational.q)] : null;
}

/** "p/q" text (a weight or symmetry factor the engine writes as a fraction) → [p, q]; null otherwise. */
export function fractionOfText(value: string): [number, number] | null {
  const match = /^\s*([+-]?\d{1,15})\s*\/\s*(\d{1,15})\s*$/.exec(value);
  return match && Number(match[2]) !== 0 ? [Number(match[1]), Number(match[2])] : null;
}

/** TeX of p/q with the sign in front: "-\tfrac{5}{11}". */
export function fractionTex([numerator, denominator]: [number, number]): string {
  const sign = numerator < 0 ? '-' : '';
  const magnitude = Math.abs(numerator);
  return denominator === 1 ? `${sign}${magnitude}` : `${sign}\\tfrac{${magnitude}}{${denominator}}`;
}

/** Plain text of a value for reading: the fraction it is exactly, else the decimal at `significant` digits. */
export function readableValue(value: string, significant: number): string {
  const fraction = exactFraction(value) ?? fractionOfText(value);
  if (fraction) return `${fraction[0]}/${fraction[1]}`.replace(/^-/, '−');
  return shortenDecimal(value, significant);
}

/** TeX of a decimal, with a real minus and scientific notation as ×10^k; an exact rational as a fraction. */
export function decimalTex(value: string, significant = 10): string {
  const fraction = exactFraction(value) ?? fractionOfText(value);
  if (fraction) return fractionTex(fraction);
  const short = shortDecimal(value, significant);
  const match = /^(-?)([\d.]+)(?:[eE]([+-]?\d+))?$/.exec(short);
  if (!match) return short;
  const [, sign, mantissa, exponent] = match;
  return `${sign}${mantissa}${exponent ? `\\times 10^{${Number(exponent)}}` : ''}`;
}

export function coefficientTex(coefficient: Coefficient, significant = 10): string {
  return isSymbolic(coefficient) ? coefficient.latex : decimalTex(coefficient, significant);
}

export function coefficientText(coefficient: Coefficient): string {
  return isSymbolic(coefficient) ? coefficient.expr : coefficient;
}

const isZero = (coefficient: Coefficient) => (isSymbolic(coefficient) ? coefficient.expr.trim() === '0' : isDecimal(coefficient) && Number(coefficient) === 0);

/** Whether TeX is a sum at its top level (then it needs brackets when multiplied). */
function isTopLevelSum(tex: string): boolean {
  let depth = 0;
  const body = tex.replace(/^\s*-/, '');
  for (let i = 0; i < body.length; i += 1) {
    const char = body[i];
    if (char === '{' || char === '(' || char === '[') depth += 1;
    else if (char === '}' || char === ')' || char === ']') depth -= 1;
    else if ((char === '+' || char === '-') && depth === 0 && i > 0) return true;
  }
  return false;
}

function epsPower(power: number): string {
  if (power === 0) return '';
  if (power === 1) return '\\varepsilon';
  return `\\varepsilon^{${power}}`;
}

/**
 * TeX of Σ c_k ε^(lowest+k) + O(ε^(order+1)), e.g. `s - 0.3333\,\varepsilon + O(\varepsilon^{2})`.
 * `truncated` adds the order symbol.
 */
export function seriesTex(lowest: number, coeffs: Coefficient[], truncated = true, significant = 10): string {
  const terms: string[] = [];
  coeffs.forEach((coefficient, k) => {
    if (isZero(coefficient)) return;
    const power = lowest + k;
    let tex = coefficientTex(coefficient, significant).trim();
    if (isTopLevelSum(tex)) tex = `\\left(${tex}\\right)`;
    const negative = tex.startsWith('-');
    const magnitude = negative ? tex.slice(1).trim() : tex;
    const factor = power === 0 ? magnitude : magnitude === '1' ? epsPower(power) : `${magnitude}\\,${epsPower(power)}`;
    terms.push(terms.length === 0 ? `${negative ? '-' : ''}${factor}` : `${negative ? '-' : '+'} ${factor}`);
  });
  const body = terms.length ? terms.join(' ') : '0';
  return truncated ? `${body} + O(\\varepsilon^{${lowest + coeffs.length}})` : body;
}

/** TeX names of the exponents and scaling dimensions the engine reports. */
export const quantityTex: Record<string, string> = {
  nuInv: '1/\\nu',
  nu: '\\nu',
  eta: '\\eta',
  gamma: '\\gamma',
  alpha: '\\alpha',
  beta: '\\beta',
  delta: '\\delta',
  omega: '\\omega',
  Delta_phi: '\\Delta_{\\phi}',
  Delta_phi2: '\\Delta_{\\phi^2}',
  Delta_phi3: '\\Delta_{\\phi^3}',
  Delta_phi4: '\\Delta_{\\phi^4}',
};

/** Plain names for table headers and CSV columns. */
export const quantityNames: Record<string, string> = {
  nuInv: '1/ν',
  nu: 'ν',
  eta: 'η',
  gamma: 'γ',
  alpha: 'α',
  beta: 'β',
  delta: 'δ',
  omega: 'ω',
  Delta_phi: 'Δφ',
  Delta_phi2: 'Δφ²',
  Delta_phi3: 'Δφ³',
  Delta_phi4: 'Δφ⁴',
};

export const texOfQuantity = (key: string) => quantityTex[key] ?? `\\mathrm{${key.replace(/_/g, '\\_')}}`;
export const nameOfQuantity = (key: string): string => (key.startsWith('pade:') ? `${nameOfQuantity(key.slice(5))} (Padé)` : quantityNames[key] ?? key);

/** TeX of Σ coeff·monomial, e.g. β-functions and anomalous dimensions. */
export function polynomialTex(terms: { monomial: string; coeff: Coefficient }[], significant = 10): string {
  const parts: string[] = [];
  for (const term of terms) {
    if (isZero(term.coeff)) continue;
    let tex = coefficientTex(term.coeff, significant).trim();
    if (isTopLevelSum(tex)) tex = `\\left(${tex}\\right)`;
    const negative = tex.startsWith('-');
    const magnitude = negative ? tex.slice(1).trim() : tex;
    const factor = magnitude === '1' ? monomialTex(term.monomial) : `${magnitude}\\,${monomialTex(term.monomial)}`;
    parts.push(parts.length === 0 ? `${negative ? '-' : ''}${factor}` : `${negative ? '-' : '+'} ${factor}`);
  }
  return parts.length ? parts.join(' ') : '0';
}

/** Plain text of Σ c_k ε^(lowest+k) with every digit, e.g. "1.75 - 0.4545…·ε + O(ε^3)" (for "Copy as text"). */
export function seriesText(lowest: number, coeffs: Coefficient[], truncated = true): string {
  const terms = coeffs.flatMap((coefficient, k) => {
    if (isZero(coefficient)) return [];
    const power = lowest + k;
    const value = coefficientText(coefficient).trim();
    const factor = isSymbolic(coefficient) && isTopLevelSum(value) ? `(${value})` : value;
    return [power === 0 ? factor : `${factor}·ε${power === 1 ? '' : `^${power}`}`];
  });
  const body = terms.length ? terms.join(' + ').replace(/\+ -/g, '- ') : '0';
  return truncated ? `${body} + O(ε^${lowest + coeffs.length})` : body;
}

/** Plain text of Σ coeff·monomial with every digit ("-1·eps*u + 3.666…·u^2"). */
export function polynomialText(terms: { monomial: string; coeff: Coefficient }[]): string {
  const parts = terms.filter((term) => !isZero(term.coeff)).map((term) => `${coefficientText(term.coeff).trim()}·${term.monomial}`);
  return parts.length ? parts.join(' + ').replace(/\+ -/g, '- ') : '0';
}

/** The coefficients one per line with every digit ("Copy full-precision values"). */
export const coefficientLines = (coeffs: Coefficient[]) => coeffs.map(coefficientText).join('\n');
