import { test } from 'node:test';
import assert from 'node:assert/strict';
import { EngineError, special } from '../../../shared/engine/index';
import { assertDigits } from '../helpers/engine';
import { PSI_110, PSI_310 } from '../helpers/mpmath-values';

/**
 * ψ⁽ⁿ⁾(x) for every order the job layer allows (0…200), on both sides of the axis, tiny to large x,
 * against mpmath 1.3.0 (reference library; values in mpmath-values.ts). "Every printed digit
 * correct": the error is below one unit in the last printed digit.
 */

const ORDERS = [0, 1, 2, 15, 16, 17, 30, 50, 100, 150, 200];
const POINTS = ['7.25', '0.001', '1e-9', '-3.7', '1e6', '123.456', '1/3'];

function argument(x: string): string | { num: bigint; den: bigint } {
  return x === '1/3' ? { num: 1n, den: 3n } : x;
}

test('ψ⁽ⁿ⁾(x) at 5, 30 and 100 digits for n up to 200 against mpmath (reference library)', () => {
  for (const n of ORDERS) {
    for (const x of POINTS) {
      const expected = PSI_110[`${n}|${x}`];
      for (const digits of [5, 30, 100]) assertDigits(special.polygamma(n, argument(x), digits), expected, digits, `psi(${n}, ${x}) at ${digits} digits`);
    }
  }
});

test('ψ⁽ⁿ⁾(x) at 300 digits for n = 2, 16, 50, 200 against mpmath (reference library)', () => {
  for (const n of [2, 16, 50, 200]) {
    for (const x of ['7.25', '-3.7', '1/3']) assertDigits(special.polygamma(n, argument(x), 300), PSI_310[`${n}|${x}`], 300, `psi(${n}, ${x}) at 300 digits`);
  }
});

test('the example of issue 11: ψ⁽⁵⁰⁾(7.25) at 30 digits (mpmath 1.3.0 at 50 digits: −404049652781816682378.85938765704952249045122460938)', () => {
  assert.equal(special.polygamma(50, '7.25', 30).toPrecision(30), '-404049652781816682378.859387657');
});

test('ψ⁽ⁿ⁾ errors: poles at 0, −1, −2, … (DLMF §5.15), negative or non-integer orders', () => {
  for (const n of [0, 3, 200]) assert.throws(() => special.polygamma(n, '-3', 20), (e: unknown) => e instanceof EngineError && e.code === 'pole');
  assert.throws(() => special.polygamma(-1, '2', 20), (e: unknown) => e instanceof EngineError && e.code === 'domain');
  assert.throws(() => special.polygamma(1.5, '2', 20), (e: unknown) => e instanceof EngineError && e.code === 'domain');
});
