import { type Fixed, atanInverse, atanhInverse, changeBits, div, fromInteger, isqrt, mul, one } from '../precision/fixed';

/**
 * Mathematical constants in fixed point, each cached at the highest precision computed so far
 * (a lower-precision request is a shift of the cached value).
 */
function cachedConstant(compute: (bits: number) => Fixed): (bits: number) => Fixed {
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
  const lnTwoPlusSqrt3 = lnFixedPositive(fromInteger(2, work) + sqrt3, work);
  const value = mul(piFixed(work), lnTwoPlusSqrt3, work) / 8n + (3n * sum) / 8n;
  return changeBits(value, work, bits);
});

const LOG_TABLE_SIZE = 64;
const logTables = new Map<number, Fixed[]>();

/** ln((64+j)/64), j = 0..63, for argument reduction in lnFixedPositive. */
function logTable(bits: number): Fixed[] {
  let table = logTables.get(bits);
  if (!table) {
    table = [];
    const work = bits + 10;
    for (let j = 0; j < LOG_TABLE_SIZE; j++) {
      const q = BigInt(2 * LOG_TABLE_SIZE + j); // ln((64+j)/64) = 2 atanh(j/(128+j))
      table.push(changeBits(2n * atanhRational(BigInt(j), q, work), work, bits));
    }
    logTables.set(bits, table);
  }
  return table;
}

function atanhRational(p: bigint, q: bigint, bits: number): Fixed {
  let power = (p << BigInt(bits)) / q;
  const p2 = p * p;
  const q2 = q * q;
  let sum = 0n;
  for (let k = 1n; power !== 0n; k += 2n) {
    sum += power / k;
    power = (power * p2) / q2;
  }
  return sum;
}

/** ln(a) for a > 0 (fixed point): a = 2^k·m, m ∈ [1,2), then a table step and a short atanh series. */
export function lnFixedPositive(a: Fixed, bits: number): Fixed {
  if (a <= 0n) throw new RangeError('ln of non-positive value');
  const work = bits + 8;
  let m = changeBits(a, bits, work);
  const unit = one(work);
  let k = 0;
  const exponent = m.toString(2).length - 1 - work;
  if (exponent > 0) m >>= BigInt(exponent);
  else if (exponent < 0) m <<= BigInt(-exponent);
  k = exponent;
  const j = Number(((m - unit) * BigInt(LOG_TABLE_SIZE)) >> BigInt(work));
  const reduced = (m * BigInt(LOG_TABLE_SIZE)) / BigInt(LOG_TABLE_SIZE + j) - unit;
  const w = div(reduced, 2n * unit + reduced, work);
  const w2 = mul(w, w, work);
  let power = w;
  let series = 0n;
  for (let i = 1n; power !== 0n; i += 2n) {
    series += power / i;
    power = mul(power, w2, work);
  }
  const result = BigInt(k) * ln2Fixed(work) + logTable(work)[j] + 2n * series;
  return changeBits(result, work, bits);
}

/**
 * exp(a) split as mantissa·2^exponent2 so that huge results (Γ of large arguments) stay small:
 * returns [m, e] with m ∈ [1,2)·2^bits (fixed point) and exp(a) = m·2^e.
 */
export function expFixedSplit(a: Fixed, bits: number): [Fixed, bigint] {
  const approxExponent = a >> BigInt(bits);
  const extra = Math.max(0, (approxExponent < 0n ? -approxExponent : approxExponent).toString(2).length) + 8;
  const work = bits + extra;
  const ln2 = ln2Fixed(work);
  const aw = changeBits(a, bits, work);
  let k = aw / ln2;
  let r = aw - k * ln2;
  if (r < 0n) {
    r += ln2;
    k -= 1n;
  }
  const m = expTaylorReduced(r, work);
  return [changeBits(m, work, bits), k];
}

/** exp(a) as a plain fixed-point value (for moderate a). */
export function expFixed(a: Fixed, bits: number): Fixed {
  const [m, k] = expFixedSplit(a, bits);
  return k >= 0n ? m << k : m >> -k;
}

/** exp(r) for 0 ≤ r < ln 2: halve, Taylor, square back. */
function expTaylorReduced(r: Fixed, bits: number): Fixed {
  const halvings = Math.ceil(Math.sqrt(bits) / 1.5);
  const work = bits + halvings + 8;
  const x = changeBits(r, bits, work) >> BigInt(halvings);
  const unit = one(work);
  let term = unit;
  let sum = unit;
  for (let k = 1n; ; k++) {
    term = mul(term, x, work) / k;
    if (term === 0n) break;
    sum += term;
  }
  for (let i = 0; i < halvings; i++) sum = mul(sum, sum, work);
  return changeBits(sum, work, bits);
}
