import { type Fixed, atanInverse, atanhInverse, changeBits, div, isqrt, mul, one } from '../precision';

/**
 * Mathematical constants in fixed point, each cached at the highest precision computed so far
 * (a lower-precision request is a shift of the cached value).
 */
export function cachedConstant(compute: (bits: number) => Fixed): (bits: number) => Fixed {
  let cachedBits = -1;
  let cachedValue: Fixed = 0n;
  return (bits: number) => {
    if (bits > cachedBits) {
      const work = bits + 32;
      cachedValue = compute(work);
      cachedBits = work;
    }
    return changeBits(cachedValue, cachedBits, bits);
  };
}

/** π by Machin's formula π = 16·atan(1/5) − 4·atan(1/239) (common practice). */
export const piFixed = cachedConstant((bits) => 16n * atanInverse(5n, bits) - 4n * atanInverse(239n, bits));

/** ln 2 = 2·atanh(1/3). */
export const ln2Fixed = cachedConstant((bits) => 2n * atanhInverse(3n, bits));

/**
 * Euler's γ by the Brent–McMillan series (algorithm B1): with n = 2^j,
 * A = Σ (n^k/k!)² (H_k − ln n), B = Σ (n^k/k!)², γ = A/B − O(e^{−4n}).
 */
export const eulerGammaFixed = cachedConstant((bits) => {
  let j = 1;
  while (2 ** j * 4 < bits * Math.LN2 + 10) j++;
  const n = 1n << BigInt(j);
  const work = bits + 16 + j;
  const n2 = n * n;
  let b = one(work);
  let a = -BigInt(j) * ln2Fixed(work);
  let sumA = a;
  let sumB = b;
  for (let k = 1n; b !== 0n || a !== 0n; k++) {
    b = (b * n2) / (k * k);
    a = ((a * n2) / k + b) / k;
    sumA += a;
    sumB += b;
  }
  return changeBits(div(sumA, sumB, work), work, bits);
});

/**
 * Catalan's constant by the fast formula G = (π/8)·ln(2+√3) + (3/8)·Σ_{n≥0} 1/((2n+1)²·C(2n,n))
 * (recalled from memory; checked against OEIS A006752 in the tests).
 */
export const catalanFixed = cachedConstant((bits) => {
  const work = bits + 16;
  let ratio = one(work); // 1/C(2n,n)
  let sum = 0n;
  for (let n = 0n; ratio !== 0n; n++) {
    const odd = 2n * n + 1n;
    sum += ratio / (odd * odd);
    ratio = (ratio * (n + 1n)) / (2n * odd);
  }
  const sqrt3 = isqrt(3n << BigInt(2 * work));
  // ln(2+√3) = 2·atanh(1/√3) = (2/√3)·Σ_{k≥0} 3^{-k}/(2k+1)
  let power = one(work);
  let atanhSum = 0n;
  for (let k = 0n; power !== 0n; k++) {
    atanhSum += power / (2n * k + 1n);
    power /= 3n;
  }
  const lnTwoPlusSqrt3 = div(2n * atanhSum, sqrt3, work);
  const value = mul(piFixed(work), lnTwoPlusSqrt3, work) / 8n + (3n * sum) / 8n;
  return changeBits(value, work, bits);
});
