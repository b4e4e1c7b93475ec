import { createContext, useContext } from 'react';
import Decimal from 'decimal.js';

/**
 * Display precision of a notebook: how many significant digits results show on screen. The full
 * computed value stays one tap away and goes into every copy and export unchanged.
 */
export const DEFAULT_DISPLAY_DIGITS = 10;
export const DISPLAY_DIGIT_CHOICES = [4, 6, 8, 10, 12, 15, 20, 30] as const;

const DisplayDigitsContext = createContext<number>(DEFAULT_DISPLAY_DIGITS);

export const DisplayDigitsProvider = DisplayDigitsContext.Provider;

/** Significant digits the results on this screen show (10 unless the notebook says otherwise). */
export function useDisplayDigits(): number {
  return useContext(DisplayDigitsContext);
}

const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

/**
 * A decimal string rounded to `digits` significant digits (half-even, as decimal.js does), or the text
 * unchanged when it is not a plain decimal (exact rationals like 13/96, expressions, "complex", …) or
 * already short enough. Integers are never shortened.
 */
export function shortenDecimal(text: string, digits: number): string {
  const trimmed = text.trim();
  if (!DECIMAL.test(trimmed) || !/[.e]/i.test(trimmed)) return text;
  const value = new Decimal(trimmed);
  if (value.isZero() || value.precision(true) <= digits) return text;
  const rounded = value.toSignificantDigits(digits, Decimal.ROUND_HALF_EVEN);
  const exponent = rounded.e;
  // trailing zeros standing for dropped digits would look like computed ones: use a power of ten
  return exponent >= digits || exponent < -6 ? rounded.toExponential(digits - 1) : rounded.toString();
}

/** True when shortenDecimal would change the text (the UI then offers the full value). */
export function isShortened(text: string, digits: number): boolean {
  return shortenDecimal(text, digits) !== text;
}
