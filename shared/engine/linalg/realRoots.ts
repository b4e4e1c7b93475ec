import { type Real, type realContext } from '../precision';

type RealContext = ReturnType<typeof realContext>;

/** Σ c_k x^k by Horner's rule. */
export function polynomialValue(coeffs: Real[], x: Real): Real {
  let s = x.mul(0);
  for (let k = coeffs.length - 1; k >= 0; k--) s = s.times(x).plus(coeffs[k]);
  return s;
}

/**
 * Real zeros of Σ c_k x^k on [lo, hi], sorted, in the precision of `R`. Between consecutive critical
 * points (zeros of the derivative, found the same way) the polynomial is monotone, so each piece holds
 * at most one simple zero, located by bisection; a critical point where the value vanishes to `digits`
 * digits relative to the size of the terms is a zero of even multiplicity, which no sign change reveals.
 */
export function realRootsInInterval(coeffs: Real[], lo: Real, hi: Real, digits: number, R: RealContext): Real[] {
  let degree = coeffs.length - 1;
  while (degree > 0 && coeffs[degree].isZero()) degree--;
  if (degree === 0 || lo.gt(hi)) return [];
  if (degree === 1) {
    const x = coeffs[0].neg().div(coeffs[1]);
    return x.gte(lo) && x.lte(hi) ? [x] : [];
  }
  const p = coeffs.slice(0, degree + 1);
  const derivative = p.slice(1).map((c, k) => c.times(k + 1));
  const critical = realRootsInInterval(derivative, lo, hi, digits + 4, R).filter((c) => c.gt(lo) && c.lt(hi));
  const knots = [lo, ...critical, hi];
  const found: Real[] = knots.filter((x) => touchesZero(p, x, digits, R));
  for (let i = 1; i < knots.length; i++) {
    const [a, b] = [knots[i - 1], knots[i]];
    const [pa, pb] = [polynomialValue(p, a), polynomialValue(p, b)];
    if (!pa.isZero() && !pb.isZero() && pa.isNegative() !== pb.isNegative()) found.push(bisect(p, a, b, digits + 4, R));
  }
  return distinct(found.sort((x, y) => x.comparedTo(y)), digits);
}

function touchesZero(p: Real[], x: Real, digits: number, R: RealContext): boolean {
  const size = p.reduceRight((sum, c) => sum.times(x.abs()).plus(c.abs()), new R(0));
  return polynomialValue(p, x).abs().lte(size.times(new R(10).pow(-digits)));
}

/** Sorted zeros with the copies of one zero (found from both sides of a near-double zero) merged. */
function distinct(sorted: Real[], digits: number): Real[] {
  const tolerance = Math.ceil(digits / 2);
  return sorted.filter((x, i) => i === 0 || x.minus(sorted[i - 1]).abs().gt(x.abs().plus(1).times(`1e-${tolerance}`)));
}

function bisect(q: Real[], lo: Real, hi: Real, digits: number, R: RealContext): Real {
  let qlo = polynomialValue(q, lo);
  const iterations = Math.ceil(digits * 3.33) + 8;
  for (let i = 0; i < iterations; i++) {
    const mid = lo.plus(hi).div(2);
    const qm = polynomialValue(q, mid);
    if (qm.isZero()) return mid;
    if (qm.isNegative() === qlo.isNegative()) {
      lo = mid;
      qlo = qm;
    } else hi = mid;
  }
  return new R(lo.plus(hi).div(2));
}
