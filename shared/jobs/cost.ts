import {
  type Affine,
  EngineError,
  type ExpansionContext,
  type GammaFactor,
  bubbleFactors,
  fourierPowerFactors,
  leadingPower,
  numericContext,
  starTriangleFactors,
  symbolicContext,
  toExactRational,
} from '../engine/index';
import { customModel } from '../engine/models/custom';
import { type Q, q, qCompare } from '../engine/symbolic/rational';
import { CompareJob, KinksJob, isDataJob } from './contract';
import { checkParameterName, parseAffine, parseDefinitions, parseGammaProduct } from './expressions';
import { FlowCalcJob, isFlowJob } from './flowJobs';
import { JOB_LIMITS, MAX_FIELDS, RESULT_LIMITS } from './contract';
import { CalcJob, PadeJob, SERIES_QUANTITIES } from './contract';

/**
 * Engine time is estimated in units of about one millisecond on the development machine (2 cores,
 * Node 20), from measured runs (docs/engine.md, "Work limits"): a job over `maxUnits` is refused before it starts.
 */
export const COST_LIMITS = {
  maxUnits: 45_000,
  /** Derivation of a flow at two loops: units × fields² × couplings² × (1 + digits/50). */
  derivationUnit: 6,
  /**
   * A three-loop derivation of a custom model against a two-loop one (measured 0.22 s → 4.0 s for four
   * fields and four couplings at 30 digits, i.e. 18×; the formula then over-estimates that model 7×).
   */
  threeLoopFactor: 18,
  /**
   * Three-loop derivations of the presets at 30 digits, units × (1 + digits/50)/1.6 (measured 0.5–0.9 s for
   * O(n) with n ≤ 6 and cubic(3), 3.5 s for cubic(6) with its 21×21 quadratic-operator matrix, 1.2 s for O(N)
   * and 3.8–5.3 s for cubic(N) symbolic in N; tests/bench/flow.bench.ts).
   */
  threeLoopPresetUnits: { on: 1_000, onSymbolic: 1_500, cubic: 4_000, cubicSymbolic: 6_000 },
  /**
   * One value of the tetrahedron period P(s) (three loops at a numeric s < 2): units × (1 + digits/30)^4
   * (measured about 0.1 s at 30 digits, 1.3 s at 100, 20 s at 200; docs/tetrahedron.md).
   */
  tetrahedronUnit: 6,
  /** One scan point of a one-coupling model, per quantity: units × (1 + digits/30). */
  seriesPointUnit: 0.4,
  /** One scan point (or one fixed-point search) of the cubic model: units × fields² × (1 + digits/60). */
  presetPointUnit: 3,
  /** One scan point (or one fixed-point search) of a custom model: units × couplings² × (1 + digits/60). */
  customPointUnit: 40,
  /** One Padé variant at one point of a comparison or an exponents job, with its pole check: units × (1 + digits/30). */
  padePointUnit: 0.05,
  /**
   * The pade job: units × M³ × (1 + digits/54)² per approximant [L/M] (its linear solve; measured 36 s
   * for the 861 approximants of 41 coefficients at 292 digits, 3.3 s at 50 digits), twice with "at" (the check solves again).
   */
  padeSolveUnit: 1.5e-4,
  /**
   * One Padé–Borel Laplace integral (double-exponential quadrature, nodes cached): units × (1 + digits/30)²
   * (measured 3 ms at 30 digits, 190 ms at 200 digits), and once per precision the quadrature nodes:
   * borelNodeUnit × (1 + digits/30)^2.3 (measured 0.12 s at 30 digits, 7 s at 200 digits).
   */
  borelIntegralUnit: 3,
  borelNodeUnit: 100,
  /** One smoothing-spline fit of the kink locator, per data point and curvature grid point (the grid has 4 per point, 2000 to 20 000). */
  kinkFitUnit: 0.001,
} as const;

/**
 * Characters of result JSON per scan point: s and ε are written to `digits` digits (as every value is),
 * each quantity has a value and a Padé value; about 20 characters of quotes, key and sign per number.
 * An upper bound by about 10 % of measured scans (1000 points × 6 quantities × 200 digits: 2.83 MB).
 */
const SCAN_RESULT = { perNumberOverhead: 20, perPointOverhead: 80, perPointSeveralCouplings: 60, fixedOverhead: 1_000 } as const;
/** Results of jobs other than scans are bounded by their digits × terms; this covers their text around the numbers. */
const OTHER_RESULT_OVERHEAD = 20_000;
/** Characters of a Padé entry around its numbers (keys, brackets, flags), and per number beyond its digits (quotes, sign, point, exponent). */
const PADE_RESULT = { perEntryOverhead: 120, perNumberOverhead: 10 } as const;

/** Every [L/M] of a pade job: the one it names, or the full table (every L + M ≤ coefficients − 1). */
function padeDegrees(job: PadeJob): { L: number; M: number }[] {
  if (job.L !== undefined && job.M !== undefined) return [{ L: job.L, M: job.M }];
  const degrees: { L: number; M: number }[] = [];
  for (let total = 0; total < job.coeffs.length; total++) for (let M = 0; M <= total; M++) degrees.push({ L: total - M, M });
  return degrees;
}

/** Characters of a pade job's result: each entry's numerator and denominator (L + M + 2 numbers), its value and up to M poles. */
export function padeResultBytes(job: PadeJob): number {
  const perNumber = job.digits + PADE_RESULT.perNumberOverhead;
  return padeDegrees(job).reduce((sum, { L, M }) => sum + PADE_RESULT.perEntryOverhead + (L + 2 * M + 3) * perNumber, 0);
}

function padeUnits(job: PadeJob): number {
  const solves = padeDegrees(job).reduce((sum, { M }) => sum + M ** 3, 0);
  return COST_LIMITS.padeSolveUnit * solves * (1 + job.digits / 54) ** 2 * (job.at === undefined ? 1 : 2);
}

/** [L/M] with M ≥ 1 and L + M ≤ order: the checked Padé table of one series (docs/physics.md §9). */
export function padeTableEntries(order: number): number {
  return (order * (order + 1)) / 2;
}

/**
 * Characters of a comparison's result: per curve point s, x, ε and one value per variant; per data point
 * its own text (x, y, errors as given), s, and the series, residual and pull (with errors) per variant.
 */
export function compareResultBytes(job: CompareJob): number {
  const perNumber = job.digits + 17;
  const variants = job.loops + padeTableEntries(job.loops);
  const withErrors = !!(job.data.yErrLow || job.data.yErrHigh);
  const given = [job.data.x, job.data.y, job.data.yErrLow ?? [], job.data.yErrHigh ?? []].reduce((sum, column) => sum + column.reduce((n, text) => n + text.length, 0), 0);
  const curve = job.s.points * ((3 + variants) * perNumber + SCAN_RESULT.perPointOverhead);
  const data = job.data.x.length * ((1 + (withErrors ? 3 : 2) * variants) * perNumber + 2 * SCAN_RESULT.perPointOverhead) + given;
  return SCAN_RESULT.fixedOverhead + curve + data;
}

export function scanResultBytes(points: number, quantities: number, digits: number, severalCouplings: boolean): number {
  const perNumber = digits + SCAN_RESULT.perNumberOverhead;
  const perPoint = (2 + 2 * quantities) * perNumber + SCAN_RESULT.perPointOverhead + (severalCouplings ? SCAN_RESULT.perPointSeveralCouplings : 0);
  return SCAN_RESULT.fixedOverhead + points * perPoint;
}

/** About how many characters of JSON a job's result will take, read off its fields (an upper estimate for scans). */
export function estimatedResultBytes(job: unknown): number {
  if (Array.isArray(job)) return job.reduce((sum: number, one) => sum + estimatedResultBytes(one), 0);
  const scan = FlowCalcJob.safeParse(job);
  if (scan.success && scan.data.job === 'scan') {
    const severalCouplings = scan.data.model.preset !== 'on';
    return scanResultBytes(scan.data.s.points, scan.data.quantities.length, scan.data.digits, severalCouplings);
  }
  const compare = CompareJob.safeParse(job);
  if (compare.success) return compareResultBytes(compare.data);
  const pade = PadeJob.safeParse(job);
  if (pade.success) return padeResultBytes(pade.data);
  return OTHER_RESULT_OVERHEAD + 2 * estimatedWork(job);
}

export const megabytes = (bytes: number) => `${(bytes / 1e6).toFixed(bytes < 10e6 ? 1 : 0)} MB`;

const seconds = (units: number) => `${Math.max(1, Math.round(units / 1000))} s`;

/** Why a series expansion is too large to start, or null: the same rule for the cost check and the runner. */
export function seriesWorkProblem(factors: GammaFactor[], order: number, at: Record<string, string> | undefined, digits: number = JOB_LIMITS.defaultSeriesDigits): string | null {
  if (at === undefined) {
    const depth = order - totalLeadingPower(symbolicContext(), factors);
    if (depth > JOB_LIMITS.maxSymbolicDepth) return `symbolic expansions are limited to ${JOB_LIMITS.maxSymbolicDepth} terms beyond the leading power (asked ${depth}); reduce the order`;
    if (factors.length * Math.max(1, depth) > JOB_LIMITS.maxSymbolicFactorsTimesDepth) {
      return `symbolic expansion of ${factors.length} Γ factors to ${depth} terms is too large (factors × terms ≤ ${JOB_LIMITS.maxSymbolicFactorsTimesDepth}); expand at a numeric point with "at", or reduce the order`;
    }
    return null;
  }
  const values = parameterValues(at);
  const depth = order - totalLeadingPower(numericContext(values, digits), factors);
  if (depth > JOB_LIMITS.maxNumericDepth) return `numeric expansions are limited to ${JOB_LIMITS.maxNumericDepth} terms beyond the leading power (asked ${depth}); reduce the order`;
  if (digits * (depth + 1) > JOB_LIMITS.maxDigitsTimesTerms) return `digits × terms = ${digits * (depth + 1)} exceeds ${JOB_LIMITS.maxDigitsTimesTerms}; reduce the digits or the order`;
  const work = digits * (depth + 1) * factors.length;
  if (work > JOB_LIMITS.maxNumericWork) return `digits × terms × Γ factors = ${work} exceeds ${JOB_LIMITS.maxNumericWork}; reduce the digits, the order or the number of Γ factors`;
  return null;
}

/** Parameter values of a job's "at", by name; names every object carries are refused. */
export function parameterValues(at: Record<string, string>): Record<string, Q> {
  const values: Record<string, Q> = Object.create(null);
  for (const [name, text] of Object.entries(at)) {
    checkParameterName(name);
    if (name === 'eps' || name === 'd') throw new EngineError('invalid', `"at" may not assign ${name}`);
    values[name] = toExactRational(text);
  }
  return values;
}

function totalLeadingPower<C>(ctx: ExpansionContext<C>, factors: GammaFactor[]): number {
  return factors.reduce((s, f) => s + leadingPower(ctx as ExpansionContext<unknown>, f), 0);
}

export function specialWorkProblem(digits: number, order: number): string | null {
  return digits * (order + 1) > JOB_LIMITS.maxDigitsTimesTerms * 4 ? `digits × (order+1) = ${digits * (order + 1)} exceeds ${JOB_LIMITS.maxDigitsTimesTerms * 4}; reduce the digits or the order` : null;
}

export function padeWorkProblem(digits: number, coefficients: number): string | null {
  return digits * coefficients > JOB_LIMITS.maxDigitsTimesTerms ? `digits × coefficients = ${digits * coefficients} exceeds ${JOB_LIMITS.maxDigitsTimesTerms}; reduce the digits or the number of coefficients` : null;
}

/** digits × terms a job asks for, read off its fields before parsing (a rough upper bound). */
export function estimatedWork(job: unknown): number {
  if (typeof job !== 'object' || job === null) return 0;
  const { digits, order, coeffs, points } = job as { digits?: unknown; order?: unknown; coeffs?: unknown; points?: unknown };
  const d = typeof digits === 'number' ? digits : JOB_LIMITS.defaultSeriesDigits;
  const terms = typeof order === 'number' ? Math.max(1, order + 1) : Array.isArray(coeffs) ? coeffs.length : 1;
  const scanPoints = typeof points === 'number' ? points : 1;
  return d * terms * scanPoints;
}

export function batchWorkProblem(jobs: unknown[]): string | null {
  if (jobs.length > JOB_LIMITS.maxBatch) return `at most ${JOB_LIMITS.maxBatch} jobs per call; split the batch`;
  const work = jobs.reduce((sum: number, job) => sum + estimatedWork(job), 0);
  if (work > JOB_LIMITS.maxBatchWork) return `the batch asks for digits × terms = ${work} in all (at most ${JOB_LIMITS.maxBatchWork}); split it into smaller calls`;
  return null;
}

/**
 * Why a job (or a batch of jobs) would take too long to run, naming the input to reduce; null when it
 * is within the limits or is not a valid job at all (the job schema reports that). Runs in well under a
 * millisecond for ordinary jobs and in a few milliseconds for a custom potential (which is bounded before expansion).
 */
export function jobCostProblem(job: unknown): string | null {
  try {
    if (Array.isArray(job)) return batchWorkProblem(job) ?? job.reduce<string | null>((found, one, i) => found ?? prefixed(`job ${i + 1}`, jobCostProblem(one)), null);
    if (isFlowJob(job)) return flowCostProblem(job);
    if (isDataJob(job)) return dataCostProblem(job);
    return calcCostProblem(job);
  } catch (error) {
    // a limit met while reading the job (an expression or potential that grows too large) is a cost problem; other errors are the runner's to report
    if (error instanceof EngineError && error.code === 'limit') return error.message;
    if (error instanceof EngineError) return null;
    throw error;
  }
}

const prefixed = (where: string, problem: string | null) => (problem ? `${where}: ${problem}` : null);

function calcCostProblem(input: unknown): string | null {
  const parsed = CalcJob.safeParse(input);
  if (!parsed.success) return null;
  const job = parsed.data;
  switch (job.job) {
    case 'special':
      return specialWorkProblem(job.digits, job.order ?? 0);
    case 'pade':
      return padeJobProblem(job);
    case 'laurent': {
      const { factors } = parseGammaProduct(job.expr, parseDefinitions(job.d));
      return seriesWorkProblem(factors, job.order, job.at, job.digits);
    }
    case 'bubble': {
      const d = parseAffine(job.d);
      return seriesWorkProblem(bubbleFactors(parseAffine(job.a, { d }), parseAffine(job.b, { d }), d), job.order, job.at, job.digits);
    }
    case 'fourier': {
      const d = parseAffine(job.d);
      return seriesWorkProblem(fourierPowerFactors(parseAffine(job.a, { d }), d).factors, job.order, job.at, job.digits);
    }
    case 'startriangle': {
      const d = parseAffine(job.d);
      const deltas = job.deltas.map((t) => parseAffine(t, { d })) as [Affine, Affine, Affine];
      return seriesWorkProblem(starTriangleFactors(deltas, d).factors, job.order, job.at, job.digits);
    }
  }
}

/** Why a pade job is too large to start, or null: the same rule for the cost check and the runner. */
export function padeJobProblem(job: PadeJob): string | null {
  return padeWorkProblem(job.digits, job.coeffs.length) ?? padeTableProblem(job);
}

function padeTableProblem(job: PadeJob): string | null {
  const what = job.L === undefined ? `the full Padé table of ${job.coeffs.length} coefficients (${padeDegrees(job).length} approximants) at ${job.digits} digits` : `[${job.L}/${job.M}] at ${job.digits} digits`;
  const bytes = padeResultBytes(job);
  if (bytes > RESULT_LIMITS.maxResultBytes) return `${what} would take about ${megabytes(bytes)}, over the limit of ${megabytes(RESULT_LIMITS.maxResultBytes)} per result; give L and M, or reduce the digits or the number of coefficients`;
  const units = padeUnits(job);
  if (units <= COST_LIMITS.maxUnits) return null;
  return `${what} — about ${seconds(units)} of engine time, over the limit of about ${seconds(COST_LIMITS.maxUnits)}; give L and M, or reduce the digits or the number of coefficients`;
}

/** Fields and couplings of a job's model (a custom potential is read, within its own bounds, to count them). */
interface ModelSize {
  fields: number;
  couplings: number;
  custom: boolean;
  preset: 'on' | 'cubic' | 'custom';
  /** N symbolic or not a whole number of fields (the symbolic-N family) */
  symbolicN: boolean;
  label: string;
}

function modelSize(model: FlowCalcJob['model'] | CompareJob['model']): ModelSize {
  if (model.preset === 'custom') {
    const built = customModel(model.fields, model.potential);
    return { fields: model.fields, couplings: built.couplings.length, custom: true, preset: 'custom', symbolicN: false, label: `a ${model.fields}-field model with ${built.couplings.length} couplings` };
  }
  // integer N from 1 to MAX_FIELDS use explicit tensors; symbolic and any other N the symbolic-N family (sized as one field)
  const n = model.N === 'N' ? NaN : Number(model.N);
  const explicit = Number.isInteger(n) && n >= 1 && n <= MAX_FIELDS;
  const fields = explicit ? n : 1;
  const couplings = model.preset === 'cubic' && fields > 1 ? 2 : 1;
  return { fields, couplings, custom: false, preset: model.preset, symbolicN: !explicit, label: `the ${model.preset === 'on' ? 'O' : 'cubic'}(${model.N}) model` };
}

function derivationUnits(size: ModelSize, loops: number, digits: number): number {
  if (loops >= 3 && size.preset !== 'custom') {
    const table = COST_LIMITS.threeLoopPresetUnits;
    const units = size.preset === 'on' ? (size.symbolicN ? table.onSymbolic : table.on) : size.symbolicN ? table.cubicSymbolic : table.cubic;
    return (units * (1 + digits / 50)) / 1.6;
  }
  const perLoop = loops >= 3 ? COST_LIMITS.threeLoopFactor : loops === 2 ? 1 : 0.2;
  return COST_LIMITS.derivationUnit * perLoop * size.fields ** 2 * size.couplings ** 2 * (1 + digits / 50);
}

/**
 * The tetrahedron period at one numeric s (three loops only; s = 2 is exact and symbolic s keeps it as a
 * symbol). Below s = 1/3 it carries (1 − 3s)/(1 + 3s) more bits (docs/tetrahedron.md), charged as digits.
 */
function periodUnits(loops: number, digits: number, smallestS: string): number {
  if (loops < 3) return 0;
  const s = Number(smallestS);
  const growth = 3 * s < 1 ? (1 - 3 * s) / (1 + 3 * s) : 0;
  return COST_LIMITS.tetrahedronUnit * (1 + (digits * (1 + growth)) / 30) ** 4;
}

/** The smaller end of a range of s. */
const smallest = (range: { from: string; to: string }) => (Number(range.from) < Number(range.to) ? range.from : range.to);

const isTwo = (text: string) => qCompare(toExactRational(text), q(2)) === 0;

/** A numeric fixed-point search at one ε (every scan point of a model with several couplings). */
function numericPointUnits(size: ModelSize, digits: number): number {
  const perPoint = size.custom ? COST_LIMITS.customPointUnit * size.couplings ** 2 : COST_LIMITS.presetPointUnit * size.fields ** 2;
  return perPoint * (1 + digits / 60);
}

function flowCostProblem(input: unknown): string | null {
  const parsed = FlowCalcJob.safeParse(input);
  if (!parsed.success) return null;
  const job = parsed.data;
  const size = modelSize(job.model);
  const derivation = derivationUnits(size, job.loops, job.digits);
  let units = derivation + ('s' in job && typeof job.s === 'string' && !isTwo(job.s) ? periodUnits(job.loops, job.digits, job.s) : 0);
  let asked = `deriving the flow of ${size.label} at ${job.loops} loops and ${job.digits} digits`;
  let reduce = 'digits, loops or the number of couplings';
  if (job.job === 'fixedpoints' || job.job === 'exponents') {
    units += 10 * numericPointUnits(size, job.digits) + (job.job === 'exponents' ? padeTableUnits(job.loops, job.digits) : 0);
    asked = `the fixed points of ${size.label} at ${job.loops} loops and ${job.digits} digits`;
  }
  if (job.job === 'scan') {
    const points = job.s.points;
    const quantities = job.quantities.length;
    const resultBytes = scanResultBytes(points, quantities, job.digits, size.couplings > 1);
    if (resultBytes > RESULT_LIMITS.maxResultBytes) {
      return `this scan's result would take about ${megabytes(resultBytes)} (${points} points × ${quantities} quantities × ${job.digits} digits), over the limit of ${megabytes(RESULT_LIMITS.maxResultBytes)} per result; reduce points, quantities or digits`;
    }
    units +=
      points * periodUnits(job.loops, job.digits, smallest(job.s)) +
      (size.couplings > 1
        ? points * (numericPointUnits(size, job.digits) + COST_LIMITS.seriesPointUnit * quantities * (1 + job.digits / 30))
        : points * COST_LIMITS.seriesPointUnit * quantities * (1 + job.digits / 30));
    if (reachesShortRange(job.s)) units += shortRangePointUnits(size, job.loops, job.digits);
    asked = `this scan asks for ${points} points × ${quantities} quantities × ${job.digits} digits with ${size.label}`;
    reduce = 'points, quantities, digits or the number of couplings';
  }
  if (units <= COST_LIMITS.maxUnits) return null;
  return `${asked} — about ${seconds(units)} of engine time, over the limit of about ${seconds(COST_LIMITS.maxUnits)}; reduce ${reduce}`;
}

/** Every quantity's checked Padé table and Padé–Borel sums at one point (the exponents job, a scan's s = 2 point). */
function padeTableUnits(loops: number, digits: number): number {
  const pade = SERIES_QUANTITIES.length * padeTableEntries(loops) * COST_LIMITS.padePointUnit * (1 + digits / 30);
  // Borel–Padé [L/M] with M ≥ 1 and L + M = loops: `loops` integrals per quantity
  const borel = SERIES_QUANTITIES.length * loops * COST_LIMITS.borelIntegralUnit * (1 + digits / 30) ** 2 + COST_LIMITS.borelNodeUnit * (1 + digits / 30) ** 2.3;
  return pade + borel;
}

/** s ≤ 2 in every scan, so the range holds s = 2 exactly when one of its ends is 2. */
function reachesShortRange(range: { from: string; to: string }): boolean {
  return isTwo(range.from) || isTwo(range.to);
}

/** s = 2 is computed like an exponents job: its own flow derived at s = 2, the fixed points there, the Padé tables. */
function shortRangePointUnits(size: ModelSize, loops: number, digits: number): number {
  return derivationUnits(size, loops, digits) + 10 * numericPointUnits(size, digits) + padeTableUnits(loops, digits);
}

/** A spline fit per resample plus the first, each over the data points and the curvature grid. */
function kinkUnits(points: number, resamples: number | undefined): number {
  const grid = Math.min(20_000, Math.max(2_000, 4 * points));
  return COST_LIMITS.kinkFitUnit * (points + grid) * ((resamples ?? JOB_LIMITS.defaultResamples) + 1);
}

function dataCostProblem(input: unknown): string | null {
  const kinks = KinksJob.safeParse(input);
  if (kinks.success) {
    const units = kinkUnits(kinks.data.points.length, kinks.data.resamples);
    if (units <= COST_LIMITS.maxUnits) return null;
    return `locating kinks in ${kinks.data.points.length} points with ${kinks.data.resamples ?? JOB_LIMITS.defaultResamples} resamples would take about ${seconds(units)} of engine time, over the limit of about ${seconds(COST_LIMITS.maxUnits)}; reduce the points or the resamples`;
  }
  const parsed = CompareJob.safeParse(input);
  if (!parsed.success) return null;
  return compareCostProblem(parsed.data);
}

function compareCostProblem(job: CompareJob): string | null {
  const size = modelSize(job.model);
  const points = job.s.points + job.data.x.length;
  const resultBytes = compareResultBytes(job);
  if (resultBytes > RESULT_LIMITS.maxResultBytes) {
    return `this comparison's result would take about ${megabytes(resultBytes)} (${job.s.points} curve points and ${job.data.x.length} data points at ${job.digits} digits), over the limit of ${megabytes(RESULT_LIMITS.maxResultBytes)} per result; reduce the scan's points, the data's x-range or the digits`;
  }
  const padeVariants = padeTableEntries(job.loops);
  const series = COST_LIMITS.seriesPointUnit * (1 + job.digits / 30) + COST_LIMITS.padePointUnit * padeVariants * (1 + job.digits / 30);
  const perPoint = (size.couplings > 1 ? numericPointUnits(size, job.digits) + series : series) + periodUnits(job.loops, job.digits, smallest(job.s));
  const units = derivationUnits(size, job.loops, job.digits) + points * perPoint + (job.data.boundary ? kinkUnits(job.data.x.length, undefined) : 0);
  if (units <= COST_LIMITS.maxUnits) return null;
  return `this comparison evaluates ${size.label} at ${points} values of s (${job.s.points} curve points and ${job.data.x.length} data points) at ${job.digits} digits — about ${seconds(units)} of engine time, over the limit of about ${seconds(COST_LIMITS.maxUnits)}; reduce the scan's points, the data's x-range, the digits or the number of couplings`;
}
