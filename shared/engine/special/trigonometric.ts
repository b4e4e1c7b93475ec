import { type ExactRational, type Fixed, changeBits, div, fromRational, mul, one } from '../precision';
import { piFixed } from './constants';
import { isqrtFast, rectangularSeries } from './elementary';

/** sin(πx) alone (cos(πx) is not computed when it is not needed on the way). */
export function sinPi(x: ExactRational, bits: number): Fixed {
  return sinCosPi(x, bits, true).sin;
}

/**
 * sin(πx) and cos(πx) for rational x (with `sinOnly`, cos may be returned as 0). The reduction of x modulo 2 is exact, so values near the
 * zeros of sin(πx) keep their relative accuracy once the caller adds bits for the distance.
 */
export function sinCosPi(x: ExactRational, bits: number, sinOnly = false): { sin: Fixed; cos: Fixed } {
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
    [s, c] = sinCosTaylor(mul(piFixed(work), fromRational(r, x.den, work), work), work, sinOnly);
  } else {
    const [s2, c2] = sinCosTaylor(mul(piFixed(work), fromRational(x.den - 2n * r, 2n * x.den, work), work), work);
    s = c2;
    c = s2;
  }
  const shift = 8n;
  return { sin: (sinSign * s) >> shift, cos: (cosSign * c) >> shift };
}

const TRIPLINGS = 6;

/**
 * [sin θ, cos θ] for 0 ≤ θ ≤ π/4: the Taylor series of sin at θ/3^h (rectangular splitting), h
 * triplings sin 3t = sin t·(3 − 4 sin² t), then cos θ = √(1 − sin² θ) (well conditioned: cos θ ≥ 1/√2).
 */
function sinCosTaylor(theta: Fixed, bits: number, sinOnly = false): [Fixed, Fixed] {
  const work = bits + 2 * TRIPLINGS + 10;
  const t = changeBits(theta, bits, work) / 3n ** BigInt(TRIPLINGS);
  const u = mul(t, t, work);
  const log2InverseT = TRIPLINGS * Math.log2(3);
  let terms = 1;
  for (let log2Term = 0; log2Term > -work - 4; terms++) log2Term -= 2 * log2InverseT + Math.log2(2 * terms * (2 * terms + 1));
  // sin t / t = Σ (−1)^i u^i/(2i+1)!
  let sin = mul(t, rectangularSeries(u, terms, () => -1n, (i) => BigInt(2 * i * (2 * i + 1)), work), work);
  const three = 3n << BigInt(work);
  for (let i = 0; i < TRIPLINGS; i++) sin = mul(sin, three - 4n * mul(sin, sin, work), work);
  const unit = one(work);
  const cos = sinOnly ? 0n : isqrtFast((unit - mul(sin, sin, work)) << BigInt(work));
  return [changeBits(sin, work, bits), changeBits(cos, work, bits)];
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
