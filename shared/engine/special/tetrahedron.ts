import { type ExactRational, type Fixed, type Real, type RealInput, MAX_DIGITS, bitLength, bitsForDigits, changeBits, div, fail, fixedToReal, fromRational, mul, one, realContext, toExactRational } from '../precision';
import { bernoulliExact } from './bernoulli';
import { piFixed } from './constants';
import { expFixed, expFixedSplit, lnFixedPositive } from './elementary';
import { gammaScaled } from './gamma';

/*
 * The tetrahedron period (docs/tetrahedron.md)
 *
 *   P(s) = π^{−2s} ∫ d^Dx d^Dy |x|^{−s}|x−e|^{−s}|y|^{−s}|y−e|^{−s}|x−y|^{−s},   D = 2s,
 *
 * the period of the complete graph K5 with all weights s/2 (conformal: 4·s/2 = D at every vertex).
 * Written as the trace, per unit of log-scale, of A³ with A(x, y) = |x|^{−s}|x−y|^{−s}, and A is
 * diagonal on |x|^κ Y_l(x̂) (the one-loop integral with a harmonic polynomial, a Gegenbauer/uniqueness
 * formula). On the line κ = −3s/2 + 2it its eigenvalue is π^s R_l(t) with
 *
 *   R_l(t) = |Γ(l/2 + s/4 + it)|² / |Γ(l/2 + 3s/4 + it)|²   (real, positive),
 *
 * so that   P(s) = Γ(s)/π · Σ_{l≥0} dim_l · I_l,   I_l = ∫_0^∞ R_l(t)³ dt,
 * dim_l = (l+λ)/λ·(2λ)_l/l! (λ = s − 1) the number of harmonics of degree l in D dimensions.
 * At s = 2: R_l = 1/((l+1)²/4 + t²), dim_l = (l+1)², I_l = 6π/(l+1)^5, and the sum is 6ζ(3).
 *
 * All I_l (l < N) share one exp-sinh (double-exponential) node set, R_{l+2} follows from R_l by
 * Γ(z+1) = zΓ(z), and at each node ln R_0, ln R_1 come from the centred
 * Stirling series of lnΓ(W+x₁) − lnΓ(W+x₂) (x₁ + x₂ = 1, only even powers of 1/W, DLMF 5.11.8 and
 * B_n(1−x) = (−1)^n B_n(x)) after a shift W → W + M. The tail l ≥ N uses the large-l expansion
 * f(l) = dim_l I_l ~ Σ_q H_q A'^{−s−1−2q} (A' = (l+s−1)/2), summed exactly with Hurwitz ζ by
 * Euler–Maclaurin. I_l converges for 3s > 1 (like ∫ t^{−3s}); below s = 1/2 each I_l is taken as
 * ∫(R_l³ − (1+t²)^{−3s/2}) dt + K(s), its analytic continuation, so 0 < s ≤ 2 except exactly s = 1/3.
 */

interface Q {
  num: bigint;
  den: bigint;
}

function gcd(a: bigint, b: bigint): bigint {
  if (a < 0n) a = -a;
  if (b < 0n) b = -b;
  while (b !== 0n) [a, b] = [b, a % b];
  return a;
}
function q(num: bigint, den: bigint): Q {
  if (den < 0n) {
    num = -num;
    den = -den;
  }
  const g = gcd(num, den) || 1n;
  return { num: num / g, den: den / g };
}
const qAdd = (a: Q, b: Q): Q => q(a.num * b.den + b.num * a.den, a.den * b.den);
const qMul = (a: Q, b: Q): Q => q(a.num * b.num, a.den * b.den);
const qInt = (n: number | bigint): Q => ({ num: BigInt(n), den: 1n });
const qFixed = (a: Q, bits: number): Fixed => fromRational(a.num, a.den, bits);
const qNumber = (a: Q): number => Number(a.num) / Number(a.den);

/** Γ(x) in fixed point (x rational, not a pole). */
function gammaFixed(x: Q, bits: number): Fixed {
  const g = gammaScaled(x, bits);
  return g.exp2 >= 0n ? g.mant << g.exp2 : g.mant >> -g.exp2;
}

/** B_n(x) for rational x, fixed point: B_n(x)·xd^n = Σ_k C(n,k) B_k xn^{n−k} xd^k, summed exactly over a common denominator. */
function bernoulliPolynomial(n: number, x: Q, bits: number): Fixed {
  const terms: { num: bigint; den: bigint }[] = [];
  let binom = 1n;
  let common = 1n;
  let denPower = 1n; // xd^k
  for (let k = 0; k <= n; k++) {
    if (k > 0) {
      binom = (binom * BigInt(n - k + 1)) / BigInt(k);
      denPower *= x.den;
    }
    const b = bernoulliExact(k);
    if (b.num === 0n) continue;
    terms.push({ num: binom * b.num * x.num ** BigInt(n - k) * denPower, den: b.den });
    common = (common / gcd(common, b.den)) * b.den;
  }
  let sum = 0n;
  for (const t of terms) sum += t.num * (common / t.den);
  return fromRational(sum, common * x.den ** BigInt(n), bits);
}

/** Coefficients of exp(Σ_{k≥1} g_k u^k) up to u^count (g_0 ignored). */
function expSeries(g: Fixed[], count: number, bits: number): Fixed[] {
  const e: Fixed[] = [one(bits)];
  for (let n = 1; n <= count; n++) {
    let acc = 0n;
    for (let k = 1; k <= n && k < g.length; k++) acc += BigInt(k) * mul(g[k], e[n - k], bits);
    e.push(acc / BigInt(n));
  }
  return e;
}

function log2Abs(v: Fixed, bits: number): number {
  if (v === 0n) return -Infinity;
  return bitLength(v) - bits;
}

// ---------------------------------------------------------------------------------------------
// exp-sinh nodes shared by every l: t = τ = exp(π/2·sinh u), u = k·2^{−level}. The trapezoid sum
// at level j is 2^{−j}·Σ_k f(t_k)·(π/2)·cosh(u_k)·τ_k; a finer level adds only the odd k.

interface Node {
  t: Fixed;
  /** ln((π/2)·cosh(u)·τ), without the step: the product with R³ is formed inside one exp, since R³ ~ τ^{−3s}
   * underflows the fixed point long before weight·R³ ~ τ^{1−3s} does (small s) */
  lnWeight: Fixed;
}
const nodeCache = new Map<string, Node>();

/* The nodes sit on the scale of the low harmonics (t = τ), so that one node set serves every l; high l
 * would converge faster with a scale ∝ l, which costs about one more halving of the step
 * (docs/tetrahedron.md). */

function node(bits: number, level: number, k: number): Node {
  const key = `${bits}|${level}|${k}`;
  const cached = nodeCache.get(key);
  if (cached) return cached;
  const work = bits + 24;
  const u = BigInt(k) << BigInt(work - level); // k·2^{−level}
  const eu = expFixed(u, work);
  const emu = div(one(work), eu, work);
  const pi = piFixed(work);
  const sinh = (eu - emu) >> 1n;
  const cosh = (eu + emu) >> 1n;
  const lnTau = mul(pi >> 1n, sinh, work);
  const tau = expFixed(lnTau, work);
  const lnWeight = lnFixedPositive(mul(pi >> 1n, cosh, work), work) + lnTau;
  const result = { t: changeBits(tau, work, bits), lnWeight: changeBits(lnWeight, work, bits) };
  if (nodeCache.size > 200_000) nodeCache.clear();
  nodeCache.set(key, result);
  return result;
}

interface Setup {
  s: Q;
  bits: number;
  /** γ_k = −12 B_{2k+1}(x₁)/((2k+1)2k): ln R³ = −3s ln|W| + Re Σ γ_k W^{−2k} */
  gamma: Fixed[];
  /** log₂ max_{k≤j≤k+3} |γ_j| (for the truncation test) */
  gammaLog2: number[];
  threeHalvesS: Fixed;
  shiftRadius: number;
}

function setup(s: Q, bits: number): Setup {
  const x1 = qAdd(q(1n, 2n), q(-s.num, 4n * s.den));
  // |W| ≥ shiftRadius makes the optimally truncated series accurate to ~e^{−2π|W|}
  const shiftRadius = Math.ceil((bits * Math.LN2) / (2 * Math.PI)) + 3;
  const gamma: Fixed[] = [0n];
  const gammaLog2: number[] = [-Infinity];
  const maxK = Math.ceil(Math.PI * shiftRadius) + 4;
  for (let k = 1; k <= maxK; k++) {
    const b = bernoulliPolynomial(2 * k + 1, x1, bits + 8);
    const g = changeBits((-12n * b) / BigInt((2 * k + 1) * 2 * k), bits + 8, bits);
    gamma.push(g);
    gammaLog2.push(log2Abs(g, bits));
  }
  // the maximum over γ_k … γ_{k+3}: one γ_k close to zero must not end the series before larger
  // coefficients after it (the truncation test compares with the largest of the next four terms)
  for (let k = 1; k < gammaLog2.length; k++) gammaLog2[k] = Math.max(...gammaLog2.slice(k, k + 4));
  return { s, bits, gamma, gammaLog2, shiftRadius, threeHalvesS: fromRational(3n * s.num, 2n * s.den, bits) };
}

/** exp(lnWeight)·R_l(t)³ in fixed point, with α = l/2 + s/4, b = s/2, A' = α − x₁ = (l+s−1)/2. */
/** Per-l constants of the integrand (α = l/2 + s/4, b = s/2, A' = α − x₁): squares of α+j and α+b+j for the shift. */
interface Harmonic {
  aPrime: Fixed;
  aNum: number;
  lo2: Fixed[];
  hi2: Fixed[];
}
const harmonicCache = new WeakMap<Setup, Harmonic[]>();

function harmonic(st: Setup, l: number): Harmonic {
  let list = harmonicCache.get(st);
  if (!list) {
    list = [];
    harmonicCache.set(st, list);
  }
  if (list[l]) return list[l];
  const { bits, s } = st;
  const alphaF = qFixed(qAdd(q(BigInt(l), 2n), q(s.num, 4n * s.den)), bits);
  const bF = fromRational(s.num, 2n * s.den, bits);
  const aPrimeQ = q(BigInt(l) * s.den + s.num - s.den, 2n * s.den);
  const unit = one(bits);
  const lo2: Fixed[] = [];
  const hi2: Fixed[] = [];
  for (let j = 0; j <= st.shiftRadius + 1; j++) {
    const lo = alphaF + BigInt(j) * unit;
    lo2.push(mul(lo, lo, bits));
    hi2.push(mul(lo + bF, lo + bF, bits));
  }
  list[l] = { aPrime: qFixed(aPrimeQ, bits), aNum: qNumber(aPrimeQ), lo2, hi2 };
  return list[l];
}

/** exp(lnWeight)·R_l(t)³ in fixed point, with α = l/2 + s/4, b = s/2, A' = α − x₁ = (l+s−1)/2. */
function integrand(st: Setup, l: number, t: Fixed, lnWeight: Fixed): Fixed {
  const { bits } = st;
  const h = harmonic(st, l);
  const tNum = Number(t >> BigInt(Math.max(0, bitLength(t) - 52))) * 2 ** (Math.max(0, bitLength(t) - 52) - bits);
  const aNum = h.aNum;
  let M = 0;
  if (aNum * aNum + tNum * tNum < st.shiftRadius * st.shiftRadius) M = Math.max(0, Math.ceil(st.shiftRadius - aNum));
  const t2 = mul(t, t, bits);
  // Q = Π_{j<M} ((α+b+j)² + t²)/((α+j)² + t²): numerator and denominator products, one division
  let ratio = one(bits);
  if (M > 0) {
    let numerator = h.hi2[0] + t2;
    let denominator = h.lo2[0] + t2;
    for (let j = 1; j < M; j++) {
      numerator = mul(numerator, h.hi2[j] + t2, bits);
      denominator = mul(denominator, h.lo2[j] + t2, bits);
    }
    ratio = div(numerator, denominator, bits);
  }
  const X = h.aPrime + (BigInt(M) << BigInt(bits));
  const X2 = mul(X, X, bits);
  const modulus2 = X2 + t2; // |W_M|²
  // z = W_M^{−2} = (X² − t² − 2iXt)/|W_M|⁴
  const m4 = mul(modulus2, modulus2, bits);
  const zr = div(X2 - t2, m4, bits);
  const zi = div(-2n * mul(X, t, bits), m4, bits);
  const log2z = -Math.log2(aNum * aNum + 2 * M * aNum + M * M + tNum * tNum);
  let K = 0;
  for (let k = 1; k < st.gamma.length; k++) {
    if (st.gammaLog2[k] + k * log2z < -bits - 4) break;
    K = k;
  }
  let sr = 0n;
  let si = 0n;
  for (let k = K; k >= 1; k--) {
    // (acc + γ_k)·z
    const ar = sr + st.gamma[k];
    const nr = mul(ar, zr, bits) - mul(si, zi, bits);
    si = mul(ar, zi, bits) + mul(si, zr, bits);
    sr = nr;
  }
  const exponent = sr - mul(st.threeHalvesS, lnFixedPositive(modulus2, bits), bits) + lnWeight;
  const r3 = mul(ratio, mul(ratio, ratio, bits), bits);
  // the shift factor r3 can be ~2^40 while exp(exponent) is small: take exp with a relative (mantissa)
  // precision, not an absolute one, or r3 magnifies its last bits
  const [mantissa, exp2] = expFixedSplit(exponent, bits);
  const product = mul(r3, mantissa, bits);
  return exp2 >= 0n ? product << exp2 : product >> -exp2;
}

/** weight·(1 + t²)^{−3s/2}: the large-t behaviour of every R_l³, subtracted below s = 1/2 (continuation). */
function subtraction(st: Setup, t2: Fixed, lnWeight: Fixed): Fixed {
  const { bits } = st;
  const exponent = lnWeight - mul(st.threeHalvesS, lnFixedPositive(t2 + one(bits), bits), bits);
  const [mantissa, exp2] = expFixedSplit(exponent, bits);
  return exp2 >= 0n ? mantissa << exp2 : mantissa >> -exp2;
}

/**
 * I_l = ∫_0^∞ R_l³ dt for every l < count on one node set. At each node only R_0 and R_1 come from the
 * Stirling series; the rest follow upward from Γ(z+1) = zΓ(z):
 *   R_{l+2}(t) = R_l(t)·(α_l² + t²)/((α_l + b)² + t²),   α_l = l/2 + s/4, b = s/2,
 * factors ≤ 1, so absolute rounding errors do not grow. Levels (step 2^{−j}) are added until the
 * estimated quadrature error of Σ dim_l I_l is below 2^{targetLog2}·|Σ|: per l, from the sums at
 * steps 4h, 2h, h, e₁ = |S_{4h} − S_{2h}|, e₂ = |S_{2h} − S_h|, estimate max(e₂²/|I|, e₂²/e₁) (the
 * double-exponential and the geometric extrapolation; e₂ itself when no convergence is seen).
 */
function integrateAll(st: Setup, dims: Fixed[], targetLog2: number, subtract: boolean): { values: Fixed[]; estimates: Fixed[] } {
  const { bits, s } = st;
  const count = dims.length;
  const unit = one(bits);
  const alpha2: Fixed[] = [];
  const alphaB2: Fixed[] = [];
  for (let l = 0; l < count; l++) {
    const a = qFixed(qAdd(q(BigInt(l), 2n), q(s.num, 4n * s.den)), bits);
    const ab = a + fromRational(s.num, 2n * s.den, bits);
    alpha2.push(mul(a, a, bits));
    alphaB2.push(mul(ab, ab, bits));
  }
  // with the subtraction the larger l decay like l²/t² more slowly than l = 0, 1 at large t
  const tiny = bits + 8 + (subtract ? 16 : 0);
  /** Σ_k over the nodes of one level (all k at the first level, odd k after), per l. */
  const levelSum = (level: number, first: boolean): Fixed[] => {
    const sums: Fixed[] = new Array(count).fill(0n);
    for (const direction of [1, -1]) {
      let small = 0;
      const step = first ? 1 : 2;
      for (let k = direction === 1 ? (first ? 0 : 1) : -1; ; k += direction * step) {
        const nd = node(bits, level, k);
        const t2 = mul(nd.t, nd.t, bits);
        const base = [integrand(st, 0, nd.t, nd.lnWeight), count > 1 ? integrand(st, 1, nd.t, nd.lnWeight) : 0n];
        const ratio = [unit, unit];
        const sub = subtract ? subtraction(st, t2, nd.lnWeight) : 0n;
        for (let l = 0; l < count; l++) {
          const parity = l & 1;
          if (l >= 2) ratio[parity] = div(mul(ratio[parity], alpha2[l - 2] + t2, bits), alphaB2[l - 2] + t2, bits);
          const r = ratio[parity];
          sums[l] += mul(base[parity], mul(r, mul(r, r, bits), bits), bits) - sub;
        }
        if (log2Abs(base[0] - sub, bits) < -tiny && log2Abs(base[1] - sub, bits) < -tiny) {
          small++;
          if (small >= 2) break;
        } else small = 0;
        if (Math.abs(k) > 400 << Math.max(0, level - 3)) fail('limit', 'tetrahedron quadrature did not converge');
      }
    }
    return sums;
  };
  const abs = (v: bigint): bigint => (v < 0n ? -v : v);
  const FIRST = 3;
  const LAST = 10;
  // T_j = 2^{−j}·raw_j, raw_j = raw_{j−1} + (odd nodes of level j)
  const trapezoid: Fixed[][] = [];
  let raw = levelSum(FIRST, true);
  trapezoid.push(raw.map((v) => v >> BigInt(FIRST)));
  for (let level = FIRST + 1; level <= LAST; level++) {
    const odd = levelSum(level, false);
    raw = raw.map((v, l) => v + odd[l]);
    trapezoid.push(raw.map((v) => v >> BigInt(level)));
    if (trapezoid.length < 3) continue;
    const [coarser, coarse, fine] = trapezoid.slice(-3);
    const estimates = fine.map((value, l) => {
      const e2 = abs(value - coarse[l]) + 1n;
      const e1 = abs(coarse[l] - coarser[l]) + 1n;
      const quadratic = (e2 * e2) / (abs(value) + 1n);
      const geometric = e1 > e2 ? (e2 * e2) / e1 : e2;
      return (quadratic > geometric ? quadratic : geometric) + 64n;
    });
    let total = 0n;
    let error = 0n;
    for (let l = 0; l < count; l++) {
      total += mul(dims[l], fine[l], bits);
      error += mul(abs(dims[l]), estimates[l], bits);
    }
    if (log2Abs(error, bits) < log2Abs(abs(total), bits) + targetLog2 - 4 || level === LAST) return { values: fine, estimates };
  }
  return fail('limit', 'tetrahedron quadrature did not converge');
}

/**
 * Hurwitz ζ(σ, a) = Σ_{n≥0} (n+a)^{−σ} by Euler–Maclaurin for a ≳ 10; a^{−σ} passed in. The powers
 * a^{1−2k} are applied exactly (a is rational): in fixed point they would fall below the resolution
 * while B_{2k}(σ)_{2k−1}/(2k)! still grows, which cut the series short at high digits.
 */
function hurwitzZeta(sigma: Q, aQ: Q, aPowMinusSigma: Fixed, bits: number): { value: Fixed; error: Fixed } {
  const sigmaMinusOne = qAdd(sigma, qInt(-1));
  let value = (aPowMinusSigma * aQ.num * sigmaMinusOne.den) / (aQ.den * sigmaMinusOne.num) + (aPowMinusSigma >> 1n);
  // Σ_k B_{2k}/(2k)! (σ)_{2k−1} a^{1−2k} · a^{−σ}; c = (σ)_{2k−1}/(2k)!·a^{1−2k} kept as an unreduced fraction
  let cNum = sigma.num * aQ.den;
  let cDen = sigma.den * 2n * aQ.num;
  let last = 0n;
  for (let k = 1; k < 400; k++) {
    const b = bernoulliExact(2 * k);
    const term = (aPowMinusSigma * cNum * b.num) / (cDen * b.den);
    value += term;
    last = term < 0n ? -term : term;
    if (log2Abs(last, bits) < -bits - 4) break;
    cNum *= (sigma.num + BigInt(2 * k - 1) * sigma.den) * (sigma.num + BigInt(2 * k) * sigma.den) * aQ.den * aQ.den;
    cDen *= sigma.den * sigma.den * BigInt((2 * k + 1) * (2 * k + 2)) * aQ.num * aQ.num;
  }
  return { value, error: 2n * last + 4n };
}

export interface TetrahedronResult {
  value: Real;
  guaranteedDigits: number;
  /** Bound on |computed − P(s)| before rounding to `digits` (see docs/tetrahedron.md). */
  errorBound: Real;
}

interface Raw {
  value: Fixed;
  error: Fixed;
  bits: number;
}

/** Null when the large-l expansion cannot reach the target from this N (then a larger N is tried). */
function computeRaw(s: Q, digits: number, nFactor: number): Raw | null {
  // below s = 1/2 every I_l is continued analytically: ∫(R_l³ − (1+t²)^{−3s/2}) dt + K(s), K the continued
  // ∫(1+t²)^{−3s/2} dt. For 3s < 1 both terms grow like t^{1−3s} (with the weight) before they cancel, so
  // the fixed point needs that many more bits.
  const subtract = 2n * s.num < s.den;
  const growth = subtract && 3n * s.num < s.den ? (1 - (3 * Number(s.num)) / Number(s.den)) / (1 + (3 * Number(s.num)) / Number(s.den)) : 0;
  const bits = Math.ceil(bitsForDigits(digits + 4, 24) * (1 + growth)) + (subtract ? 16 : 0);
  const st = setup(s, bits);
  const lambda = qAdd(s, qInt(-1));
  // l-tail: N with e^{−πN} far below the target (nFactor > 1 leaves room for the 2^K factor of the
  // remainder bound), then the Hurwitz-summed expansion
  const targetLog2 = -(digits + 4) * Math.log2(10);
  const N = Math.ceil(((-targetLog2 * Math.LN2) / Math.PI) * nFactor) + 6;
  let sum = 0n;
  let error = 0n;
  // dim_l: dim_0 = 1, dim_1 = 2(λ+1)·… ; ratio dim_{l+1}/dim_l = (λ+l+1)(2λ+l)/((λ+l)(l+1)) for l ≥ 1
  const dims: Fixed[] = [];
  let dim: Q = qInt(1);
  for (let l = 0; l < N; l++) {
    if (l === 1) dim = qMul(qInt(2), qAdd(lambda, qInt(1)));
    else if (l > 1 && dim.num !== 0n) dim = qMul(dim, q((lambda.num + BigInt(l) * lambda.den) * (2n * lambda.num + BigInt(l - 1) * lambda.den), (lambda.num + BigInt(l - 1) * lambda.den) * BigInt(l) * lambda.den));
    dims.push(qFixed(dim, bits));
  }
  const { values, estimates } = integrateAll(st, dims, targetLog2, subtract);
  for (let l = 0; l < N; l++) {
    sum += mul(dims[l], values[l], bits);
    error += mul(dims[l] < 0n ? -dims[l] : dims[l], estimates[l], bits) + 4n;
  }
  if (subtract) {
    // K(s) = ∫_0^∞ (1+t²)^{−3s/2} dt = √π Γ((3s−1)/2)/(2Γ(3s/2)), continued below s = 1/3 (pole at s = 1/3,
    // where it cancels against the tail: that point is refused)
    const K = div(mul(gammaFixed(q(1n, 2n), bits), gammaFixed(q(3n * s.num - s.den, 2n * s.den), bits), bits), 2n * gammaFixed(q(3n * s.num, 2n * s.den), bits), bits);
    const dimSum = dims.reduce((a, b) => a + b, 0n);
    const added = mul(K, dimSum, bits);
    sum += added;
    // its rounding, relative to the size of the terms that cancel
    error += ((added < 0n ? -added : added) >> BigInt(bits - 8)) + 16n;
  }
  // tail Σ_{l≥N} f(l) = (2/Γ(2s−1)) Σ_q H_q ζ(s+1+2q, N+s−1)
  const twoSMinusOne = qAdd(qMul(qInt(2), s), qInt(-1));
  const tailZero = twoSMinusOne.num <= 0n && twoSMinusOne.num % twoSMinusOne.den === 0n; // 1/Γ = 0 (s = 1/2)
  if (!tailZero) {
    const Qmax = 2 * N + 10;
    const half = st.gamma.map((g) => g >> 1n); // E(u) = exp(½Σγ_k u^k)
    while (half.length <= Qmax) half.push(0n);
    const gammaTail: Fixed[] = [0n];
    for (let k = 1; k <= Qmax; k++) gammaTail.push(k < half.length ? half[k] : 0n);
    // more γ_k than the node series keeps
    for (let k = st.gamma.length; k <= Qmax; k++) {
      const x1 = qAdd(q(1n, 2n), q(-s.num, 4n * s.den));
      const b = bernoulliPolynomial(2 * k + 1, x1, bits + 8);
      gammaTail[k] = changeBits((-6n * b) / BigInt((2 * k + 1) * 2 * k), bits + 8, bits);
    }
    const e = expSeries(gammaTail, Qmax, bits);
    const delta: Fixed[] = [0n];
    for (let k = 1; k <= Qmax; k++) {
      const b = bernoulliPolynomial(2 * k + 1, lambda, bits + 8);
      delta.push(changeBits((-2n * b) / BigInt((2 * k + 1) * 2 * k), bits + 8, bits));
    }
    const d = expSeries(delta, Qmax, bits);
    // ĉ_m = π Γ(3s−1+2m) Σ_j e_j e_{m−j} / (Γ(3s/2+2j) Γ(3s/2+2(m−j)))
    const threeS = qMul(qInt(3), s);
    const g0 = qAdd(threeS, qInt(-1));
    const h0 = q(threeS.num, 2n * threeS.den);
    let gNum = gammaFixed(g0, bits); // Γ(3s−1+2m)
    const invG: Fixed[] = [];
    let gh = gammaFixed(h0, bits);
    for (let j = 0; j <= Qmax; j++) {
      invG.push(div(one(bits), gh, bits));
      const x = qAdd(h0, qInt(2 * j));
      gh = mul(gh, mul(qFixed(x, bits), qFixed(qAdd(x, qInt(1)), bits), bits), bits);
    }
    const pi = piFixed(bits);
    const c: Fixed[] = [];
    for (let m = 0; m <= Qmax; m++) {
      let acc = 0n;
      for (let j = 0; j <= m; j++) acc += mul(mul(e[j], e[m - j], bits), mul(invG[j], invG[m - j], bits), bits);
      c.push(mul(mul(pi, gNum, bits), acc, bits));
      const x = qAdd(g0, qInt(2 * m));
      gNum = mul(gNum, mul(qFixed(x, bits), qFixed(qAdd(x, qInt(1)), bits), bits), bits);
    }
    const H: Fixed[] = [];
    for (let qq = 0; qq <= Qmax; qq++) {
      let acc = 0n;
      for (let p = 0; p <= qq; p++) acc += mul(d[p], c[qq - p], bits);
      H.push(acc);
    }
    const prefactor = div(2n << BigInt(bits), gammaFixed(twoSMinusOne, bits), bits);
    const a0 = qAdd(qInt(N), lambda);
    const lnA = lnFixedPositive(qFixed(a0, bits), bits);
    const aPowS = expFixed(-mul(qFixed(qAdd(s, qInt(1)), bits), lnA, bits), bits); // a0^{−s−1}
    // H_q grows factorially and a0^{−2q} falls below the fixed point's resolution: the factor a0^{−2q} is
    // applied exactly (a0 is rational) to H_q·ζ̂_q, with ζ̂ = a0^σ ζ(σ, a0) = O(1)
    const times = (v: Fixed, qq: number): Fixed => mul(prefactor, mul(aPowS, (v * a0.den ** BigInt(2 * qq)) / a0.num ** BigInt(2 * qq), bits), bits);
    const abs = (v: bigint): bigint => (v < 0n ? -v : v);
    const term = (qq: number) => {
      const z = hurwitzZeta(qAdd(s, qInt(1 + 2 * qq)), a0, one(bits), bits);
      return { value: times(mul(H[qq], z.value, bits), qq), error: abs(times(mul(abs(H[qq]), z.error, bits), qq)) + 4n };
    };
    let tail = 0n;
    let lastAbs = -1n;
    let converged = false;
    for (let qq = 0; qq < Qmax; qq++) {
      const { value, error: termError } = term(qq);
      const termAbs = abs(value);
      error += termError;
      if (lastAbs >= 0n && termAbs > lastAbs && log2Abs(termAbs, bits) > targetLog2 - 10) break; // divergence starts
      tail += value;
      lastAbs = termAbs;
      if (log2Abs(termAbs, bits) + qq + 2 < targetLog2 - 8) {
        // remainder of the Stirling-type expansions in the right half-plane: ≤ sec^{2K}(ph W/2) ≤ 2^K
        // times the first omitted term (DLMF 5.11(ii)); take 2^{qq+2}·(|last| + |next term|) as the bound
        const bound = (abs(term(qq + 1).value) + termAbs) << BigInt(qq + 2);
        error += bound;
        converged = true;
        break;
      }
    }
    if (!converged) return null;
    sum += tail;
    // rounding relative to the tail's size (large near s = 1/3, where it cancels against K(s)·Σ dim_l)
    error += ((tail < 0n ? -tail : tail) >> BigInt(bits - 8)) + 16n;
  }
  // P = Γ(s)/π · sum
  const gs = gammaFixed(s, bits);
  const factor = div(gs, piFixed(bits), bits);
  const value = mul(factor, sum, bits);
  const totalError = mul(factor, error, bits) + 16n;
  return { value, error: totalError, bits };
}

/** computeRaw with N raised until the tail expansion reaches the target (1.15 was always enough in tests). */
function computeWithTail(s: Q, digits: number): Raw {
  for (const nFactor of [1.15, 1.4, 2]) {
    const raw = computeRaw(s, digits, nFactor);
    if (raw) return raw;
  }
  return fail('limit', 'tetrahedron tail expansion did not reach the target');
}

function checkDigits(digits: number): void {
  if (!Number.isInteger(digits) || digits < 1 || digits > MAX_DIGITS + 200) fail('limit', `digits must be an integer from 1 to ${MAX_DIGITS + 200}`);
  if (digits > 300) fail('limit', 'the tetrahedron period is computed to at most 300 digits');
}

function argument(x: RealInput | ExactRational): Q {
  const r = toExactRational(x);
  const v = q(r.num, r.den);
  if (v.num <= 0n || v.num > 2n * v.den) fail('domain', 'the tetrahedron period P(s) is defined for 0 < s ≤ 2');
  if (v.num * 3n === v.den) fail('domain', 'the tetrahedron period P(s), needed at three loops, is not computed at exactly s = 1/3 (two terms of its spectral sum have cancelling poles there; docs/tetrahedron.md): use s = 0.3333 or 0.3334, at most two loops, or keep s symbolic');
  return v;
}

function toResult(raw: Raw, digits: number): TetrahedronResult {
  const value = fixedToReal(raw.value, raw.bits, digits);
  const ctx = realContext(20);
  const errorBound = fixedToReal(raw.error, raw.bits, 6);
  const abs = fixedToReal(raw.value < 0n ? -raw.value : raw.value, raw.bits, 20);
  const relative = new ctx(errorBound).times(2).div(abs);
  const guaranteedDigits = Math.max(0, Math.floor(-relative.log(10).toNumber()));
  return { value, guaranteedDigits, errorBound };
}

/**
 * P(s) with its error bound: `value` rounded to `digits`, `errorBound` ≥ |unrounded − P(s)| (the
 * quadrature part is the standard double-exponential estimate, the tail part the first omitted term
 * with a 2^K safety factor; docs/tetrahedron.md), `guaranteedDigits` the digits that bound certifies.
 */
export function tetrahedronPeriodWithBound(s: RealInput | ExactRational, digits: number): TetrahedronResult {
  checkDigits(digits);
  return toResult(computeWithTail(argument(s), digits), digits);
}

/** P(s) for rational 0 < s ≤ 2 (not exactly 1/3), every printed digit covered by the error bound (P(2) = 6ζ(3)). */
export function tetrahedronPeriod(s: RealInput | ExactRational, digits: number): Real {
  checkDigits(digits);
  const sq = argument(s);
  for (const extra of [8, 20, 40]) {
    const result = toResult(computeWithTail(sq, digits + extra), digits);
    if (result.guaranteedDigits >= digits) return result.value;
  }
  return fail('limit', 'tetrahedronPeriod could not certify the requested digits');
}
