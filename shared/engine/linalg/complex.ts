import { type Real } from '../precision';
import { type CoefficientRing } from '../series';

/** A complex number in double precision. */
export interface Complex {
  re: number;
  im: number;
}

export const cadd = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im });
export const csub = (a: Complex, b: Complex): Complex => ({ re: a.re - b.re, im: a.im - b.im });
export const cmul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
export const cdiv = (a: Complex, b: Complex): Complex => {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
};
export const cabs = (a: Complex): number => Math.hypot(a.re, a.im);

/** A complex number with arbitrary-precision parts. */
export interface ComplexReal {
  re: Real;
  im: Real;
}

export type RealRing = CoefficientRing<Real>;

const toNumber = (x: Real): number => Number(x.toString());

/** Complex arithmetic over a real ring (the working precision of that ring). */
export function complexOps(ring: RealRing) {
  const of = (re: Real, im: Real = ring.zero()): ComplexReal => ({ re, im });
  const fromDouble = (z: Complex): ComplexReal => of(ring.fromRational(BigInt(Math.round(z.re * 1e17)), 10n ** 17n), ring.fromRational(BigInt(Math.round(z.im * 1e17)), 10n ** 17n));
  const add = (a: ComplexReal, b: ComplexReal): ComplexReal => of(ring.add(a.re, b.re), ring.add(a.im, b.im));
  const sub = (a: ComplexReal, b: ComplexReal): ComplexReal => of(ring.sub(a.re, b.re), ring.sub(a.im, b.im));
  const mul = (a: ComplexReal, b: ComplexReal): ComplexReal => of(ring.sub(ring.mul(a.re, b.re), ring.mul(a.im, b.im)), ring.add(ring.mul(a.re, b.im), ring.mul(a.im, b.re)));
  const div = (a: ComplexReal, b: ComplexReal): ComplexReal => {
    const inv = ring.inverse(ring.add(ring.mul(b.re, b.re), ring.mul(b.im, b.im)));
    return of(ring.mul(ring.add(ring.mul(a.re, b.re), ring.mul(a.im, b.im)), inv), ring.mul(ring.sub(ring.mul(a.im, b.re), ring.mul(a.re, b.im)), inv));
  };
  const scale = (a: ComplexReal, num: bigint, den = 1n): ComplexReal => of(ring.scale(a.re, num, den), ring.scale(a.im, num, den));
  const abs = (a: ComplexReal): number => Math.hypot(toNumber(a.re), toNumber(a.im));
  const toDouble = (a: ComplexReal): Complex => ({ re: toNumber(a.re), im: toNumber(a.im) });
  return { of, fromDouble, add, sub, mul, div, scale, abs, toDouble, zero: () => of(ring.zero()), one: () => of(ring.one()) };
}

export type ComplexOps = ReturnType<typeof complexOps>;
