import { test } from 'node:test';
import { special } from '../../../shared/engine/index';
import { assertDigits } from '../helpers/engine';
import { DIGITS_1000 } from '../helpers/mpmath-values';

/** The 1000-digit paths (Stirling series with exact shift products, fast exp/ln) against mpmath 1.3.0 (reference library). */

test('Γ(x) at 1000 digits: 7.25, 0.3, 123.456, −2.5 (closed form), −3.7 (shifted past the poles)', () => {
  for (const x of ['7.25', '0.3', '123.456', '-2.5', '-3.7']) assertDigits(special.gamma(x, 1000), DIGITS_1000[`gamma|${x}`], 1000, `Gamma(${x}) at 1000 digits`);
});

test('ψ(x) at 1000 digits: 7.25 and −3.7', () => {
  for (const x of ['7.25', '-3.7']) assertDigits(special.digamma(x, 1000), DIGITS_1000[`psi|${x}`], 1000, `psi(${x}) at 1000 digits`);
});
