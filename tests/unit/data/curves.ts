import { mulberry32 } from '../../../shared/engine/data/random';

/**
 * Synthetic curves for the kink locator (invented test data, not measurements). Each names the
 * positions of its planted kinks; noise is Gaussian (Box–Muller from a seeded generator) with a
 * standard deviation given relative to the curve's y-range.
 */
export interface Curve {
  name: string;
  f: (x: number) => number;
  from: number;
  to: number;
  /** Planted kinks, strongest first. */
  kinks: number[];
}

const ramp = (x: number, at: number) => Math.max(0, x - at);

export const KINKED: Curve[] = [
  // Slope jump of 1.5 at x = 0.55 on a gently curved line.
  { name: 'slope jump in the middle', f: (x) => 0.5 + 0.8 * x + 0.1 * x * x + 1.5 * ramp(x, 0.55), from: 0, to: 1, kinks: [0.55] },
  // A hyperbola of width 0.003 centred at x = 0.88, 12 % of the range from the end: |f''| peaks at 0.88.
  { name: 'curvature spike near an end', f: (x) => 1 + 0.4 * x + Math.sqrt((x - 0.88) ** 2 + 1e-5), from: 0, to: 1, kinks: [0.88] },
  // Slope jumps of −1.2 at 0.3 and +2 at 0.7: the larger jump makes the stronger kink.
  { name: 'two kinks', f: (x) => 1 + 0.3 * x - 1.2 * ramp(x, 0.3) + 2 * ramp(x, 0.7), from: 0, to: 1, kinks: [0.7, 0.3] },
];

export const SMOOTH: Curve[] = [
  { name: 'parabola', f: (x) => 1 + 0.5 * x + 0.8 * x * x, from: 0, to: 1, kinks: [] },
  { name: 'sine over a period', f: (x) => Math.sin(x), from: 0, to: 2 * Math.PI, kinks: [] },
  { name: 'wide tanh step', f: (x) => Math.tanh((x - 0.5) / 0.25), from: 0, to: 1, kinks: [] },
  { name: 'exponential', f: (x) => Math.exp(2 * x), from: 0, to: 1, kinks: [] },
];

export const NOISE_LEVELS = [0, 1e-4, 1e-3] as const;
export const POINT_COUNTS = [100, 400] as const;

export function sample(curve: Curve, points: number, relativeNoise: number, seed: number): { x: number[]; y: number[] } {
  const random = mulberry32(seed);
  const gaussian = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
  const x = Array.from({ length: points }, (_, i) => curve.from + ((curve.to - curve.from) * i) / (points - 1));
  const exact = x.map(curve.f);
  const range = Math.max(...exact) - Math.min(...exact);
  return { x, y: exact.map((value) => value + relativeNoise * range * gaussian()) };
}

/** A sine over almost a period on [0, 1] with y spanning 2: its |f''| peaks are broad, not kinks. */
export const FAST_SINE: Curve = { name: 'sin(6x) on [0, 1]', f: (x) => Math.sin(6 * x), from: 0, to: 1, kinks: [] };

/** A change of units: x → a·x + b, y → c·y. */
export interface Units { name: string; a: number; b: number; c: number }

export const UNIT_CHANGES: Units[] = [
  { name: 'x / 2π', a: 1 / (2 * Math.PI), b: 0, c: 1 },
  { name: 'x · 0.01', a: 0.01, b: 0, c: 1 },
  { name: 'y · 1e6', a: 1, b: 0, c: 1e6 },
  { name: 'x + 1e6', a: 1, b: 1e6, c: 1 },
];

export function inUnits(values: { x: number[]; y: number[] }, units: Units): { x: number[]; y: number[] } {
  return { x: values.x.map((x) => units.a * x + units.b), y: values.y.map((y) => units.c * y) };
}
