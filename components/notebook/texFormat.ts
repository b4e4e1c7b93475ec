/** Turning engine results into TeX and plain text. */
import { monomialTex } from '../../shared/notebook/exports';

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

/** TeX of a decimal, with a real minus and scientific notation as ×10^k. */
export function decimalTex(value: string, significant = 10): string {
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
export function polynomialTex(terms: { monomial: string; coeff: Coefficient }[]): string {
  const parts: string[] = [];
  for (const term of terms) {
    if (isZero(term.coeff)) continue;
    let tex = coefficientTex(term.coeff).trim();
    if (isTopLevelSum(tex)) tex = `\\left(${tex}\\right)`;
    const negative = tex.startsWith('-');
    const magnitude = negative ? tex.slice(1).trim() : tex;
    const factor = magnitude === '1' ? monomialTex(term.monomial) : `${magnitude}\\,${monomialTex(term.monomial)}`;
    parts.push(parts.length === 0 ? `${negative ? '-' : ''}${factor}` : `${negative ? '-' : '+'} ${factor}`);
  }
  return parts.length ? parts.join(' ') : '0';
}
