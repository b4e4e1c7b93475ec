import { type Fixed, fail } from '../precision';

/** Absolute error (in units of 2^-bits) the special-function kernels stay below, with margin. */
const ERROR_ULPS_BITS = 16;
const MAX_RETRIES = 8;

/**
 * Run a fixed-point kernel until its result carries `targetBits` correct significant bits.
 * The kernels have absolute error below 2^(ERROR_ULPS_BITS − bits); when the result is small
 * (cancellation near a zero) the precision is raised by the deficit and the kernel re-run.
 */
export function withRelativeAccuracy(
  targetBits: number,
  startBits: number,
  kernel: (bits: number) => Fixed,
): { value: Fixed; bits: number } {
  let bits = startBits;
  for (let attempt = 0; attempt < MAX_RETRIES; attempt++) {
    const value = kernel(bits);
    const significant = approximateBitLength(value) - ERROR_ULPS_BITS;
    if (significant >= targetBits) return { value, bits };
    const deficit = value === 0n ? bits : targetBits - significant;
    bits += deficit + 16;
  }
  return fail('limit', 'value too close to a zero to resolve at this precision');
}

function approximateBitLength(v: bigint): number {
  const n = Math.abs(Number(v));
  if (n < 1e300) return n < 1 ? 0 : Math.floor(Math.log2(n)) + 1;
  return (v < 0n ? -v : v).toString(2).length;
}
