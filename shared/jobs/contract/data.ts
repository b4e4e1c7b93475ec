import { z } from 'zod';
import { DATASET_LIMITS, COMPARABLE_X_AXES, COMPARABLE_Y_AXES } from '../../notebook/datasets';
import { JOB_LIMITS, MAX_SCAN_POINTS } from './limits';
import { ModelInput } from './model';
import { DecimalString, Digits, FixedPointName, Loops } from './primitives';

/**
 * The jobs that hold series against numerical data — the same contract as every other job (CLI,
 * POST /api/calc, notebook cells): strict inputs, results as decimal text, failures as {error}.
 *
 *   {"job":"kinks","points":[["x","y"], …]}  →  {"kinks":[{"x","y","uncertainty","strength"}, …], "smoothing":{…}}
 *   {"job":"compare", model, loops, digits, d, s:{from,to,points}, quantity, data:{…}}  →  CompareResult
 */

/** A point as two decimal strings. Length and numeric checks beyond the regex give messages naming the point. */
const DataPoint = z.tuple([DecimalString, DecimalString]);

export const KinksJob = z.strictObject({
  job: z.literal('kinks'),
  points: z.array(DataPoint).max(DATASET_LIMITS.maxComparedPoints),
  /** Bootstrap resamples for the uncertainty (default JOB_LIMITS.defaultResamples). */
  resamples: z.number().int().min(JOB_LIMITS.minResamples).max(JOB_LIMITS.maxResamples).optional(),
  /** Seed of the resampling, so a job gives the same answer every time (default 1). */
  seed: z.number().int().min(0).max(2 ** 31 - 1).optional(),
});
export type KinksJob = z.infer<typeof KinksJob>;

export const Kink = z.strictObject({
  x: z.string(),
  y: z.string(),
  /** One standard deviation of the position over the bootstrap resamples, combined with the sampling step. */
  uncertainty: z.string(),
  /** Peak curvature over the median curvature of the smoothed curve: how far the kink stands out. */
  strength: z.string(),
});
export type Kink = z.infer<typeof Kink>;

export const KinksResult = z.strictObject({
  /** Strongest first; empty for a smooth curve. */
  kinks: z.array(Kink),
  smoothing: z
    .strictObject({
      /** The smoothing parameter chosen by generalised cross-validation (x and y rescaled to [0, 1]). */
      lambda: z.string(),
      /** Effective degrees of freedom: the trace of the smoother matrix. */
      effectiveDof: z.string(),
      gcv: z.string(),
      resamples: z.number().int(),
    })
    .optional(),
});
export type KinksResult = z.infer<typeof KinksResult>;

/** Series variants a comparison draws: truncations at each loop order and Padé approximants. */
export const SeriesVariant = z.strictObject({
  /** `order1`, `order2`, `pade_1_1`, `pade_0_1`, `pade_0_2` … */
  key: z.string(),
  /** For people: "one loop (ε¹)", "Padé [1/1]". */
  label: z.string(),
  kind: z.enum(['truncated', 'pade']),
  /** Highest power of ε used. */
  order: z.number().int(),
});
export type SeriesVariant = z.infer<typeof SeriesVariant>;

export const CompareJob = z.strictObject({
  job: z.literal('compare'),
  model: ModelInput,
  loops: Loops,
  digits: Digits.max(JOB_LIMITS.maxCompareDigits).default(JOB_LIMITS.defaultCompareDigits),
  d: DecimalString,
  /** The curve: the scan's range of s. */
  s: z.strictObject({ from: DecimalString, to: DecimalString, points: z.number().int().min(2).max(MAX_SCAN_POINTS) }),
  quantity: z.enum(COMPARABLE_Y_AXES),
  fixedPoint: FixedPointName.optional(),
  shortRange: z.strictObject({ Delta_sigma: DecimalString }).optional(),
  data: z.strictObject({
    xAxis: z.enum(COMPARABLE_X_AXES),
    x: z.array(DecimalString).min(1).max(DATASET_LIMITS.maxComparedPoints),
    y: z.array(DecimalString).min(1).max(DATASET_LIMITS.maxComparedPoints),
    yErrLow: z.array(DecimalString).max(DATASET_LIMITS.maxComparedPoints).optional(),
    yErrHigh: z.array(DecimalString).max(DATASET_LIMITS.maxComparedPoints).optional(),
    /** A boundary curve: run the kink locator on it too. */
    boundary: z.boolean().default(false),
  }),
});
export type CompareJob = z.infer<typeof CompareJob>;

const MaybeValue = z.string().nullable();

export const CompareResult = z.strictObject({
  quantity: z.enum(COMPARABLE_Y_AXES),
  xAxis: z.enum(COMPARABLE_X_AXES),
  d: z.string(),
  fixedPoint: z.string().nullable(),
  variants: z.array(SeriesVariant),
  /** Positions on the data's x-axis; `sStar` only when the short-range Δσ is known. */
  marks: z.strictObject({
    meanFieldEnd: z.strictObject({ s: z.string(), x: z.string() }),
    sStar: z.strictObject({ s: z.string(), x: z.string() }).optional(),
    dataRange: z.tuple([z.string(), z.string()]),
  }),
  /** The series on the scan's grid. `defects[key]` says why a value is missing or untrustworthy (a Padé pole in (0, ε)). */
  curve: z.array(
    z.strictObject({
      s: z.string(),
      x: z.string(),
      eps: z.string(),
      regime: z.enum(['mean-field', 'long-range', 'short-range']),
      values: z.record(z.string(), MaybeValue),
      defects: z.record(z.string(), z.string()).optional(),
    }),
  ),
  /** Each data point with the series at its x, the residual series − data and, with errors, the residual in units of the error. */
  points: z.array(
    z.strictObject({
      x: z.string(),
      s: z.string(),
      y: z.string(),
      errLow: z.string().optional(),
      errHigh: z.string().optional(),
      regime: z.enum(['mean-field', 'long-range', 'short-range', 'outside']),
      series: z.record(z.string(), MaybeValue),
      residual: z.record(z.string(), MaybeValue),
      pull: z.record(z.string(), MaybeValue).optional(),
      defects: z.record(z.string(), z.string()).optional(),
    }),
  ),
  /**
   * Per variant: `points` with a residual (the RMS and max |r| use them), χ² = Σ pull² over the
   * `chi2Points` points that have a pull (a value and a non-zero error on the side of the series),
   * χ²/point = χ²/chi2Points. Points in the short-range region count in neither.
   */
  summary: z.array(
    z.strictObject({
      key: z.string(),
      points: z.number().int(),
      chi2Points: z.number().int(),
      chi2: MaybeValue,
      chi2PerPoint: MaybeValue,
      rms: MaybeValue,
      maxAbs: MaybeValue,
    }),
  ),
  /** For a boundary: kinks found, each with the distance (series − kink y) at the kink's x per variant. */
  kinks: z
    .array(Kink.safeExtend({ s: z.string(), distance: z.record(z.string(), MaybeValue) }))
    .optional(),
  notes: z.array(z.string()),
});
export type CompareResult = z.infer<typeof CompareResult>;
