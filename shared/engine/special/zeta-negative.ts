import { type ExactRational, fail, fromRational, mul, one } from '../precision';
import { ln2Fixed, piFixed } from './constants';
import { expFixedSplit, lnFixedPositive } from './elementary';
import { type BigFloat, FLOAT_ZERO, bitLen, floatFromFixed, floatMul, trim } from './float';
import { gammaScaled } from './gamma';
import { bitsNearInteger, sinPi } from './trigonometric';
import { zetaRealFixed } from './zeta';

/** ζ(x) for a rational x < 0: ζ(x) = 2^x π^{x−1} sin(πx/2) Γ(1−x) ζ(1−x)  (DLMF 25.4.1–25.4.2). Zero at even x. */
export function zetaNegativeFloat(x: ExactRational, bits: number): BigFloat {
  if (x.num >= 0n) fail('domain', 'zetaNegativeFloat needs x < 0');
  const half = { num: x.num, den: 2n * x.den };
  if (half.den === 2n && x.num % 2n === 0n) return FLOAT_ZERO; // trivial zeros
  const work = bits + 16 + bitLen(x.num / x.den);
  const oneMinusX = { num: x.den - x.num, den: x.den };
  const sinBits = work + bitsNearInteger(half) + 8;
  const sin = sinPi(half, sinBits);
  const gamma = gammaScaled(oneMinusX, work);
  const zeta = zetaRealFixed(oneMinusX, work);
  // 2^x π^{x−1} = exp(x ln 2 + (x−1) ln π); the exponent is large for large |x|, so more bits
  const expBits = work + bitLen(x.num / x.den) + 4;
  const xFixed = fromRational(x.num, x.den, expBits);
  const exponent = mul(xFixed, ln2Fixed(expBits), expBits) + mul(xFixed - one(expBits), lnFixedPositive(piFixed(expBits), expBits), expBits);
  const [m, e] = expFixedSplit(exponent, expBits);
  let value = floatMul(floatFromFixed(sin, sinBits), { man: m, exp: Number(e) - expBits }, work);
  value = floatMul(value, { man: gamma.mant, exp: Number(gamma.exp2) - work }, work);
  value = floatMul(value, floatFromFixed(zeta, work), work);
  return trim(value, bits);
}
