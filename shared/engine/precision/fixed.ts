/**
 * Binary fixed-point arithmetic on BigInt: a value v is stored as the integer round(v·2^bits).
 * The special functions run on this representation because, at 30–300 digits, one BigInt product
 * costs a fraction of a decimal.js operation (no per-digit objects, no rounding bookkeeping).
 * Every function takes the working precision `bits` explicitly; errors are absolute, a few units
 * of 2^-bits per operation, and callers add guard bits for that.
 */
export type Fixed = bigint;

export interface ExactRational {
  num: bigint;
  den: bigint; // always > 0
}

export function one(bits: number): Fixed {
  return 1n << BigInt(bits);
}

export function mul(a: Fixed, b: Fixed, bits: number): Fixed {
  return (a * b) >> BigInt(bits);
}

export function div(a: Fixed, b: Fixed, bits: number): Fixed {
  return (a << BigInt(bits)) / b;
}

export function fromInteger(n: bigint | number, bits: number): Fixed {
  return BigInt(n) << BigInt(bits);
}

export function fromRational(num: bigint, den: bigint, bits: number): Fixed {
  const scaled = num << BigInt(bits);
  // round half away from zero
  const q = scaled / den;
  const r = scaled - q * den;
  if (2n * (r < 0n ? -r : r) >= (den < 0n ? -den : den)) return q + (scaled < 0n !== den < 0n ? -1n : 1n);
  return q;
}

export function changeBits(v: Fixed, from: number, to: number): Fixed {
  return to >= from ? v << BigInt(to - from) : v >> BigInt(from - to);
}

export function abs(v: Fixed): Fixed {
  return v < 0n ? -v : v;
}

export function bitLength(v: bigint): number {
  if (v < 0n) v = -v;
  if (v === 0n) return 0;
  return v.toString(16).length * 4 - leadingZeroBitsOfHexDigit(v.toString(16)[0]);
}

function leadingZeroBitsOfHexDigit(h: string): number {
  const d = parseInt(h, 16);
  return d >= 8 ? 0 : d >= 4 ? 1 : d >= 2 ? 2 : 3;
}

export function isqrt(n: bigint): bigint {
  if (n < 0n) throw new RangeError('isqrt of negative');
  if (n < 2n) return n;
  let x = 1n << BigInt(Math.ceil(bitLength(n) / 2));
  for (;;) {
    const y = (x + n / x) >> 1n;
    if (y >= x) return x;
    x = y;
  }
}

export function sqrt(a: Fixed, bits: number): Fixed {
  return isqrt(a << BigInt(bits));
}

/** Σ_{k≥0} x^(2k+1)/(2k+1) for x = 1/q, q an integer ≥ 2; used for constants. */
export function atanhInverse(q: bigint, bits: number): Fixed {
  let power = one(bits) / q;
  const q2 = q * q;
  let sum = 0n;
  for (let k = 1n; power !== 0n; k += 2n) {
    sum += power / k;
    power /= q2;
  }
  return sum;
}

/** Σ_{k≥0} (−1)^k x^(2k+1)/(2k+1) for x = 1/q. */
export function atanInverse(q: bigint, bits: number): Fixed {
  let power = one(bits) / q;
  const q2 = q * q;
  let sum = 0n;
  let sign = 1n;
  for (let k = 1n; power !== 0n; k += 2n) {
    sum += (sign * power) / k;
    power /= q2;
    sign = -sign;
  }
  return sum;
}

