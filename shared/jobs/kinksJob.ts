import { locateKinks } from '../engine/data/kinks';
import { fail } from '../engine/precision/errors';
import { DATASET_LIMITS } from '../notebook/datasets';
import type { KinksJob, KinksResult } from './contract';

const SIGNIFICANT_DIGITS = 6;

/**
 * `{"job":"kinks","points":[["x","y"], …]}`: the kink locator on a boundary curve. Points may come in
 * any order (they are sorted by x); fewer than the minimum, values that overflow a double (1e999) and
 * repeated x are refused with EngineError('invalid'), which the dispatcher reports as invalid-job.
 */
export function runKinksJob(job: KinksJob): KinksResult {
  const points = parsePoints(job.points);
  const ys = points.map((p) => p.y);
  const search = locateKinks(points.map((p) => p.x), ys, { resamples: job.resamples, seed: job.seed });
  const yResolution = (Math.max(...ys) - Math.min(...ys)) * 1e-6;
  return {
    kinks: search.kinks.map((kink) => ({
      x: decimal(kink.x, kink.uncertainty / 10),
      y: decimal(kink.y, yResolution),
      uncertainty: decimal(kink.uncertainty),
      strength: decimal(kink.strength),
    })),
    smoothing: {
      lambda: decimal(search.lambda),
      effectiveDof: decimal(search.effectiveDof),
      gcv: decimal(search.gcv),
      resamples: search.resamples,
    },
  };
}

interface ParsedPoint { x: number; y: number; line: number }

function parsePoints(raw: KinksJob['points']): ParsedPoint[] {
  const minimum = DATASET_LIMITS.minKinkPoints;
  if (raw.length < minimum) fail('invalid', `the kink locator needs at least ${minimum} points; got ${raw.length}`);
  const points = raw.map(([xText, yText], index) => {
    const x = Number(xText);
    const y = Number(yText);
    if (!Number.isFinite(x)) fail('invalid', `point ${index + 1}: x = ${xText} is not a finite number`);
    if (!Number.isFinite(y)) fail('invalid', `point ${index + 1}: y = ${yText} is not a finite number`);
    return { x, y, line: index + 1 };
  });
  points.sort((a, b) => a.x - b.x || a.line - b.line);
  for (let i = 1; i < points.length; i++) {
    const [first, second] = [points[i - 1], points[i]];
    if (first.x === second.x) fail('invalid', `points ${first.line} and ${second.line} have the same x (${raw[first.line - 1][0]}); a curve needs one y per x`);
  }
  return points;
}

/**
 * At least SIGNIFICANT_DIGITS significant digits, more when needed to show `resolution` (data on an
 * offset, such as x = 1.000000001 … 1.000000002, need more digits than their spread suggests).
 */
export function decimal(value: number, resolution = 0): string {
  const needed = value !== 0 && resolution > 0 ? Math.ceil(Math.log10(Math.abs(value) / resolution)) + 1 : 0;
  const digits = Math.min(17, Math.max(SIGNIFICANT_DIGITS, needed));
  return String(Number(value.toPrecision(digits)));
}
