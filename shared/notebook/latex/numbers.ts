import Decimal from 'decimal.js';

/**
 * How the LaTeX export writes computed numbers. By default every computed digit is kept (the export
 * carries the full value); `digits` rounds to that many significant digits; `exact` writes a value
 * as a fraction when its digits are those of a small-denominator rational (see rationalOf).
 */
export interface NumberStyle {
  digits?: number;
  exact?: boolean;
}

const HighPrecision = Decimal.clone({ precision: 80 });
const PLAIN_DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

/** Largest denominator a printed coefficient is recognised with (one- and two-loop weights have small ones). */
export const MAX_DENOMINATOR = 1000;
/**
 * Fewest significant digits that identify a non-terminating rational: p/q with q ≤ 1000 are about
 * 3·10⁵ per unit interval, so a random 12-digit decimal matches one by chance with probability ~10⁻⁷.
 */
export const DIGITS_TO_RECOGNISE = 12;
/** A short decimal is written as a fraction only with a small denominator: 1.75 = 7/4, but 0.142 stays (not 71/500). */
export const MAX_SHORT_DENOMINATOR = 100;

export const isPlainDecimal = (text: string) => PLAIN_DECIMAL.test(text.trim());

function significantDigits(text: string): number {
  const mantissa = text.trim().replace(/^[+-]/, '').replace(/e.*$/i, '').replace('.', '');
  return mantissa.replace(/^0+/, '').length || 1;
}

/** Best rational approximations of x by continued fractions, with denominators up to `limit`. */
function convergents(x: Decimal, limit: number): { p: bigint; q: bigint }[] {
  const found: { p: bigint; q: bigint }[] = [];
  let [p0, q0, p1, q1] = [0n, 1n, 1n, 0n];
  let rest = x.abs();
  for (let step = 0; step < 40; step++) {
    const whole = rest.floor();
    const a = BigInt(whole.toFixed(0));
    [p0, q0, p1, q1] = [p1, q1, a * p1 + p0, a * q1 + q0];
    if (q1 > BigInt(limit)) break;
    found.push({ p: x.isNegative() ? -p1 : p1, q: q1 });
    const fraction = rest.minus(whole);
    if (fraction.isZero()) break;
    rest = new HighPrecision(1).div(fraction);
  }
  return found;
}

/**
 * The rational p/q (q ≤ MAX_DENOMINATOR) a decimal stands for: either the decimal equals it exactly
 * (1.75 = 7/4, q ≤ MAX_SHORT_DENOMINATOR when short), or it has at least DIGITS_TO_RECOGNISE significant digits and is p/q rounded to
 * that many digits (3.6666666666666666667 = 11/3 at 20 digits). Null otherwise.
 */
export function rationalOf(text: string): { p: bigint; q: bigint } | null {
  if (!isPlainDecimal(text)) return null;
  const x = new HighPrecision(text.trim());
  const digits = significantDigits(text);
  for (const { p, q } of convergents(x, MAX_DENOMINATOR)) {
    const value = new HighPrecision(p.toString()).div(q.toString());
    if (value.equals(x)) return q <= BigInt(MAX_SHORT_DENOMINATOR) || digits >= DIGITS_TO_RECOGNISE ? { p, q } : null;
    if (digits >= DIGITS_TO_RECOGNISE && value.toSignificantDigits(digits, Decimal.ROUND_HALF_EVEN).equals(x)) return { p, q };
  }
  return null;
}

/** A plain decimal in TeX: rounded when asked, a power of ten written as ×10^{k}. */
function decimalTex(text: string, digits?: number): string {
  const trimmed = text.trim().replace(/^\+/, '');
  const value = new HighPrecision(trimmed);
  const shown = digits === undefined || value.isZero() || value.precision(true) <= digits ? trimmed : roundedText(value, digits);
  const [mantissa, exponent] = shown.toLowerCase().split('e');
  return (exponent === undefined ? mantissa : `${mantissa}\\times 10^{${Number(exponent)}}`).replace(/^-/, '-');
}

function roundedText(value: Decimal, digits: number): string {
  const rounded = value.toSignificantDigits(digits, Decimal.ROUND_HALF_EVEN);
  // trailing zeros standing for dropped digits would look like computed ones: use a power of ten
  return rounded.e >= digits || rounded.e < -6 ? rounded.toExponential(digits - 1) : rounded.toString();
}

/** A real number as TeX (no sign handling beyond a leading minus); null when the text is not a plain decimal. */
export function realTex(text: string, style: NumberStyle, display = true): string | null {
  if (!isPlainDecimal(text)) return null;
  const rational = style.exact ? rationalOf(text) : null;
  if (rational && rational.q !== 1n) {
    const fraction = `${display ? '\\frac' : '\\tfrac'}{${(rational.p < 0n ? -rational.p : rational.p).toString()}}{${rational.q.toString()}}`;
    return rational.p < 0n ? `-${fraction}` : fraction;
  }
  if (rational) return rational.p.toString();
  return decimalTex(text, style.digits);
}

/** "a + bi" / "a - bi" as the engine writes complex values. */
const COMPLEX = /^\s*([+-]?[\d.e+-]+?)\s*([+-])\s*([\d.e+-]+)i\s*$/i;

/** Any value the engine prints: a real, a complex "a ± bi", or (never expected) something else as upright text. */
export function valueTex(text: unknown, style: NumberStyle, display = false): string {
  if (typeof text === 'number') return realTex(String(text), style, display) ?? '--';
  if (typeof text !== 'string') return '\\text{--}';
  const real = realTex(text, style, display);
  if (real !== null) return real;
  const complex = COMPLEX.exec(text);
  if (complex && isPlainDecimal(complex[1]) && isPlainDecimal(complex[3])) {
    return `${realTex(complex[1], style, display)} ${complex[2]} ${realTex(complex[3], style, display)}\\,i`;
  }
  return `\\text{${text.replace(/[^A-Za-z0-9 .,:;+\-/=()]/g, '')}}`;
}
