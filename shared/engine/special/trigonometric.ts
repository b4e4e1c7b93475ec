import { type ExactRational, type Fixed, div, fromRational, mul, one } from '../precision/fixed';
import { piFixed } from './constants';

/**
 * sin(πx) and cos(πx) for rational x. The reduction of x modulo 2 is exact, so values near the
 * zeros of sin(πx) keep their relative accuracy once the caller adds bits for the distance.
 */
export function sinCosPi(x: ExactRational, bits: number): { sin: Fixed; cos: Fixed } {
  const work = bits + 8;
  const twoDen = 2n * x.den;
  let r = x.num % twoDen; // x mod 2, as r/den
  if (r < 0n) r += twoDen;
  // x ≡ r/den (mod 2); quadrant folding on exact integers
  let sinSign = 1n;
  let cosSign = 1n;
  if (r >= x.den) {
    r -= x.den; // sin(π(y+1)) = −sin(πy), cos likewise
    sinSign = -sinSign;
    cosSign = -cosSign;
  }
  // now y = r/den ∈ [0,1)
  if (2n * r > x.den) {
    r = x.den - r; // sin(π(1−y)) = sin(πy), cos(π(1−y)) = −cos(πy)
    cosSign = -cosSign;
  }
  // y ∈ [0, 1/2]
  let s: Fixed;
  let c: Fixed;
  if (4n * r <= x.den) {
    [s, c] = sinCosTaylor(mul(piFixed(work), fromRational(r, x.den, work), work), work);
  } else {
    const [s2, c2] = sinCosTaylor(mul(piFixed(work), fromRational(x.den - 2n * r, 2n * x.den, work), work), work);
    s = c2;
    c = s2;
  }
  const shift = 8n;
  return { sin: (sinSign * s) >> shift, cos: (cosSign * c) >> shift };
}

function sinCosTaylor(theta: Fixed, bits: number): [Fixed, Fixed] {
  const t2 = mul(theta, theta, bits);
  let term = theta;
  let sin = theta;
  for (let k = 2n; term !== 0n; k += 2n) {
    term = -mul(term, t2, bits) / (k * (k + 1n));
    sin += term;
  }
  term = one(bits);
  let cos = term;
  for (let k = 1n; term !== 0n; k += 2n) {
    term = -mul(term, t2, bits) / (k * (k + 1n));
    cos += term;
  }
  return [sin, cos];
}

/** cot(πx) for rational x (not an integer). */
export function cotPi(x: ExactRational, bits: number): Fixed {
  const { sin, cos } = sinCosPi(x, bits);
  return div(cos, sin, bits);
}

/** Bits lost to the nearness of x to an integer (for callers dividing by sin πx). */
export function bitsNearInteger(x: ExactRational): number {
  const rem = ((x.num % x.den) + x.den) % x.den;
  const dist = rem * 2n > x.den ? x.den - rem : rem;
  if (dist === 0n) return 0;
  const ratio = Number(x.den / dist);
  return Number.isFinite(ratio) ? Math.ceil(Math.log2(ratio + 1)) : (x.den / dist).toString(2).length;
}
