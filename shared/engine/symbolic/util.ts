import { gcd } from '../precision';

export function lcm(a: bigint, b: bigint): bigint {
  if (a === 0n || b === 0n) return 0n;
  const g = gcd(a, b);
  const r = (a / g) * b;
  return r < 0n ? -r : r;
}
