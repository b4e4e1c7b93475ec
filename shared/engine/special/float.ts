import { type Fixed } from '../precision';

/**
 * Binary floating point on BigInt: value = man·2^exp. Used where a result can be far too large or
 * too small for fixed point (ψ⁽ⁿ⁾ of high order, ζ on the negative axis). Operations keep `prec`
 * significant bits and truncate; each costs at most one unit in the last kept bit.
 */
export interface BigFloat {
  man: bigint;
  exp: number;
}

export const FLOAT_ZERO: BigFloat = { man: 0n, exp: 0 };

/** Bit length of |v| (0 for 0). */
export function bitLen(v: bigint): number {
  if (v < 0n) v = -v;
  const n = Number(v);
  if (n < 2 ** 52) return n === 0 ? 0 : Math.floor(Math.log2(n)) + 1;
  const hex = v.toString(16);
  return hex.length * 4 - (4 - Math.floor(Math.log2(parseInt(hex[0], 16))) - 1);
}

export function trim(v: BigFloat, prec: number): BigFloat {
  const excess = bitLen(v.man) - prec;
  return excess > 0 ? { man: v.man >> BigInt(excess), exp: v.exp + excess } : v;
}

export function floatFromFixed(v: Fixed, bits: number): BigFloat {
  return { man: v, exp: -bits };
}

export function floatFromInteger(n: bigint, prec: number): BigFloat {
  return trim({ man: n, exp: 0 }, prec);
}

export function floatFromRational(num: bigint, den: bigint, prec: number): BigFloat {
  return floatDiv({ man: num, exp: 0 }, { man: den, exp: 0 }, prec);
}

/** The value as fixed point with `bits` fractional bits. */
export function floatToFixed(v: BigFloat, bits: number): Fixed {
  const shift = v.exp + bits;
  return shift >= 0 ? v.man << BigInt(shift) : v.man >> BigInt(-shift);
}

export function floatMul(a: BigFloat, b: BigFloat, prec: number): BigFloat {
  return trim({ man: a.man * b.man, exp: a.exp + b.exp }, prec);
}

export function floatDiv(a: BigFloat, b: BigFloat, prec: number): BigFloat {
  if (b.man === 0n) throw new RangeError('division by zero');
  const shift = prec + 1 + bitLen(b.man) - bitLen(a.man);
  const num = shift >= 0 ? a.man << BigInt(shift) : a.man >> BigInt(-shift);
  return trim({ man: num / b.man, exp: a.exp - b.exp - shift }, prec);
}

/** a + b; the caller checks for cancellation with `floatLog2` where it matters. */
export function floatAdd(a: BigFloat, b: BigFloat, prec: number): BigFloat {
  if (a.man === 0n) return trim(b, prec);
  if (b.man === 0n) return trim(a, prec);
  const [hi, lo] = a.exp + bitLen(a.man) >= b.exp + bitLen(b.man) ? [a, b] : [b, a];
  // below the working precision of the larger operand the smaller one no longer counts
  const floor = hi.exp + bitLen(hi.man) - prec - 4;
  const base = Math.max(Math.min(hi.exp, lo.exp), floor);
  const align = (v: BigFloat) => (v.exp >= base ? v.man << BigInt(v.exp - base) : v.man >> BigInt(base - v.exp));
  return trim({ man: align(hi) + align(lo), exp: base }, prec);
}

export function floatNeg(a: BigFloat): BigFloat {
  return { man: -a.man, exp: a.exp };
}

/** a^n for an integer n ≥ 0 by repeated squaring (relative error about (log2 n + popcount n) units). */
export function floatPow(a: BigFloat, n: number, prec: number): BigFloat {
  let result: BigFloat = { man: 1n, exp: 0 };
  let base = trim(a, prec);
  for (let e = n; e > 0; e = Math.floor(e / 2)) {
    if (e % 2 === 1) result = floatMul(result, base, prec);
    if (e > 1) base = floatMul(base, base, prec);
  }
  return result;
}

/** log2|v| in double precision (−Infinity for 0). */
export function floatLog2(v: BigFloat): number {
  if (v.man === 0n) return -Infinity;
  const len = bitLen(v.man);
  const top = len > 60 ? v.man >> BigInt(len - 60) : v.man;
  return Math.log2(Math.abs(Number(top))) + Math.max(0, len - 60) + v.exp;
}
