import { z } from 'zod';
import {
  type Affine,
  EngineError,
  type ExpansionContext,
  type Expression,
  type GammaFactor,
  type LaurentSeries,
  type PadeApproximant,
  type Q,
  type Real,
  affineToString,
  bubbleFactors,
  checkedPade,
  expressionToLatex,
  expressionToString,
  fourierPowerFactors,
  gammaProductSeries,
  leadingPower,
  numericContext,
  padeApproximant,
  polesInInterval,
  q,
  realContext,
  special,
  starTriangleFactors,
  symbolicContext,
  toExactRational,
} from '../engine/index';
import { batchWorkProblem, padeJobProblem, parameterValues, seriesWorkProblem, specialWorkProblem } from './cost';
import { parseAffine, parseDefinitions, parseGammaProduct } from './expressions';
import { runDataJob } from './dataJobs';
import { runFlowJob, type JobHooks } from './flowJobs';
import {
  type AnyJob,
  type BubbleJob,
  type CalcJob,
  type FourierJob,
  JOBS,
  JOB_LIMITS,
  type JobError,
  type LaurentJob,
  type PadeEntry,
  type PadeJob,
  type PadeResult,
  type ResultOf,
  type JobKind,
  type SeriesResult,
  type SpecialJob,
  type SpecialResult,
  type StarTriangleJob,
  jobKindOf,
  unknownJobMessage,
} from './contract';

type ErrorCode = JobError['error']['code'];

export function jobError(code: ErrorCode, message: string): JobError {
  return { error: { code, message } };
}

export function isJobError(r: unknown): r is JobError {
  return typeof r === 'object' && r !== null && 'error' in r;
}

/** What a job answers: its kind's result (JOBS[kind].result) or JobError. */
export type JobOutput = ResultOf<JobKind> | JobError;

/**
 * Validate a job against the contract (JOBS[kind].input) and run it. Never throws: failures come back
 * as `{error:{code,message}}`; a job naming no known kind gets a message listing every kind.
 */
export function runJob(input: unknown, hooks: JobHooks = {}): JobOutput {
  const kind = jobKindOf(input);
  if (kind === null) return jobError('invalid-job', unknownJobMessage(input));
  const parsed = JOBS[kind].input.safeParse(input);
  if (!parsed.success) return jobError('invalid-job', z.prettifyError(parsed.error));
  const job = parsed.data as AnyJob;
  switch (job.job) {
    case 'flow':
    case 'fixedpoints':
    case 'exponents':
    case 'scan':
      return runFlowJob(job, hooks) as JobOutput;
    case 'kinks':
    case 'compare':
      return runDataJob(job, hooks) as JobOutput;
    default:
      return runCalcJob(job);
  }
}

/** One job or an array of jobs (results in the same order). */
export function runBatch(input: unknown): JobOutput | JobOutput[] {
  if (Array.isArray(input)) {
    const problem = batchWorkProblem(input);
    if (problem) return jobError('limit', problem);
    return input.map((job) => runJob(job));
  }
  return runJob(input);
}

function runCalcJob(job: CalcJob): JobOutput {
  try {
    return dispatch(job);
  } catch (e) {
    if (e instanceof EngineError) return jobError(e.code === 'invalid' ? 'invalid-job' : e.code, e.message);
    if (e instanceof RangeError) return jobError('limit', `computation exceeded a limit: ${e.message}`);
    return jobError('internal', `internal error: ${(e as Error)?.message ?? String(e)}`);
  }
}

function dispatch(job: CalcJob): SpecialResult | SeriesResult | PadeResult {
  switch (job.job) {
    case 'special':
      return runSpecial(job);
    case 'laurent':
      return runLaurent(job);
    case 'bubble':
      return runBubble(job);
    case 'fourier':
      return runFourier(job);
    case 'startriangle':
      return runStarTriangle(job);
    case 'pade':
      return runPade(job);
  }
}

function limit(message: string): never {
  throw new EngineError('limit', message);
}

// ---- special ----------------------------------------------------------------------------------

function runSpecial(job: SpecialJob): SpecialResult {
  const x = toExactRational(job.x);
  if (Math.abs(Number(x.num) / Number(x.den)) > JOB_LIMITS.maxAbsArgument) limit(`|x| must be at most ${JOB_LIMITS.maxAbsArgument}`);
  if (job.order !== undefined && job.fn !== 'psi') throw new EngineError('invalid', '"order" applies only to fn "psi"');
  const order = job.order ?? 0;
  const problem = specialWorkProblem(job.digits, order);
  if (problem) limit(problem);
  let value: Real;
  switch (job.fn) {
    case 'gamma':
      value = special.gamma(x, job.digits);
      break;
    case 'lngamma':
      // ln|Γ(x)| alone loses the sign of Γ for negative x; the pole check in lnGamma runs first
      value = special.lnGamma(x, job.digits);
      return { value: formatReal(value, job.digits), sign: special.gammaSign(x) };
    case 'psi':
      value = special.polygamma(order, x, job.digits);
      break;
    case 'zeta':
      value = special.zeta(x, job.digits);
      break;
  }
  return { value: formatReal(value, job.digits) };
}

export function formatReal(v: Real, digits: number): string {
  return v.isZero() ? '0' : v.toPrecision(digits);
}

// ---- series -----------------------------------------------------------------------------------

interface SeriesSpec {
  factors: GammaFactor[];
  prefactor: Q;
  order: number;
  at?: Record<string, string>;
  digits?: number;
  powers?: { piExponent: Affine; twoExponent?: Affine };
}

function runLaurent(job: LaurentJob): SeriesResult {
  const defs = parseDefinitions(job.d);
  const { prefactor, factors } = parseGammaProduct(job.expr, defs);
  return expandSeries({ factors, prefactor, order: job.order, at: job.at, digits: job.digits });
}

function runBubble(job: BubbleJob): SeriesResult {
  const d = parseAffine(job.d);
  const factors = bubbleFactors(parseAffine(job.a, { d }), parseAffine(job.b, { d }), d);
  return expandSeries({ factors, prefactor: q(1), order: job.order, at: job.at, digits: job.digits });
}

function runFourier(job: FourierJob): SeriesResult {
  const d = parseAffine(job.d);
  const { factors, piExponent, twoExponent } = fourierPowerFactors(parseAffine(job.a, { d }), d);
  return expandSeries({ factors, prefactor: q(1), order: job.order, at: job.at, digits: job.digits, powers: { piExponent, twoExponent } });
}

function runStarTriangle(job: StarTriangleJob): SeriesResult {
  const d = parseAffine(job.d);
  const deltas = job.deltas.map((t) => parseAffine(t, { d })) as [Affine, Affine, Affine];
  const { factors, piExponent } = starTriangleFactors(deltas, d);
  return expandSeries({ factors, prefactor: q(1), order: job.order, at: job.at, digits: job.digits, powers: { piExponent } });
}

function expandSeries(spec: SeriesSpec): SeriesResult {
  const prefactorOut = spec.powers
    ? { piExponent: affineToString(spec.powers.piExponent), ...(spec.powers.twoExponent ? { twoExponent: affineToString(spec.powers.twoExponent) } : {}) }
    : undefined;
  const withPrefactor = (r: Omit<SeriesResult, 'prefactor'>): SeriesResult => (prefactorOut ? { ...r, prefactor: prefactorOut } : r);
  const digits = spec.digits ?? JOB_LIMITS.defaultSeriesDigits;
  const problem = seriesWorkProblem(spec.factors, spec.order, spec.at, digits);
  if (problem) limit(problem);
  if (spec.at === undefined) {
    const ctx = symbolicContext();
    const series = gammaProductSeries(ctx, spec.factors, spec.order, spec.prefactor);
    return withPrefactor(symbolicResult(series));
  }
  const values = parameterValues(spec.at);
  const series = verifiedNumericSeries(digits, (work) => gammaProductSeries(numericContext(values, work), spec.factors, spec.order, spec.prefactor));
  return withPrefactor(series);
}

function totalLeadingPower<C>(ctx: ExpansionContext<C>, factors: GammaFactor[]): number {
  return factors.reduce((s, f) => s + leadingPower(ctx as ExpansionContext<unknown>, f), 0);
}

function symbolicResult(series: LaurentSeries<Expression>): Omit<SeriesResult, 'prefactor'> {
  return {
    lowest: series.lowest,
    order: series.order,
    coeffs: series.coefficients().map((c) => ({ expr: expressionToString(c), latex: expressionToLatex(c) })),
  };
}

/**
 * Compute at two working precisions and keep only digits on which they agree: a coefficient is
 * printed with `digits` significant digits when the estimated error of the finer run is below
 * 1/20 of its last digit, "0" when it is indistinguishable from zero; otherwise precision is raised.
 */
function verifiedNumericSeries(digits: number, compute: (workDigits: number) => LaurentSeries<Real>): Omit<SeriesResult, 'prefactor'> {
  let coarseGuard = 10;
  let fineGuard = 30;
  for (let attempt = 0; attempt < 4; attempt++) {
    const coarse = compute(digits + coarseGuard);
    const fine = compute(digits + fineGuard);
    const R = realContext(digits + fineGuard + 5);
    const ratio = new R(10).pow(coarseGuard - fineGuard);
    const out: string[] = [];
    let ok = true;
    const fc = fine.coefficients();
    const cc = coarse.coefficients();
    const scale = fc.reduce((m, c) => (c.abs().gt(m) ? c.abs() : m), new R(0));
    for (let i = 0; i < fc.length; i++) {
      const f = new R(fc[i]);
      const error = f.minus(cc[i]).abs().times(ratio);
      const noiseFloor = new R(10).pow(-(digits + fineGuard - 3)).times(scale.isZero() ? 1 : scale);
      if (f.abs().lte(error.times(10)) || f.abs().lte(noiseFloor)) {
        out.push('0');
        continue;
      }
      const ulp = new R(10).pow(f.e - (digits - 1));
      if (error.gt(ulp.div(20))) {
        ok = false;
        break;
      }
      out.push(formatReal(new (realContext(digits))(f).toSignificantDigits(digits), digits));
    }
    if (ok) return { lowest: fine.lowest, order: fine.order, coeffs: out };
    coarseGuard = fineGuard;
    fineGuard *= 2;
  }
  return limit('could not reach the requested digits (severe cancellation)');
}

// ---- pade ---------------------------------------------------------------------------------------

function runPade(job: PadeJob): PadeResult {
  const n = job.coeffs.length - 1;
  if ((job.L === undefined) !== (job.M === undefined)) throw new EngineError('invalid', 'give both L and M, or neither for the full table');
  const problem = padeJobProblem(job);
  if (problem) limit(problem);
  if (job.L !== undefined && job.M !== undefined) return padeEntry(job, padeApproximant(job.coeffs, job.L, job.M, job.digits));
  const table: PadeEntry[] = [];
  for (let total = 0; total <= n; total++) {
    for (let M = 0; M <= total; M++) table.push(tableEntry(job, total - M, M));
  }
  return { table };
}

/** In the full table a degenerate [L/M] is one flagged entry, not a failure of the whole job. */
function tableEntry(job: PadeJob, L: number, M: number): PadeEntry {
  try {
    return padeEntry(job, padeApproximant(job.coeffs, L, M, job.digits));
  } catch (e) {
    if (!(e instanceof EngineError) || e.code !== 'singular') throw e;
    return { L, M, poles: [], flagged: true, reason: e.message };
  }
}

/**
 * An approximant with its checks (docs/physics.md §9): at `at` by checkedPade (a pole between 0 and
 * at, a sign change of the denominator), over `interval` by its poles there. Flagged entries get no value.
 */
function padeEntry(job: PadeJob, approximant: PadeApproximant): PadeEntry {
  const { L, M } = approximant;
  const checked = job.at === undefined ? null : checkedPade(job.coeffs, L, M, job.at, job.digits);
  const inInterval = job.interval ? polesInInterval(approximant, job.interval[0], job.interval[1], job.digits) : [];
  const reasons = [checked?.reason, inInterval.length ? `${inInterval.length > 1 ? 'poles' : 'pole'} inside the interval at ${inInterval.map(shortNumber).join(', ')}` : null];
  const flagged = inInterval.length > 0 || !!checked?.flagged;
  const entry: PadeEntry = {
    L,
    M,
    numerator: approximant.numerator.map((c) => formatPadeCoefficient(c, job.digits)),
    denominator: approximant.denominator.map((c) => formatPadeCoefficient(c, job.digits)),
    poles: [...new Set(sortedReals([...(checked?.poles ?? []), ...inInterval]).map((p) => formatReal(p, job.digits)))],
    flagged,
  };
  if (checked) entry.signChange = checked.signChange;
  if (flagged) entry.reason = reasons.filter((r) => !!r).join('; ');
  else if (checked?.value) entry.value = formatReal(checked.value, job.digits);
  return entry;
}

const shortNumber = (x: Real) => new (realContext(6))(x).toSignificantDigits(6).toString();
const sortedReals = (values: Real[]) => [...values].sort((a, b) => a.comparedTo(b));

function formatPadeCoefficient(c: Real, digits: number): string {
  return formatReal(new (realContext(digits))(c).toSignificantDigits(digits), digits);
}
