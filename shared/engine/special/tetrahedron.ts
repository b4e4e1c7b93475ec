import { type ExactRational, type Fixed, type Real, type RealInput, MAX_DIGITS, bitLength, bitsForDigits, changeBits, div, fail, fixedToReal, fromRational, mul, one, realContext, toExactRational } from '../precision';
import { bernoulliExact } from './bernoulli';
import { piFixed } from './constants';
import { expFixed, lnFixedPositive } from './elementary';
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
 * Each I_l (l < N) is an exp-sinh (double-exponential) quadrature; ln R_l comes from the centred
 * Stirling series of lnΓ(W+x₁) − lnΓ(W+x₂) (x₁ + x₂ = 1, only even powers of 1/W, DLMF 5.11.8 and
 * B_n(1−x) = (−1)^n B_n(x)) after a shift W → W + M. The tail l ≥ N uses the large-l expansion
 * f(l) = dim_l I_l ~ Σ_q H_q A'^{−s−1−2q} (A' = (l+s−1)/2), summed exactly with Hurwitz ζ by
 * Euler–Maclaurin. Needs 3s > 1 (I_l converges like ∫ t^{−3s}); s ∈ (1/3, 2].
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

/** B_n(x) for rational x, fixed point: B_n(x)·xd^n = Σ_k C(n,k) B_k xn^{n−k} xd^k. */
function bernoulliPolynomial(n: number, x: Q, bits: number): Fixed {
  const work = bits + 16;
  let sum = 0n;
  let binom = 1n;
  for (let k = 0; k <= n; k++) {
    if (k > 0) binom = (binom * BigInt(n - k + 1)) / BigInt(k);
    const b = bernoulliExact(k);
    if (b.num !== 0n) sum += fromRational(binom * b.num * x.num ** BigInt(n - k) * x.den ** BigInt(k), b.den, work);
  }
  return changeBits(sum / x.den ** BigInt(n), work, bits);
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
// exp-sinh nodes: u_k = k·h, τ_k = exp(π/2·sinh u_k), weight h·(π/2)·cosh(u_k)·τ_k (per bits and h)

interface Node {
  tau: Fixed;
  /** ln of the weight h·(π/2)·cosh(u)·τ: the product weight·R³ is formed inside one exp, since R³ ~ τ^{−3s}
   * underflows the fixed point long before weight·R³ ~ τ^{1−3s} does (small s) */
  lnWeight: Fixed;
}
const nodeCache = new Map<string, Map<number, Node>>();

function node(bits: number, hLog2: number, k: number): Node {
  const key = `${bits}|${hLog2}`;
  let table = nodeCache.get(key);
  if (!table) {
    table = new Map();
    nodeCache.set(key, table);
  }
  const cached = table.get(k);
  if (cached) return cached;
  const work = bits + 24;
  const u = BigInt(k) << BigInt(work - hLog2); // k·2^{−hLog2}
  const eu = expFixed(u, work);
  const emu = div(one(work), eu, work);
  const pi = piFixed(work);
  const sinh = (eu - emu) >> 1n;
  const cosh = (eu + emu) >> 1n;
  const tau = expFixed(mul(pi >> 1n, sinh, work), work);
  const lnWeight = lnFixedPositive(mul(pi >> 1n, cosh, work) >> BigInt(hLog2), work) + mul(pi >> 1n, sinh, work);
  const result = { tau: changeBits(tau, work, bits), lnWeight: changeBits(lnWeight, work, bits) };
  table.set(k, result);
  return result;
}

// ---------------------------------------------------------------------------------------------

interface Setup {
  s: Q;
  bits: number;
  /** γ_k = −12 B_{2k+1}(x₁)/((2k+1)2k): ln R³ = −3s ln|W| + Re Σ γ_k W^{−2k} */
  gamma: Fixed[];
  gammaLog2: number[];
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
  return { s, bits, gamma, gammaLog2, shiftRadius };
}

/** exp(lnWeight)·R_l(t)³ in fixed point, with α = l/2 + s/4, b = s/2, A' = α − x₁ = (l+s−1)/2. */
function integrand(st: Setup, l: number, t: Fixed, lnWeight: Fixed): Fixed {
  const { bits, s } = st;
  const alpha = qAdd(q(BigInt(l), 2n), q(s.num, 4n * s.den));
  const aPrime = q(BigInt(l) * s.den + s.num - s.den, 2n * s.den);
  const tNum = Number(t >> BigInt(Math.max(0, bitLength(t) - 52))) * 2 ** (Math.max(0, bitLength(t) - 52) - bits);
  const aNum = qNumber(aPrime);
  let M = 0;
  if (aNum * aNum + tNum * tNum < st.shiftRadius * st.shiftRadius) M = Math.max(0, Math.ceil(st.shiftRadius - aNum));
  const t2 = mul(t, t, bits);
  // Q = Π_{j<M} ((α+b+j)² + t²)/((α+j)² + t²)
  let ratio = one(bits);
  if (M > 0) {
    const alphaF = qFixed(alpha, bits);
    const bF = fromRational(s.num, 2n * s.den, bits);
    const unit = one(bits);
    for (let j = 0; j < M; j++) {
      const lo = alphaF + BigInt(j) * unit;
      const hi = lo + bF;
      ratio = div(mul(ratio, mul(hi, hi, bits) + t2, bits), mul(lo, lo, bits) + t2, bits);
    }
  }
  const X = qFixed(aPrime, bits) + (BigInt(M) << BigInt(bits));
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
  const threeHalvesS = fromRational(3n * s.num, 2n * s.den, bits);
  const exponent = sr - mul(threeHalvesS, lnFixedPositive(modulus2, bits), bits) + lnWeight;
  const r3 = mul(ratio, mul(ratio, ratio, bits), bits);
  return mul(r3, expFixed(exponent, bits), bits);
}

/**
 * I_l = ∫_0^∞ R_l³ dt by exp-sinh quadrature with t = c·τ, c = (l+s)/2. Returns the value at step h
 * and an error estimate from the steps 4h, 2h, h (free: coarser sums use every 2nd/4th node).
 */
function integrateL(st: Setup, l: number, hLog2: number): { value: Fixed; estimate: Fixed } {
  const { bits, s } = st;
  const c = q(BigInt(l) * s.den + s.num, 2n * s.den);
  const cF = qFixed(c, bits);
  let fine = 0n;
  let coarse = 0n;
  let coarser = 0n;
  const tiny = bits + 8;
  for (const direction of [1, -1]) {
    let small = 0;
    for (let k = direction === 1 ? 0 : -1; ; k += direction) {
      const nd = node(bits, hLog2, k);
      const t = mul(cF, nd.tau, bits);
      const term = integrand(st, l, t, nd.lnWeight);
      fine += term;
      if (k % 2 === 0) coarse += term;
      if (k % 4 === 0) coarser += term;
      if (log2Abs(term, bits) < -tiny) {
        small++;
        if (small >= 2) break;
      } else small = 0;
      if (Math.abs(k) > 400 << Math.max(0, hLog2 - 3)) fail('limit', 'tetrahedron quadrature did not converge');
    }
  }
  const value = mul(cF, fine, bits);
  const abs = (v: bigint): bigint => (v < 0n ? -v : v);
  const e2 = abs(value - mul(cF, 2n * coarse, bits)) + 1n;
  const e1 = abs(mul(cF, 2n * coarse, bits) - mul(cF, 4n * coarser, bits)) + 1n;
  // double-exponential regime: error(h) ≈ error(2h)²/|I|; where the rate is only geometric (slowly
  // decaying R³ for small s) error(h) ≈ e2·(e2/e1). Take the larger; no convergence seen → e2.
  const absValue = abs(value) + 1n;
  const quadratic = (e2 * e2) / absValue;
  const geometric = e1 > e2 ? (e2 * e2) / e1 : e2;
  return { value, estimate: (quadratic > geometric ? quadratic : geometric) + 64n };
}

/** Hurwitz ζ(σ, a) = Σ_{n≥0} (n+a)^{−σ} by Euler–Maclaurin for a ≳ 10; a^{−σ} passed in. */
function hurwitzZeta(sigma: Q, aQ: Q, aPowMinusSigma: Fixed, bits: number): { value: Fixed; error: Fixed } {
  const a = qFixed(aQ, bits);
  const sigmaMinusOne = qAdd(sigma, qInt(-1));
  let value = div(mul(aPowMinusSigma, a, bits) * sigmaMinusOne.den, qFixed({ num: sigmaMinusOne.num, den: 1n }, bits), bits) + (aPowMinusSigma >> 1n);
  // Σ_k B_{2k}/(2k)! (σ)_{2k−1} a^{−σ−2k+1}
  let poch: Q = sigma; // (σ)_{2k−1}
  let factorial = 2n; // (2k)!
  let power = div(aPowMinusSigma, a, bits); // a^{−σ−1}
  const a2inv = div(one(bits), mul(a, a, bits), bits);
  let last = 0n;
  for (let k = 1; k < 200; k++) {
    const b = bernoulliExact(2 * k);
    const coef = qMul(poch, q(b.num, b.den * factorial));
    const term = (power * coef.num) / coef.den;
    value += term;
    last = term < 0n ? -term : term;
    if (log2Abs(last, bits) < -bits - 4) break;
    poch = qMul(poch, qMul(qAdd(sigma, qInt(2 * k - 1)), qAdd(sigma, qInt(2 * k))));
    factorial *= BigInt((2 * k + 1) * (2 * k + 2));
    power = mul(power, a2inv, bits);
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

function computeRaw(s: Q, digits: number): Raw {
  const bits = bitsForDigits(digits + 4, 24);
  const st = setup(s, bits);
  const lambda = qAdd(s, qInt(-1));
  // l-tail: N with e^{−πN} far below the target, then the Hurwitz-summed expansion
  const targetLog2 = -(digits + 4) * Math.log2(10);
  let N = Math.ceil((-targetLog2 * Math.LN2) / Math.PI) + 6;
  // small s: R³ decays slowly and far poles of R near the imaginary t-axis approach the real u-axis,
  // so the step is halved twice (see docs/tetrahedron.md)
  const hLog2 = Math.max(3, Math.ceil(Math.log2(digits / 4)) + 1) + (s.num < s.den ? 1 : 0);
  let sum = 0n;
  let error = 0n;
  // dim_l: dim_0 = 1, dim_1 = 2(λ+1)·… ; ratio dim_{l+1}/dim_l = (λ+l+1)(2λ+l)/((λ+l)(l+1)) for l ≥ 1
  let dim: Q = qInt(1);
  for (let l = 0; l < N; l++) {
    if (l === 1) dim = qMul(qInt(2), qAdd(lambda, qInt(1)));
    else if (l > 1) dim = qMul(dim, q((lambda.num + BigInt(l) * lambda.den) * (2n * lambda.num + BigInt(l - 1) * lambda.den), (lambda.num + BigInt(l - 1) * lambda.den) * BigInt(l) * lambda.den));
    if (dim.num === 0n) continue;
    const { value, estimate } = integrateL(st, l, hLog2);
    const dimF = qFixed(dim, bits);
    sum += mul(dimF, value, bits);
    error += mul(dimF < 0n ? -dimF : dimF, estimate, bits) + 4n;
  }
  // tail Σ_{l≥N} f(l) = (2/Γ(2s−1)) Σ_q H_q ζ(s+1+2q, N+s−1)
  const twoSMinusOne = qAdd(qMul(qInt(2), s), qInt(-1));
  const tailZero = twoSMinusOne.num <= 0n && twoSMinusOne.num % twoSMinusOne.den === 0n; // 1/Γ = 0 (s = 1/2)
  if (!tailZero) {
    const Qmax = 2 * N + 10;
    const x1Shift = setup(s, bits); // γ_k (same x₁)
    const half = x1Shift.gamma.map((g) => g >> 1n); // E(u) = exp(½Σγ_k u^k)
    while (half.length <= Qmax) half.push(0n);
    const gammaTail: Fixed[] = [0n];
    for (let k = 1; k <= Qmax; k++) gammaTail.push(k < half.length ? half[k] : 0n);
    // more γ_k than the node series keeps
    for (let k = x1Shift.gamma.length; k <= Qmax; k++) {
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
    let aPow = expFixed(-mul(qFixed(qAdd(s, qInt(1)), bits), lnA, bits), bits); // a0^{−s−1−2q}
    const a2inv = div(one(bits), mul(qFixed(a0, bits), qFixed(a0, bits), bits), bits);
    let tail = 0n;
    let lastAbs = -1n;
    let converged = false;
    for (let qq = 0; qq <= Qmax; qq++) {
      const sigma = qAdd(s, qInt(1 + 2 * qq));
      const z = hurwitzZeta(sigma, a0, aPow, bits);
      const term = mul(prefactor, mul(H[qq], z.value, bits), bits);
      const termAbs = term < 0n ? -term : term;
      error += mul(prefactor < 0n ? -prefactor : prefactor, mul(H[qq] < 0n ? -H[qq] : H[qq], z.error, bits), bits) + 4n;
      if (lastAbs >= 0n && termAbs > lastAbs && log2Abs(termAbs, bits) > targetLog2 - 10) break; // divergence starts
      tail += term;
      lastAbs = termAbs;
      aPow = mul(aPow, a2inv, bits);
      if (log2Abs(termAbs, bits) + qq + 2 < targetLog2 - 8) {
        // remainder of the Stirling-type expansions in the right half-plane: ≤ sec^{2K}(ph W/2) ≤ 2^K
        // times the first omitted term (DLMF 5.11(ii)); take 2^{qq+2}·|last term| as the bound
        const z2 = hurwitzZeta(qAdd(s, qInt(3 + 2 * qq)), a0, aPow, bits);
        const next = qq + 1 <= Qmax ? mul(prefactor, mul(H[qq + 1], z2.value, bits), bits) : termAbs;
        const bound = ((next < 0n ? -next : next) + termAbs) << BigInt(qq + 2);
        error += bound;
        converged = true;
        break;
      }
    }
    if (!converged) fail('limit', `tetrahedron tail expansion did not reach the target (N = ${N})`);
    sum += tail;
  }
  // P = Γ(s)/π · sum
  const gs = gammaFixed(s, bits);
  const factor = div(gs, piFixed(bits), bits);
  const value = mul(factor, sum, bits);
  const totalError = mul(factor, error, bits) + 16n;
  return { value, error: totalError, bits };
}

function checkDigits(digits: number): void {
  if (!Number.isInteger(digits) || digits < 1 || digits > MAX_DIGITS + 200) fail('limit', `digits must be an integer from 1 to ${MAX_DIGITS + 200}`);
  if (digits > 300) fail('limit', 'the tetrahedron period is computed to at most 300 digits');
}

function argument(x: RealInput | ExactRational): Q {
  const r = toExactRational(x);
  const v = q(r.num, r.den);
  if (v.num * 3n <= v.den || v.num > 2n * v.den) fail('domain', 'tetrahedronPeriod needs 1/3 < s ≤ 2 (the spectral integral ∫ R³ dt converges only for 3s > 1)');
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
  return toResult(computeRaw(argument(s), digits), digits);
}

/** P(s) for rational 1/3 < s ≤ 2, every printed digit covered by the error bound (P(2) = 6ζ(3)). */
export function tetrahedronPeriod(s: RealInput | ExactRational, digits: number): Real {
  checkDigits(digits);
  const sq = argument(s);
  for (const extra of [8, 20, 40]) {
    const result = toResult(computeRaw(sq, digits + extra), digits);
    if (result.guaranteedDigits >= digits) return result.value;
  }
  return fail('limit', 'tetrahedronPeriod could not certify the requested digits');
}
