import { type Fixed, changeBits, div, fromRational, mul, one } from '../precision';
import { ln2Fixed } from './constants';
import { bitLen } from './float';

/*
 * exp and ln in binary fixed point. At thousands of bits a full BigInt product costs microseconds
 * while a product with (or division by) a one- or two-word integer costs a small fraction of that,
 * so the Taylor series are summed by rectangular splitting (Smith, "Efficient multiple-precision
 * evaluation of elementary functions", Math. Comp. 52, 1989; Brent–Zimmermann, "Modern Computer
 * Arithmetic" §4.4.3): about 2√T full products for T terms, the rest small-integer operations.
 */

/**
 * Σ_{i=0}^{terms} a_i·u^i with a_0 = 1 and a_i = a_{i−1}·p(i)/q(i) (p, q small integers, q > 0).
 * Absolute error a few units of 2^-bits for |u| ≤ 1 and |a_i| ≤ 1.
 */
export function rectangularSeries(u: Fixed, terms: number, p: (i: number) => bigint, q: (i: number) => bigint, bits: number): Fixed {
  const m = Math.max(2, Math.ceil(Math.sqrt(terms + 1)));
  const powers: Fixed[] = [one(bits), u];
  for (let i = 2; i <= m; i++) powers.push(mul(powers[i - 1], u, bits));
  const blocks = Math.floor(terms / m);
  let acc = 0n;
  for (let j = blocks; j >= 0; j--) {
    const base = j * m;
    const last = j === blocks ? terms - base : m - 1; // the top block may be short
    // S_j = Σ_r u^r · Π_{l≤r} p(base+l) · Π_{l>r} q(base+l), over the common denominator Q_j
    const suffixQ: bigint[] = new Array(last + 2).fill(1n);
    for (let r = last; r >= 1; r--) suffixQ[r] = suffixQ[r + 1] * q(base + r);
    let prefixP = 1n;
    let s = 0n;
    for (let r = 0; r <= last; r++) {
      if (r > 0) prefixP *= p(base + r);
      const coefficient = prefixP * suffixQ[r + 1];
      s += r === 0 ? coefficient << BigInt(bits) : powers[r] * coefficient;
    }
    if (j < blocks) {
      // the block above enters as acc·u^m·a_{(j+1)m}/a_{jm}; a_{(j+1)m}/a_{jm} = prefixP·p(base+m)/(Q_j·q(base+m))
      const next = mul(acc, powers[m], bits) * prefixP * p(base + m);
      s += next / q(base + m);
    }
    acc = s / suffixQ[1];
  }
  return acc;
}

/** Terms n until x^n/n! < 2^-bits for x < 2^-log2InverseX (double-precision estimate). */
function expTerms(log2InverseX: number, bits: number): number {
  let log2Term = 0;
  for (let n = 1; ; n++) {
    log2Term -= log2InverseX + Math.log2(n);
    if (log2Term < -bits - 2) return n;
  }
}

/*
 * exp argument reduction: r ∈ [0, ln 2) is written r = Σ_l j_l·64^{−(l+1)} + r' with 0 ≤ j_l < 64
 * and r' < 64^{−EXP_LEVELS}; exp(j·64^{−(l+1)}) come from tables (powers of exp(64^{−(l+1)})).
 */
const EXP_LEVELS = 4;
interface ExpTable {
  bits: number;
  values: Fixed[];
}
const expTables: (ExpTable | undefined)[] = new Array(EXP_LEVELS);

function expTableEntry(level: number, j: number, bits: number): Fixed {
  let table = expTables[level];
  if (!table || table.bits < bits) {
    const work = Math.ceil(bits * 1.1) + 32;
    const inner = work + 16;
    const step = BigInt(6 * (level + 1));
    const base = rectangularSeries(one(inner) >> step, expTerms(6 * (level + 1), inner), () => 1n, (i) => BigInt(i), inner);
    const values: Fixed[] = [one(inner)];
    for (let i = 1; i < 64; i++) values.push(mul(values[i - 1], base, inner));
    table = { bits: work, values: values.map((v) => v >> 16n) };
    expTables[level] = table;
  }
  return changeBits(table.values[j], table.bits, bits);
}

/**
 * exp(a) split as mantissa·2^exponent so that huge results stay small:
 * returns [m, e] with m ∈ [1,2)·2^bits (fixed point) and exp(a) = m·2^e.
 */
export function expFixedSplit(a: Fixed, bits: number): [Fixed, bigint] {
  const approxExponent = a >> BigInt(bits);
  const work = bits + bitLen(approxExponent) + 12;
  const ln2 = ln2Fixed(work);
  const aw = changeBits(a, bits, work);
  let k = aw / ln2;
  let r = aw - k * ln2;
  if (r < 0n) {
    r += ln2;
    k -= 1n;
  }
  const factors: Fixed[] = [];
  for (let level = 0; level < EXP_LEVELS; level++) {
    const shift = BigInt(work - 6 * (level + 1));
    const j = r >> shift;
    if (j > 0n) {
      factors.push(expTableEntry(level, Number(j), work));
      r -= j << shift;
    }
  }
  let value = rectangularSeries(r, expTerms(6 * EXP_LEVELS, work), () => 1n, (i) => BigInt(i), work);
  for (const f of factors) value = mul(value, f, work);
  if (value >= one(work) << 1n) {
    value >>= 1n;
    k += 1n;
  }
  return [changeBits(value, work, bits), k];
}

/** exp(a) as a plain fixed-point value (for moderate a). */
export function expFixed(a: Fixed, bits: number): Fixed {
  const [m, k] = expFixedSplit(a, bits);
  return k >= 0n ? m << k : m >> -k;
}

// ---------------------------------------------------------------------------------------------
// ln: a = 2^e·m, m ∈ [1,2); m is divided by table factors (b+j)/b for b = 8, 2^9, 2^15, 2^21 (j
// chosen from the leading bits), leaving m' < 1 + 2^-21, then ln m' = 2 atanh((m'−1)/(m'+1)).

const LEVEL_BASE_LOG2 = [3, 9, 15, 21];
const LEVEL_SIZE = [8, 64, 64, 64];
interface TableEntry {
  bits: number;
  value: Fixed;
}
const levelTables: TableEntry[][] = LEVEL_SIZE.map((size) => new Array<TableEntry>(size));

/** ln((b+j)/b) = 2·atanh(j/(2b+j)), cached at the highest precision asked for so far. */
function levelLog(level: number, j: number, bits: number): Fixed {
  if (j === 0) return 0n;
  const entry = levelTables[level][j];
  if (entry && entry.bits >= bits) return changeBits(entry.value, entry.bits, bits);
  const work = bits + 32;
  const b = 1n << BigInt(LEVEL_BASE_LOG2[level]);
  const value = 2n * atanhRational(BigInt(j), 2n * b + BigInt(j), work);
  levelTables[level][j] = { bits: work, value };
  return changeBits(value, work, bits);
}

/** atanh(p/q) for small integers 0 ≤ p < q. */
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

/** ln(a) for a > 0 (fixed point). */
export function lnFixedPositive(a: Fixed, bits: number): Fixed {
  if (a <= 0n) throw new RangeError('ln of non-positive value');
  const work = bits + 12;
  const exponent = bitLen(a) - 1 - bits;
  let m = exponent >= 0 ? a >> BigInt(exponent) : a << BigInt(-exponent);
  m = changeBits(m, bits, work); // m ∈ [1,2) at `work` bits
  const unit = one(work);
  let sum = BigInt(exponent) * ln2Fixed(work);
  for (let level = 0; level < LEVEL_BASE_LOG2.length; level++) {
    const shift = BigInt(LEVEL_BASE_LOG2[level]);
    const j = Number(((m - unit) << shift) >> BigInt(work));
    if (j <= 0) continue;
    m = (m << shift) / ((1n << shift) + BigInt(j));
    sum += levelLog(level, j, work);
  }
  const w = div(m - unit, m + unit, work);
  const log2InverseW = LEVEL_BASE_LOG2[LEVEL_BASE_LOG2.length - 1] + 1;
  const terms = Math.ceil((work + 4) / (2 * log2InverseW));
  // atanh(w) = w·Σ u^i/(2i+1), u = w²; a_i/a_{i−1} = (2i−1)/(2i+1)
  const series = rectangularSeries(mul(w, w, work), terms, (i) => BigInt(2 * i - 1), (i) => BigInt(2 * i + 1), work);
  sum += 2n * mul(w, series, work);
  return changeBits(sum, work, bits);
}

/** ln of an exact positive rational num/den. */
export function lnRational(num: bigint, den: bigint, bits: number): Fixed {
  if (bitLen(num) + bitLen(den) <= SMALL_RATIONAL_BITS) return lnSmallRational(num, den, bits);
  const extra = 8 + bitLen(den);
  return lnFixedPositive(fromRational(num, den, bits + extra), bits + extra) >> BigInt(extra);
}

const SMALL_RATIONAL_BITS = 160;

/**
 * ln(P/Q) for small integers: the table reduction is done on the exact fraction, so the final
 * w = (A−B)/(A+B) is a fraction of small integers and atanh(w) needs no full-size product: blocks of
 * m terms are summed exactly, and each block step is one short product and one short division.
 */
function lnSmallRational(P: bigint, Q: bigint, bits: number): Fixed {
  const work = bits + 12;
  let e = bitLen(P) - bitLen(Q);
  // P/Q = 2^e·A/B with A/B ∈ [1, 2)
  let A = e >= 0 ? P : P << BigInt(-e);
  let B = e >= 0 ? Q << BigInt(e) : Q;
  if (A < B) {
    A <<= 1n;
    e -= 1;
  }
  let sum = BigInt(e) * ln2Fixed(work);
  for (let level = 0; level < LEVEL_BASE_LOG2.length; level++) {
    const shift = BigInt(LEVEL_BASE_LOG2[level]);
    const j = ((A - B) << shift) / B;
    if (j === 0n) continue;
    A <<= shift;
    B *= (1n << shift) + j;
    sum += levelLog(level, Number(j), work);
  }
  return changeBits(sum + 2n * atanhSmallRational(A - B, A + B, LEVEL_BASE_LOG2[LEVEL_BASE_LOG2.length - 1] + 1, work), work, bits);
}

/** atanh(a/b) for |a/b| < 2^-log2InverseW, a and b small integers, by exact blocks of terms. */
function atanhSmallRational(a: bigint, b: bigint, log2InverseW: number, bits: number): Fixed {
  if (a === 0n) return 0n;
  const terms = Math.ceil((bits + 4) / (2 * log2InverseW)) + 1;
  const m = 8;
  const a2 = a * a;
  const b2 = b * b;
  const a2Powers: bigint[] = [1n];
  const b2Powers: bigint[] = [1n];
  for (let r = 1; r <= m; r++) {
    a2Powers.push(a2Powers[r - 1] * a2);
    b2Powers.push(b2Powers[r - 1] * b2);
  }
  // atanh(w)/w = Σ_j u^{jm} Σ_{r<m} u^r/(2(jm+r)+1), u = a²/b²; block j over (b²)^{m−1}·D_j
  const blocks = Math.ceil(terms / m);
  const unitShift = BigInt(bits);
  let acc = 0n;
  for (let j = blocks - 1; j >= 0; j--) {
    const odd = (r: number) => BigInt(2 * (j * m + r) + 1);
    let D = 1n;
    for (let r = 0; r < m; r++) D *= odd(r);
    let N = 0n;
    for (let r = 0; r < m; r++) N += a2Powers[r] * b2Powers[m - 1 - r] * (D / odd(r));
    // acc ← N/((b²)^{m−1}·D) + acc·(a²)^m/(b²)^m, over the common denominator (b²)^m·D
    acc = ((N * b2 << unitShift) + acc * a2Powers[m] * D) / (b2Powers[m] * D);
  }
  return (acc * a) / b;
}

/** ⌊√n⌋ for an integer n ≥ 0: a double-precision start, then Newton with the precision doubling. */
export function isqrtFast(n: bigint): bigint {
  if (n < 0n) throw new RangeError('isqrt of negative');
  if (n < 1n << 52n) return fixSqrt(BigInt(Math.floor(Math.sqrt(Number(n)))), n);
  const k = Math.floor(bitLen(n) / 4);
  let r = isqrtFast(n >> BigInt(2 * k)) << BigInt(k); // about a quarter of the bits correct
  r = (r + n / r) >> 1n;
  return fixSqrt(r, n);
}

function fixSqrt(r: bigint, n: bigint): bigint {
  while (r * r > n) r -= 1n;
  while ((r + 1n) * (r + 1n) <= n) r += 1n;
  return r;
}
