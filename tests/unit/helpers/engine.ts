import assert from 'node:assert/strict';
import Decimal from 'decimal.js';

const Wide = Decimal.clone({ precision: 1020 });

/** |actual − expected| below one unit in the `digits`-th significant digit of expected. */
export function assertDigits(actual: { toString(): string } | string, expected: string, digits: number, label = ''): void {
  const a = new Wide(actual.toString());
  const e = new Wide(expected);
  const diff = a.minus(e).abs();
  if (e.isZero()) {
    assert.ok(diff.lte(new Wide(10).pow(-digits)), `${label}: expected 0, got ${a}`);
    return;
  }
  const unit = new Wide(10).pow(e.e - (digits - 1));
  assert.ok(diff.lt(unit), `${label}: ${a.toSignificantDigits(digits + 3)} differs from ${e.toSignificantDigits(digits + 3)} beyond ${digits} digits`);
}

/** Relative difference as a number (for double-precision comparisons). */
export function relativeDifference(a: number, b: number): number {
  if (a === b) return 0;
  return Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b));
}

const Work = Decimal.clone({ precision: 130 });

/** A 130-digit decimal for building expected values in tests. */
export function wide(x: { toString(): string } | string | number): Decimal {
  return new Work(x.toString());
}

/** A decimal string for fast-check generated doubles, exact as written. */
export function decimalText(x: number): string {
  return x.toPrecision(15);
}
