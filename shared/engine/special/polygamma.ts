import { type ExactRational, type Fixed, changeBits, div, fail, fromRational, mul, one } from '../precision';
import { CoefficientCache, hornerInverseSquare, log2AbsBernoulli, log2AbsRational, requireTerms, termsForBudget } from './asymptotic';
import { bernoulliEvenUnreduced } from './bernoulli';
import { piFixed } from './constants';
import { lnRational } from './elementary';
import {
  type BigFloat,
  bitLen,
  floatAdd,
  floatDiv,
  floatFromFixed,
  floatFromInteger,
  floatLog2,
  floatMul,
  floatNeg,
  floatPow,
  floatToFixed,
  trim,
} from './float';
import {
  TAYLOR_PATH_MAX_BITS,
  TAYLOR_PATH_MAX_X,
  arithmeticProduct,
  asymptoticThreshold,
  isNonPositiveInteger,
  nearestInteger,
  reciprocalGammaNearOne,
  usesShiftOnNegativeAxis,
} from './gamma';
import { bitsNearInteger, cotPi, sinCosPi } from './trigonometric';

/*
 * Polygamma ψ⁽ⁿ⁾(x) for real rational x. Written here because no JavaScript package offers
 * arbitrary-precision polygamma. Paths:
 *  - n ≤ 1, moderate x and precision: derivatives of the cached Taylor series of 1/Γ(1+t);
 *  - n = 0 otherwise: shift upward and use the asymptotic series (DLMF 5.11.2);
 *  - n ≥ 1 otherwise: ψ⁽ⁿ⁾(x) = (−1)^{n+1} n! ζ(n+1, x) (DLMF 25.11.12) with the Hurwitz sum
 *    scaled by x^{n+1}, so every term is at most 1 and no n!-sized cancellation arises;
 *  - x < 0: reflection ψ⁽ⁿ⁾(1−x) + (−1)^{n+1} ψ⁽ⁿ⁾(x) = (−1)^n π dⁿ/dxⁿ cot(πx) (DLMF 5.15.6).
 */

/** Highest order accepted by the engine (the job layer allows less). */
export const MAX_POLYGAMMA_ORDER = 5000;

function checkOrder(n: number): void {
  if (!Number.isInteger(n) || n < 0) fail('domain', `polygamma order must be a non-negative integer, got ${n}`);
  if (n > MAX_POLYGAMMA_ORDER) fail('limit', `polygamma order above ${MAX_POLYGAMMA_ORDER}`);
}

/** True when ψ⁽ⁿ⁾(x) is computed in fixed point (absolute error, see `polygammaFixed`). */
export function polygammaUsesFixedPoint(n: number, x: ExactRational, bits: number): boolean {
  return n === 0 || (n === 1 && x.num > 0n && bits <= TAYLOR_PATH_MAX_BITS && x.num <= TAYLOR_PATH_MAX_X * x.den);
}

/** ψ(x) (n = 0) or ψ′(x) on the Taylor path, fixed point with absolute error a few units of 2^-bits. */
export function polygammaFixed(n: number, x: ExactRational, bits: number): Fixed {
  checkOrder(n);
  if (isNonPositiveInteger(x)) fail('pole', `psi has a pole at ${x.num}`);
  if (n > 1) throw new Error('polygammaFixed handles n ≤ 1');
  if (x.num < 0n && !usesShiftOnNegativeAxis(x, bits + 16)) return digammaByReflection(x, bits);
  if (x.num > 0n && bits <= TAYLOR_PATH_MAX_BITS && x.num <= TAYLOR_PATH_MAX_X * x.den) return polygammaByTaylor(n, x, bits + 8) >> 8n;
  if (n === 1) return floatToFixed(polygammaFloat(1, x, bits + 8), bits);
  return digammaAsymptotic(x, bits);
}

function polygammaByTaylor(n: number, x: ExactRational, bits: number): Fixed {
  const unit = one(bits);
  if (2n * x.num < x.den) {
    // ψ(x) = ψ(x+1) − 1/x,  ψ'(x) = ψ'(x+1) + 1/x²
    const shifted = polygammaByTaylor(n, { num: x.num + x.den, den: x.den }, bits);
    const inverse = fromRational(x.den, x.num, bits);
    return n === 0 ? shifted - inverse : shifted + mul(inverse, inverse, bits);
  }
  const m = nearestInteger(x);
  const t = fromRational(x.num - m * x.den, x.den, bits);
  const [r0, r1, r2] = reciprocalGammaNearOne(x.num - m * x.den, x.den, bits, n + 1);
  // P(t) = Π_{j=1}^{m−1} (t+j) with derivatives, so Σ 1/(t+j) = P'/P and Σ 1/(t+j)² = (P'/P)² − P''/P
  let p0 = unit;
  let p1 = 0n;
  let p2 = 0n;
  for (let j = 1n; j < m; j++) {
    const factor = t + j * unit;
    p2 = mul(p2, factor, bits) + 2n * p1;
    p1 = mul(p1, factor, bits) + p0;
    p0 = mul(p0, factor, bits);
  }
  const logDerivP = div(p1, p0, bits);
  if (n === 0) return -div(r1, r0, bits) + logDerivP;
  const atOnePlusT = div(mul(r1, r1, bits) - mul(r0, r2, bits), mul(r0, r0, bits), bits);
  return atOnePlusT - (mul(logDerivP, logDerivP, bits) - div(p2, p0, bits));
}

// ---------------------------------------------------------------------------------------------
// Digamma: ψ(z) = ln z − 1/(2z) − Σ_k B_{2k}/(2k z^{2k})  (DLMF 5.11.2) at z = x + N, then
// ψ(x) = ψ(x+N) − Σ_{j<N} 1/(x+j)  (DLMF 5.5.2).

const digammaCoefficients = new CoefficientCache(
  (k) => {
    const b = bernoulliEvenUnreduced(2 * k);
    return { num: b.num, den: b.den * BigInt(2 * k) };
  },
  (k) => log2AbsBernoulli(k) - Math.log2(2 * k),
);

function digammaAsymptotic(x: ExactRational, bits: number): Fixed {
  const work = bits + 16;
  const threshold = BigInt(asymptoticThreshold(work));
  const N = x.num < threshold * x.den ? threshold - x.num / x.den : 0n;
  const P = x.num + N * x.den;
  const Q = x.den;
  const terms = requireTerms(termsForBudget(digammaCoefficients, log2AbsRational(P, Q), -work - 6));
  const series = hornerInverseSquare(digammaCoefficients, terms, P, Q, work);
  const atZ = lnRational(P, Q, work) - fromRational(Q, 2n * P, work) - (series * Q * Q) / (P * P);
  return changeBits(atZ - harmonicShift(x.num, Q, N, work), work, bits);
}

/** Σ_{j<N} Q/(P0 + jQ) in fixed point: exact fractions by binary splitting when they stay small. */
function harmonicShift(P0: bigint, Q: bigint, N: bigint, bits: number): Fixed {
  if (N === 0n) return 0n;
  if (Number(N) * bitLen(P0 + N * Q) <= 1 << 18) {
    const [num, den] = reciprocalSum(P0, Q, 0n, N);
    return ((num * Q) << BigInt(bits)) / den;
  }
  let sum = 0n;
  for (let j = 0n; j < N; j++) sum += fromRational(Q, P0 + j * Q, bits);
  return sum;
}

/** Σ_{j=lo}^{hi−1} 1/(a + j·d) as an unreduced fraction [num, den]. */
function reciprocalSum(a: bigint, d: bigint, lo: bigint, hi: bigint): [bigint, bigint] {
  if (hi - lo === 1n) return [1n, a + lo * d];
  const mid = (lo + hi) >> 1n;
  const [n1, d1] = reciprocalSum(a, d, lo, mid);
  const [n2, d2] = reciprocalSum(a, d, mid, hi);
  return [n1 * d2 + n2 * d1, d1 * d2];
}

/** ψ(x) = ψ(1−x) − π cot(πx) for x < 0  (DLMF 5.5.4). */
function digammaByReflection(x: ExactRational, bits: number): Fixed {
  const work = bits + bitsNearInteger(x) + 8;
  const mirrored = polygammaFixed(0, { num: x.den - x.num, den: x.den }, work);
  const value = mirrored - mul(piFixed(work), cotPi(x, work), work);
  return changeBits(value, work, bits);
}

// ---------------------------------------------------------------------------------------------
// ψ⁽ⁿ⁾, n ≥ 1, as floats with relative accuracy.

/** ψ⁽ⁿ⁾(x) for n ≥ 1 with relative error a few units of 2^-bits. */
export function polygammaFloat(n: number, x: ExactRational, bits: number): BigFloat {
  checkOrder(n);
  if (n === 0) throw new Error('polygammaFloat handles n ≥ 1');
  if (isNonPositiveInteger(x)) fail('pole', `psi has a pole at ${x.num}`);
  return x.num > 0n ? polygammaPositive(n, x, bits) : polygammaByReflection(n, x, bits);
}

/** ψ⁽ⁿ⁾(x) = (−1)^{n+1} n! x^{−(n+1)} S with S = Σ_{k≥0} (x/(x+k))^{n+1} ≥ 1. */
function polygammaPositive(n: number, x: ExactRational, bits: number): BigFloat {
  const s = n + 1;
  const work = bits + 16 + Math.ceil(Math.log2(s));
  const P0 = x.num;
  const Q = x.den;
  const powerP0 = integerPower(P0, s, work + 64);
  const S = scaledHurwitzSum(s, P0, Q, powerP0, work);
  const factorial = floatFromInteger(arithmeticProduct(1n, 1n, 0n, BigInt(n)), work);
  const inversePower = floatDiv(integerPower(Q, s, work), trim(powerP0, work), work);
  const value = floatMul(floatMul(factorial, inversePower, work), floatFromFixed(S, work), work);
  return trim(n % 2 === 1 ? value : floatNeg(value), bits);
}

/** base^e (base a positive integer) as a float with at least `prec` bits (exact when it fits). */
function integerPower(base: bigint, e: number, prec: number): BigFloat {
  if (bitLen(base) * e <= prec + 64) return { man: base ** BigInt(e), exp: 0 };
  return floatPow({ man: base, exp: 0 }, e, prec + 2 * Math.ceil(Math.log2(e + 1)));
}

/** (P0/Pk)^s in fixed point at `bits`, given log2 of it (0 when below 2^-bits). */
function ratioPower(powerP0: BigFloat, Pk: bigint, s: number, log2Term: number, bits: number): Fixed {
  const prec = Math.ceil(bits + log2Term) + 16;
  if (prec <= 16) return 0n;
  const pk = integerPower(Pk, s, prec);
  return floatToFixed(floatDiv(trim(powerP0, prec), pk, prec), bits);
}

interface HurwitzPlan {
  /** Terms summed directly, k = 0 … N−1. */
  N: bigint;
  /** Euler–Maclaurin correction terms at z = x + N (0: the tail is negligible). */
  J: number;
  tail: boolean;
}

/**
 * Euler–Maclaurin for the scaled Hurwitz sum (DLMF 2.10.1 applied to (x+t)^{-s}; the large-a expansion
 * of DLMF §25.11(xii) at integer s): with z = x + N,
 *   S = Σ_{k<N} (x/(x+k))^s + (x/z)^s·[z/(s−1) + ½ + Σ_{j≥1} c_j z^{1−2j}],  c_j = B_{2j}(s)_{2j−1}/(2j)!.
 * The plan trades direct terms (a power and a division each) against correction terms (a short
 * product and division each), using |B_{2j}|/(2j)! = 2ζ(2j)/(2π)^{2j} ≤ 2ζ(2)/(2π)^{2j} (DLMF 25.6.2).
 */
function planHurwitz(s: number, log2x: number, x: number, bits: number): HurwitzPlan {
  const budget = -bits - 8;
  if (log2x > 900) return { N: 0n, J: requireTerms(correctionTerms(s, log2x, budget)) + 2, tail: true };
  const directCost = 6 + Math.log2(s);
  let best: (HurwitzPlan & { cost: number }) | null = null;
  for (let i = 0; i < 200; i++) {
    const zTarget = Math.max(x, 1) * 1.25 ** i;
    const N = zTarget <= x ? 0n : BigInt(Math.ceil(zTarget - x));
    const z = x + Number(N);
    const log2z = Math.log2(z);
    const lead = s * (log2x - log2z) + log2z - Math.log2(s - 1);
    let plan: HurwitzPlan | null = null;
    if (lead + 1 < budget) plan = { N, J: 0, tail: false };
    else {
      const J = correctionTerms(s, log2z, budget - s * (log2x - log2z));
      if (J !== null) plan = { N, J: J + 2, tail: true };
    }
    if (plan) {
      const cost = Number(N) * directCost + plan.J;
      if (!best || cost < best.cost) best = { ...plan, cost };
      if (!plan.tail) break;
    }
    if (best && Number(N) * directCost > best.cost) break;
  }
  if (!best || best.N > 1_000_000n) return fail('limit', 'polygamma: too many terms at this order, argument and precision');
  return best;
}

/** Number of correction terms with |c_j| z^{1−2j} < 2^budget, or null when the series turns first. */
function correctionTerms(s: number, log2z: number, budget: number): number | null {
  const log2TwoPi = Math.log2(2 * Math.PI);
  let rising = Math.log2(s); // log2 (s)_{2j−1} at j = 1
  let previous = Infinity;
  for (let j = 1; j < 100000; j++) {
    if (j > 1) rising += Math.log2(s + 2 * j - 3) + Math.log2(s + 2 * j - 2);
    const estimate = 1.72 - 2 * j * log2TwoPi + rising + (1 - 2 * j) * log2z;
    if (estimate < budget) return j;
    if (estimate > previous) return null;
    previous = estimate;
  }
  return null;
}

const hurwitzCaches = new Map<number, CoefficientCache>();
const MAX_HURWITZ_CACHES = 16;

/** Cache of c_j = B_{2j}·(s)_{2j−1}/(2j)! for one s. */
function hurwitzCoefficients(s: number): CoefficientCache {
  let cache = hurwitzCaches.get(s);
  if (!cache) {
    const risingOverFactorial: { num: bigint; den: bigint }[] = [{ num: 1n, den: 1n }];
    cache = new CoefficientCache((j) => {
      for (let i = risingOverFactorial.length; i <= j; i++) {
        const prev = risingOverFactorial[i - 1];
        // (s)_{2i−1}/(2i)! from (s)_{2i−3}/(2i−2)!: times (s+2i−3)(s+2i−2)/((2i−1)(2i)); i = 1: s/2
        const num = i === 1 ? BigInt(s) : prev.num * BigInt(s + 2 * i - 3) * BigInt(s + 2 * i - 2);
        const den = i === 1 ? 2n : prev.den * BigInt((2 * i - 1) * 2 * i);
        risingOverFactorial.push({ num, den });
      }
      const b = bernoulliEvenUnreduced(2 * j);
      const r = risingOverFactorial[j];
      return { num: b.num * r.num, den: b.den * r.den };
    }, () => 0);
    if (hurwitzCaches.size >= MAX_HURWITZ_CACHES) hurwitzCaches.delete(hurwitzCaches.keys().next().value as number);
    hurwitzCaches.set(s, cache);
  }
  return cache;
}

/** S = Σ_{k≥0} (x/(x+k))^s for x = P0/Q > 0, fixed point at `bits` (S ≥ 1). */
function scaledHurwitzSum(s: number, P0: bigint, Q: bigint, powerP0: BigFloat, bits: number): Fixed {
  const log2x = log2AbsRational(P0, Q);
  const x = 2 ** log2x;
  const plan = planHurwitz(s, log2x, x, bits);
  const log2P0 = log2AbsRational(P0, 1n);
  let sum = plan.N > 0n ? one(bits) : 0n; // k = 0
  for (let k = 1n; k < plan.N; k++) {
    const Pk = P0 + k * Q;
    const log2Term = s * (log2P0 - log2AbsRational(Pk, 1n));
    // the terms decrease; stop once this one and a bound for all later ones, term·(1 + (x+k)/(s−1)), are negligible
    if (log2Term + Math.log2(1 + (x + Number(k)) / (s - 1)) < -bits - 8) break;
    sum += ratioPower(powerP0, Pk, s, log2Term, bits);
  }
  if (!plan.tail) return sum;
  const Pz = P0 + plan.N * Q;
  const work = bits + 8;
  const cache = hurwitzCoefficients(s);
  const series = hornerInverseSquare(cache, plan.J, Pz, Q, work);
  // bracket = z/(s−1) + ½ + (Q/Pz)·series
  const bracket = (Pz << BigInt(work)) / (Q * BigInt(s - 1)) + (one(work) >> 1n) + (series * Q) / Pz;
  const ratio = plan.N === 0n ? floatFromInteger(1n, work) : floatDiv(trim(powerP0, work + 16), integerPower(Pz, s, work + 16), work + 16);
  return sum + floatToFixed(floatMul(ratio, floatFromFixed(bracket, work), work + 16), bits);
}

// ---------------------------------------------------------------------------------------------
// Reflection for x < 0.

const cotDerivativePolynomials: bigint[][] = [[0n, 1n]];

/** dⁿ/dθⁿ cot θ as a polynomial in c = cot θ: C_0 = c, C_{k+1} = −(1+c²)·C_k'(c). */
function cotDerivativePolynomial(n: number): bigint[] {
  while (cotDerivativePolynomials.length <= n) {
    const prev = cotDerivativePolynomials[cotDerivativePolynomials.length - 1];
    const derivative = prev.slice(1).map((c, i) => c * BigInt(i + 1));
    const next: bigint[] = new Array(derivative.length + 2).fill(0n);
    derivative.forEach((c, i) => {
      next[i] -= c;
      next[i + 2] -= c;
    });
    while (next.length > 1 && next[next.length - 1] === 0n) next.pop();
    cotDerivativePolynomials.push(next);
  }
  return cotDerivativePolynomials[n];
}

/** C_n(c) in floats. Its coefficients are all of one sign on powers of one parity, so no cancellation. */
function cotDerivativeAt(n: number, c: BigFloat, prec: number): BigFloat {
  const poly = cotDerivativePolynomial(n);
  const parity = (n + 1) % 2;
  const c2 = floatMul(c, c, prec);
  let acc: BigFloat = { man: 0n, exp: 0 };
  for (let i = poly.length - 1 - ((poly.length - 1 - parity) % 2); i >= parity; i -= 2) {
    acc = floatAdd(floatMul(acc, c2, prec), { man: poly[i], exp: 0 }, prec);
  }
  return parity === 1 ? floatMul(acc, c, prec) : acc;
}

const MAX_REFLECTION_RETRIES = 6;

/** ψ⁽ⁿ⁾(x) = (−1)ⁿ ψ⁽ⁿ⁾(1−x) − π^{n+1} C_n(cot πx), with more bits when the two terms cancel. */
function polygammaByReflection(n: number, x: ExactRational, bits: number): BigFloat {
  let work = bits + 16 + Math.ceil(Math.log2(n + 2));
  for (let attempt = 0; attempt < MAX_REFLECTION_RETRIES; attempt++) {
    const mirrored = polygammaPositive(n, { num: x.den - x.num, den: x.den }, work);
    const trigBits = work + bitsNearInteger(x) + 8;
    const { sin, cos } = sinCosPi(x, trigBits);
    const cot = floatDiv(floatFromFixed(cos, trigBits), floatFromFixed(sin, trigBits), work);
    const piPower = floatPow(floatFromFixed(piFixed(work + 16), work + 16), n + 1, work);
    const cotTerm = floatMul(piPower, cotDerivativeAt(n, cot, work + 16), work);
    const value = floatAdd(n % 2 === 0 ? mirrored : floatNeg(mirrored), floatNeg(cotTerm), work + 16);
    const lost = Math.max(floatLog2(mirrored), floatLog2(cotTerm)) - floatLog2(value);
    if (work - lost >= bits + 8) return trim(value, bits);
    work += Math.ceil(Math.min(lost, work)) + 16;
  }
  return fail('limit', 'value too close to a zero to resolve at this precision');
}
