import { z } from 'zod';
import { ConsistencyError } from '../engine/diagrams/subtraction';
import { type DerivedFlow, type TrailEntry } from '../engine/diagrams/renormalization';
import { quadraticAtRoot, quadraticSpectrum } from '../engine/exponents/quadratic';
import { fieldAnomalousSpectrum } from '../engine/exponents/fieldMatrix';
import { exponentRegime, exponentSeriesPartial, meanFieldValues, powerCoefficients, relationsFor, SERIES_QUANTITIES, sourcesFor, type Quantity } from '../engine/exponents/exponents';
import { type PhysicalPoint, exponentsAtPoint, fieldGammaOf } from '../engine/exponents/atPoint';
import { fixedPointNotices, noSingletNotice, regimeNotices, scanNotices } from '../engine/exponents/notices';
import { crossoverFor } from '../engine/exponents/shortRange';
import { type CheckedPade } from '../engine/pade/pade';
import { BOREL_METHOD, type BorelValue } from '../engine/pade/borel';
import { type FixedPoint, baseName, findFixedPoints } from '../engine/fixedpoints/fixedPoints';
import { type ComplexReal } from '../engine/fixedpoints/complexRoots';
import { type AnyFlow, checkPropagatorPower, flowFor } from '../engine/flows/flow';
import { type CouplingPolynomial } from '../engine/models/couplingPolynomial';
import { customModel } from '../engine/models/custom';
import { type ModelSpec } from '../engine/models/model';
import { cubicFamily, onFamily, presetModel } from '../engine/models/presets';
import { type OmittedPoint, type PoleSource, omittedFixedPoints } from '../engine/flows/family';
import { EngineError, fail } from '../engine/precision/errors';
import { type Real, realContext, toExactRational } from '../engine/precision/real';
import { type ExternalPoint, type ScanPoint, meanFieldEnd, padeFields, scanSeries } from '../engine/scans/scan';
import { scanFlow } from '../engine/scans/flowScan';
import { type LaurentSeries } from '../engine/series/laurent';
import { Expression } from '../engine/symbolic/expression';
import { expressionToLatex, expressionToString } from '../engine/symbolic/format';
import { polyToString } from '../engine/symbolic/polynomial';
import { type Q, q, qAdd, qCompare, qMul, qSub, qToString } from '../engine/symbolic/rational';
import { ExponentsJob, FLOW_JOB_KINDS, FixedPointsJob, FlowJob, JOBS, type KindOf, ModelInput, ScanJob, type JobError, jobKindOf } from './contract';

type FlowJobInput = (typeof JOBS)[KindOf<'flow'>]['input'];

/** The flow jobs' inputs, read off the contract's JOBS table (family "flow"). */
export const FlowCalcJob = z.discriminatedUnion('job', FLOW_JOB_KINDS.map((kind) => JOBS[kind].input) as [FlowJobInput, ...FlowJobInput[]]);
export type FlowCalcJob = z.infer<typeof FlowCalcJob>;

/** True for a job this module runs (dispatch hook for the calc runner). */
export function isFlowJob(input: unknown): boolean {
  const kind = jobKindOf(input);
  return kind !== null && JOBS[kind].family === 'flow';
}

// ---- runner ---------------------------------------------------------------------------------------

type ErrorCode = JobError['error']['code'];
const jobError = (code: ErrorCode, message: string): JobError => ({ error: { code, message } });

/** Validate and run one flow job; never throws (errors come back as {error:{code,message}}). */
/** Optional hooks a runner may pass; the engine stays pure (it only calls what it is given). */
export interface JobHooks {
  onProgress?: (fraction: number) => void;
}

export function runFlowJob(input: unknown, hooks: JobHooks = {}): unknown {
  const parsed = FlowCalcJob.safeParse(input);
  if (!parsed.success) return jobError('invalid-job', z.prettifyError(parsed.error));
  try {
    const job = parsed.data;
    switch (job.job) {
      case 'flow':
        return runFlow(job);
      case 'fixedpoints':
        return runFixedPoints(job);
      case 'exponents':
        return runExponents(job);
      case 'scan':
        return runScan(job, hooks);
    }
  } catch (e) {
    if (e instanceof EngineError) return jobError(e.code === 'invalid' ? 'invalid-job' : e.code, e.message);
    if (e instanceof ConsistencyError) return jobError('internal', `consistency check failed: ${e.message}`);
    return jobError('internal', `internal error: ${(e as Error)?.message ?? String(e)}`);
  }
}

export function modelFrom(input: z.infer<typeof ModelInput>): ModelSpec {
  if (input.preset === 'custom') return customModel(input.fields, input.potential);
  if (input.N === 'N') return input.preset === 'on' ? onFamily : cubicFamily;
  return presetModel(input.preset, toExactRational(input.N));
}

export function exactPositive(text: string, what: string): Q {
  const v = toExactRational(text);
  if (qCompare(v, q(0)) <= 0) fail('domain', `${what} must be positive`);
  return v;
}

// ---- formatting -------------------------------------------------------------------------------------

type Coefficient = string | { expr: string; latex: string };

export function formatCoefficient(c: unknown, digits: number): Coefficient {
  if (typeof c === 'object' && c !== null && 'terms' in c && 'isZero' in c) {
    const e = c as Expression;
    return { expr: expressionToString(e), latex: expressionToLatex(e) };
  }
  const r = c as Real;
  if (r.abs().lt(new (realContext(digits + 20))(10).pow(-(digits + 10)))) return '0';
  return new (realContext(digits))(r).toSignificantDigits(digits).toString();
}

function formatSeries<C>(s: LaurentSeries<C>, digits: number): { lowest: number; coeffs: Coefficient[] } {
  return { lowest: s.lowest, coeffs: s.coefficients().map((c) => formatCoefficient(c, digits)) };
}

function monomialText(powers: readonly number[], couplings: readonly string[]): string {
  return powers.flatMap((p, k) => (p === 0 ? [] : [p === 1 ? couplings[k] : `${couplings[k]}^${p}`])).join('*') || '1';
}

function formatPolynomial<C>(p: CouplingPolynomial<C>, couplings: readonly string[], digits: number): { monomial: string; coeff: Coefficient }[] {
  return p.sortedTerms().map((t) => ({ monomial: monomialText(t.powers, couplings), coeff: formatCoefficient(t.coeff, digits) }));
}

function formatTrail<C>(entry: TrailEntry<C>, couplings: readonly string[], digits: number) {
  const sg = entry.subtracted;
  const width = entry.weightLabels ?? (entry.graph.function === 'vertex' ? couplings : ['δ_ab']);
  return {
    graph: entry.graph.id,
    title: entry.graph.title,
    function: entry.graph.function,
    loops: entry.graph.loops,
    sign: entry.sign,
    symmetryFactor: `${entry.symmetryFactor[0]}/${entry.symmetryFactor[1]}`,
    labellings: entry.labellings,
    weight: entry.weight
      ? entry.weight.terms.map((t) => ({ monomial: monomialText(t.powers, couplings), projections: Object.fromEntries(t.values.map((v, i) => [width[i], polyToString(v)])) }))
      : { note: entry.weightNote },
    integral: sg.integralLatex,
    rearrangement: sg.entry.rearrangement,
    laurent: formatSeries(sg.laurent, digits),
    counterterms: sg.counterterms.map((c) => ({ subgraph: c.title, pole: formatSeries(c.pole, digits), reduced: c.reducedLatex })),
    subtracted: formatSeries(sg.subtracted, digits),
    pole: formatSeries(sg.pole, digits),
    ...(sg.entry.note ? { note: sg.entry.note } : {}),
  };
}

function flowSummary<C>(flow: DerivedFlow<C>, digits: number) {
  const c = flow.couplings;
  return {
    couplings: c,
    loops: flow.loops,
    convention: 'β_k = −ε g_k + Σ terms; u = λ μ^{−ε}/((4π)^{d/2} Γ(s)); minimal subtraction at fixed s, d = 2s − ε',
    beta: Object.fromEntries(c.map((name, k) => [name, [{ monomial: `eps*${name}`, coeff: formatCoefficient(flow.calculus.ctx.ring.fromRational(-1n), digits) }, ...formatPolynomial(flow.beta[k], c, digits)]])),
    gamma_phi: formatPolynomial(flow.gammaPhi, c, digits),
    ...(flow.gammaPhiMatrix
      ? {
          gamma_phi_matrix: {
            convention: 'γ_φ is a matrix (field renormalization not ∝ δ_ab, φ₀ = Z_φ^{1/2} φ): entry (a,b) below; gamma_phi above is tr γ_φ / n. η = 2 − s + 2γ per eigen-direction of γ_φ at a fixed point; β_{abcd} contains Σ_legs γ_ae λ_ebcd',
            fields: flow.gammaPhiMatrix.map((_, a) => `phi${a + 1}`),
            matrix: flow.gammaPhiMatrix.map((row) => row.map((p) => formatPolynomial(p, c, digits))),
          },
        }
      : {}),
    gamma_phi2: flow.gammaPhi2 ? formatPolynomial(flow.gammaPhi2, c, digits) : { note: flow.gammaPhi2Note },
    ...(flow.quadratic
      ? {
          gamma_quadratic: {
            convention: 'γ_{(kl),(ij)}: insertion t_ij φ_iφ_j (i ≤ j) → counterterm Σ γ_{(kl),(ij)} t_ij φ_kφ_l, field renormalization included (γ_φ t + t γ_φ); Δ = d − s + eigenvalue',
            operators: flow.quadratic.pairs.map(([i, j]) => (i === j ? `phi${i + 1}^2` : `phi${i + 1}*phi${j + 1}`)),
            matrix: flow.quadratic.gamma.map((row) => row.map((p) => formatPolynomial(p, c, digits))),
          },
        }
      : {}),
    fieldRenormalization: flow.fieldRenormalized,
    checks: flow.checks,
  };
}

// ---- jobs ------------------------------------------------------------------------------------------

export function deriveFor(model: ModelSpec, s: Q | null, loops: 1 | 2 | 3, digits: number): AnyFlow {
  return flowFor({ model, s, loops, digits, poleSources: (flow) => familyPoleSources(model, flow) });
}

/** Every ε-series of every non-Gaussian fixed point of a symbolic-N family flow (a pole in N there means no data at that N). */
function familyPoleSources(model: ModelSpec, flow: DerivedFlow<Expression>): PoleSource[] {
  return findFixedPoints(model, flow, { eps: null })
    .filter((p) => p.name !== 'Gaussian')
    .map((p) => {
      const exponents = p.couplingSeries ? Object.values(exponentSeriesPartial(flow, p).series) : [];
      const series = [...(p.couplingSeries ?? []), ...(p.eigenvalueSeries ?? []).filter((e) => e !== null), ...exponents];
      return { point: p.name, coefficients: series.flatMap((e) => (e as LaurentSeries<Expression>).coefficients()) };
    });
}

function runFlow(job: z.infer<typeof FlowJob>) {
  const model = modelFrom(job.model);
  const s = job.s === undefined ? null : exactPositive(job.s, 's');
  const { flow } = deriveFor(model, s, job.loops, job.digits);
  const f = flow as DerivedFlow<unknown>;
  return { model: model.label, s: job.s ?? 's', ...flowSummary(f, job.digits), trail: f.trail.map((t) => formatTrail(t, f.couplings, job.digits)) };
}

/** s and d of a job, both optional (no s: series symbolic in s; no d: series only), checked, with ε = 2s − d. */
function expansionPoint(job: { s?: string; d?: string }): { s: Q | null; d: Q | null; eps: Q | null } {
  const s = job.s === undefined ? null : exactPositive(job.s, 's');
  if (s) checkPropagatorPower(s);
  const d = job.d === undefined ? null : toExactRational(job.d);
  if (d) checkDimension(d);
  if (d && !s) fail('invalid', 'give s together with d (the expansion is at fixed s)');
  return { s, d, eps: d && s ? physicalEps(d, s) : null };
}

function physicalEps(d: Q, s: Q): Q {
  return qSub(qMul(q(2), s), d);
}

export function checkDimension(d: Q): void {
  if (qCompare(d, q(0)) <= 0) fail('domain', 'd must be positive');
}

/** "a + bi" at `digits` significant digits (just "a" when the imaginary part is zero at that precision). */
function formatComplex(z: ComplexReal, digits: number): string {
  const size = z.re.abs().gt(z.im.abs()) ? z.re.abs() : z.im.abs();
  const R = realContext(digits + 20);
  const negligible = new R(10).pow(-(digits + 10));
  if (z.im.isZero() || new R(z.im).abs().lt(negligible) || new R(z.im).abs().lt(new R(size).times(new R(10).pow(-(digits + 2))))) return String(formatCoefficient(z.re, digits));
  const im = String(formatCoefficient(z.im.abs(), digits));
  return `${String(formatCoefficient(z.re, digits))} ${z.im.isNegative() ? '-' : '+'} ${im}i`;
}

/** A double-precision complex number at min(digits, 15) significant digits. */
function formatComplexDouble(z: { re: number; im: number }, digits: number): string {
  const p = Math.min(digits, 15);
  const text = (x: number) => String(Number(x.toPrecision(p)));
  if (Math.abs(z.im) < 1e-12 * (1 + Math.abs(z.re))) return text(z.re);
  return `${text(z.re)} ${z.im >= 0 ? '+' : '-'} ${text(Math.abs(z.im))}i`;
}

function formatFixedPoint<C>(p: FixedPoint<C>, couplings: readonly string[], digits: number) {
  return {
    name: p.name,
    status: p.status,
    couplings: Object.fromEntries(
      couplings.map((name, k) => [
        name,
        {
          series: p.couplingSeries ? p.couplingSeries[k].coefficients().map((c) => formatCoefficient(c, digits)) : null,
          value: p.couplingValues ? formatCoefficient(p.couplingValues[k], digits) : p.complexValues ? formatComplex(p.complexValues[k], digits) : p.complexCouplings ? formatComplexDouble(p.complexCouplings[k], digits) : null,
        },
      ]),
    ),
    stability: {
      series: p.eigenvalueSeries ? p.eigenvalueSeries.map((e) => (e ? e.coefficients().map((c) => formatCoefficient(c, digits)) : null)) : null,
      values: p.eigenvalueFull ? p.eigenvalueFull.map((z) => formatComplex(z, digits)) : p.eigenvalueValues ? p.eigenvalueValues.map((z) => formatComplexDouble(z, digits)) : null,
    },
    stable: p.stable,
    notes: p.notes,
    caveats: p.caveats ?? [],
  };
}

function gaussianOnly(model: ModelSpec, d: string, s: string) {
  return {
    meanField: true,
    statement: meanFieldValues(d, s).statement,
    fixedPoints: [{ name: 'Gaussian', status: 'real', couplings: Object.fromEntries(model.couplings.map((c) => [c, { series: ['0'], value: '0' }])), stability: { series: null, values: model.couplings.map(() => String(Number(d) - 2 * Number(s))) }, stable: true, notes: [], caveats: [] }],
  };
}

function runFixedPoints(job: z.infer<typeof FixedPointsJob>) {
  const model = modelFrom(job.model);
  const { s, eps } = expansionPoint(job);
  if (eps && qCompare(eps, q(0)) <= 0) return { eps: qToString(eps), ...gaussianOnly(model, job.d as string, job.s as string) };
  const any = deriveFor(model, s, job.loops, job.digits);
  const flow = any.flow as DerivedFlow<unknown>;
  const epsCoefficient = any.mode === 'numeric' && eps ? any.flow.calculus.ctx.ring.fromRational(eps.num, eps.den) : null;
  const points = findFixedPoints(model, flow, { eps: epsCoefficient });
  const quadratic = (p: FixedPoint<unknown>) => (any.mode === 'numeric' && s && !('member' in model) ? formatQuadratic(any.flow, p as FixedPoint<Real>, s, eps, model.fields, job.digits) : null);
  return { eps: eps ? decimalText(eps, job.digits) : 'eps', meanField: false, fixedPoints: points.map((p) => ({ ...formatFixedPoint(p, flow.couplings, job.digits), quadraticOperators: quadratic(p) })) };
}

/** Eigen-operators of the quadratic-operator matrix at a fixed point: series, truncated values, values at the numeric root. */
function formatQuadratic(flow: DerivedFlow<Real>, point: FixedPoint<Real>, s: Q, eps: Q | null, fields: number, digits: number) {
  const { ring } = flow.calculus.ctx;
  const spectrum = quadraticSpectrum(flow, point, ring.fromRational(s.num, s.den), fields);
  if (!spectrum) return null;
  const e = eps ? ring.fromRational(eps.num, eps.den) : null;
  const atRoot = e && point.couplingValues ? quadraticAtRoot(flow, spectrum, point.couplingValues) : null;
  const sReal = ring.fromRational(s.num, s.den);
  return spectrum.operators.map((op, i) => ({
    name: op.name,
    multiplicity: op.multiplicity,
    operator: op.operator,
    series: { gamma: op.gammaSeries.coefficients().map((c) => formatCoefficient(c, digits)), Delta: op.deltaSeries.coefficients().map((c) => formatCoefficient(c, digits)) },
    values: e ? { gamma: formatCoefficient(op.gammaSeries.evaluate(e), digits), Delta: formatCoefficient(op.deltaSeries.evaluate(e), digits) } : null,
    atRoot: atRoot && e ? { gamma: atRoot[i].map((g) => formatCoefficient(g, digits)), Delta: atRoot[i].map((g) => formatCoefficient(sReal.minus(e).plus(g), digits)) } : null,
  }));
}

/**
 * γ_φ per eigen-direction of the field matrix at a fixed point and η = 2 − s + 2γ_φ for each
 * (schema FieldAnomalousSpectrum in contract/flow.ts); one direction "every field" when γ_φ ∝ δ there.
 */
export function formatFieldAnomalous(flow: DerivedFlow<Real>, point: FixedPoint<Real>, s: Q, eps: Q | null, fields: number, digits: number) {
  const { ring } = flow.calculus.ctx;
  const e = eps ? ring.fromRational(eps.num, eps.den) : null;
  const spectrum = fieldAnomalousSpectrum(flow, point, e);
  const twoMinusS = ring.fromRational(2n * s.den - s.num, s.den);
  const eta = (g: Real) => twoMinusS.plus(g.times(2));
  const text = (x: Real) => formatCoefficient(x, digits) as string;
  return {
    proportional: spectrum.proportional,
    directions: spectrum.directions.map((d) => {
      const gamma = d.gammaSeries.coefficients();
      return {
        field: d.field,
        multiplicity: d.multiplicity ?? fields,
        series: { gamma: gamma.map(text), eta: gamma.map((g, m) => text(m === 0 ? eta(g) : g.times(2))) },
        values: d.value ? { gamma: text(d.value), eta: text(eta(d.value)) } : null,
        atRoot: d.atRoot ? { gamma: d.atRoot.map(text), eta: d.atRoot.map((g) => text(eta(g))) } : null,
      };
    }),
  };
}

export function decimalText(x: Q, digits: number): string {
  const R = realContext(digits);
  return new R(x.num.toString()).div(x.den.toString()).toSignificantDigits(digits).toString();
}

/**
 * The IR-stable non-Gaussian fixed point (or a named one). Rule: the first point with stable = true
 * (IR-stable at the physical ε). Otherwise the first point whose stability-eigenvalue series all
 * start (first non-zero coefficient) positive — never one found unstable at the physical ε, but
 * possibly one that is complex there or whose stability is undecided; with a physical ε that choice
 * is added to the point's caveats.
 */
/**
 * The fixed point a job follows: the named one, else the IR-stable one. `omitted` are the points left out at
 * this N because their ε-series have a pole there (see omittedFixedPoints); asking for one names the pole.
 */
export function chooseFixedPoint<C>(points: FixedPoint<C>[], name: string | undefined, symbolic: boolean, omitted: readonly OmittedPoint[] = []): FixedPoint<C> {
  if (name !== undefined) {
    const byBase = points.filter((p) => baseName(p.name) === name);
    const found = points.find((p) => p.name === name) ?? (byBase.length === 1 ? byBase[0] : undefined);
    const poleAtN = omitted.find((o) => o.point === name);
    if (!found && poleAtN) fail('domain', poleAtN.message);
    if (!found) fail('invalid', `no fixed point named ${JSON.stringify(name)}; available: ${points.map((p) => p.name).join(', ')}`);
    return found;
  }
  // a point complex only at the physical ε still has a real ε-series (the exponents are its truncations)
  const candidates = points.filter((p) => p.name !== 'Gaussian' && p.couplingSeries !== null);
  const sign = (c: C) => Number(String(symbolic ? (c as unknown as Expression).rationalValue()?.num ?? NaN : c));
  const leadingSign = (e: LaurentSeries<C>) => sign(e.coefficients().slice(1).find((c) => sign(c) !== 0) ?? e.coefficient(0));
  const stableByLeadingOrder = (p: FixedPoint<C>) => (p.stable !== false || p.status === 'complex') && !!p.eigenvalueSeries && p.eigenvalueSeries.every((e) => e !== null && leadingSign(e) > 0);
  const stable = candidates.find((p) => p.stable === true && p.status !== 'complex') ?? candidates.find(stableByLeadingOrder);
  if (!stable && !candidates.length && omitted.length) fail('domain', omitted.map((o) => o.message).join('; '));
  if (!stable) {
    const names = candidates.map((p) => p.name).join(', ');
    fail('not-representable', symbolic ? `which fixed point is IR-stable depends on the symbolic parameters; name one with "fixedPoint" (${names}) or give N and s as numbers` : `no IR-stable non-Gaussian fixed point; name one with "fixedPoint" (${names})`);
  }
  if (stable.stable !== true && (stable.couplingValues || stable.complexValues)) noteChoice(stable);
  return stable;
}

/** States in the caveats of a point chosen by its ε-series that it is not IR-stable (or not real) at the physical ε. */
function noteChoice<C>(point: FixedPoint<C>): void {
  const caveats = (point.caveats ??= []);
  const kind = point.status === 'complex' ? 'complex-at-eps' : caveats.some((c) => c.kind === 'stability-sign-disagrees') || !caveats.length ? 'stability-sign-disagrees' : caveats[0].kind;
  const why = point.status === 'complex' ? 'it is complex at the physical ε' : 'its stability at the physical ε is undecided';
  const message = `chosen as the IR-stable point by its ε-series (every stability eigenvalue starts positive) although ${why}: no real fixed point is IR-stable there`;
  if (!caveats.some((c) => c.message === message)) caveats.push({ kind, message });
}

/**
 * When the identity insertion is not proportional to δ for all couplings (γ_φ² unavailable), φ_aφ_a
 * may still be an eigen-operator of the quadratic-operator matrix at the chosen fixed point: its γ then defines 1/ν.
 */
function singletAtPoint(any: AnyFlow, point: FixedPoint<unknown>, s: Q | null, model: ModelSpec): LaurentSeries<Real> | undefined {
  if (any.mode !== 'numeric' || any.flow.gammaPhi2 || !s || 'member' in model) return undefined;
  const { ring } = any.flow.calculus.ctx;
  const spectrum = quadraticSpectrum(any.flow, point as FixedPoint<Real>, ring.fromRational(s.num, s.den), model.fields);
  return spectrum?.operators.find((o) => o.containsSinglet)?.gammaSeries;
}

function runExponents(job: z.infer<typeof ExponentsJob>) {
  const model = modelFrom(job.model);
  const { s, d, eps } = expansionPoint(job);
  const crossover = d ? crossoverFor(job.model, d, job.shortRange?.Delta_sigma) : null;
  const shortRange = crossover ? { shortRange: { sStar: decimalText(crossover.sStar, job.digits), Delta_sigma: crossover.deltaSigma, source: crossover.source } } : {};
  if (eps && d && s && qCompare(eps, q(0)) <= 0) {
    const { statement, ...values } = meanFieldValues(job.d as string, job.s as string, job.digits);
    return { notices: regimeNotices(d, s, crossover), eps: qToString(eps), meanField: true, statement, fixedPoint: 'Gaussian', values, relations: relationsFor('mean-field'), sources: sourcesFor('mean-field'), ...shortRange };
  }
  const any = deriveFor(model, s, job.loops, job.digits);
  const text = (c: unknown) => formatCoefficient(c, job.digits);
  const seriesText = (series: Partial<Record<Quantity, LaurentSeries<unknown>>>) => Object.fromEntries(SERIES_QUANTITIES.flatMap((k) => (series[k] ? [[k, (series[k] as LaurentSeries<unknown>).coefficients().map(text)]] : [])));
  const unavailableText = (unavailable: Partial<Record<Quantity, string>>) => (Object.keys(unavailable).length ? { unavailable } : {});
  const quadraticOf = (point: FixedPoint<unknown>) => (any.mode === 'numeric' && s && !('member' in model) ? formatQuadratic(any.flow, point as FixedPoint<Real>, s, eps, model.fields, job.digits) : null);
  if (any.mode === 'numeric' && s && d && eps) {
    const { point, at } = exponentsAtS(any, model, job.fixedPoint, { d, s, eps, crossover }, job.digits);
    const quadratic = quadraticOf(point);
    const padeText = (entry: CheckedPade) => ({ L: entry.L, M: entry.M, value: entry.value ? (text(entry.value) as string) : null, flagged: entry.flagged, poles: entry.poles.map((p) => text(p) as string), signChange: entry.signChange, reason: entry.reason });
    const borelText = (entry: BorelValue) => ({ L: entry.L, M: entry.M, value: entry.value ? entry.value.toString() : null, error: entry.error ? entry.error.toSignificantDigits(2).toString() : null, flagged: entry.flagged, poles: entry.poles.map((p) => text(p) as string), reason: entry.reason });
    return {
      notices: at.notices,
      eps: decimalText(eps, job.digits),
      meanField: false,
      fixedPoint: point.name,
      series: seriesText(at.series),
      relations: relationsFor(at.regime),
      sources: sourcesFor(at.regime),
      ...unavailableText(at.unavailable),
      ...(quadratic ? { quadraticOperators: quadratic } : {}),
      ...(at.fieldSpectrum && !('member' in model) ? { fieldAnomalous: formatFieldAnomalous(any.flow, point, s, eps, model.fields, job.digits) } : {}),
      values: Object.fromEntries(SERIES_QUANTITIES.map((k) => [k, at.values[k] === null ? null : text(at.values[k])])),
      pade: Object.fromEntries(SERIES_QUANTITIES.flatMap((k) => (at.pade[k] ? [[k, (at.pade[k] as CheckedPade[]).map(padeText)]] : []))),
      borel: Object.fromEntries(SERIES_QUANTITIES.flatMap((k) => (at.borel[k]?.length ? [[k, (at.borel[k] as BorelValue[]).map(borelText)]] : []))),
      borelMethod: BOREL_METHOD,
      ...shortRange,
    };
  }
  // series only: no physical ε, or symbolic N or s
  const flow = any.flow as DerivedFlow<unknown>;
  const point = chooseFixedPoint(findFixedPoints(model, flow, { eps: null }), job.fixedPoint, any.mode !== 'numeric', omittedFixedPoints(flow));
  const fieldGamma = flow.gammaPhiMatrix ? fieldGammaOf(fieldAnomalousSpectrum(flow, point), point.name) : undefined;
  const { series, unavailable } = exponentSeriesPartial(flow, point, singletAtPoint(any, point, s, model), fieldGamma);
  const quadratic = quadraticOf(point);
  return {
    notices: [...fixedPointNotices(point, false), ...(d && s ? regimeNotices(d, s, crossover) : []), ...(unavailable.nuInv ? [noSingletNotice(point.name, unavailable.nuInv)] : [])],
    eps: eps ? decimalText(eps, job.digits) : 'eps',
    meanField: false,
    fixedPoint: point.name,
    series: seriesText(series),
    relations: relationsFor(exponentRegime(s, eps)),
    ...unavailableText(unavailable),
    ...(quadratic ? { quadraticOperators: quadratic } : {}),
    ...shortRange,
  };
}

/**
 * The exponents at a numeric s and physical ε: fixed points solved at ε, the chosen one's series,
 * values, checked Padé table and notices. The exponents job and a scan's s = 2 point both use it.
 */
function exponentsAtS(any: Extract<AnyFlow, { mode: 'numeric' }>, model: ModelSpec, fixedPoint: string | undefined, at: PhysicalPoint, digits: number) {
  const e = any.flow.calculus.ctx.ring.fromRational(at.eps.num, at.eps.den);
  const point = chooseFixedPoint(findFixedPoints(model, any.flow, { eps: e }), fixedPoint, false, omittedFixedPoints(any.flow));
  return { point, at: exponentsAtPoint(any.flow, point, at, digits, singletAtPoint(any, point, at.s, model)) };
}

/** Three loops need the tetrahedron period P(s), which is not computed at exactly s = 1/3 (docs/tetrahedron.md). */
export function refuseThirdAtThreeLoops(sValues: Q[], loops: number): void {
  if (loops >= 3 && sValues.some((s) => qCompare(s, q(1, 3)) === 0)) {
    fail('domain', 'the grid contains s = 1/3 exactly, where the three-loop tetrahedron period is not computed (docs/tetrahedron.md): shift the range or change the number of points');
  }
}

function runScan(job: z.infer<typeof ScanJob>, hooks: JobHooks) {
  const model = modelFrom(job.model);
  if ('member' in model) fail('not-representable', 'scans need a numeric N (give "N" as a number, e.g. "N":3); the flow is derived once symbolically in s');
  const d = toExactRational(job.d);
  checkDimension(d);
  const from = exactPositive(job.s.from, 's.from');
  const to = exactPositive(job.s.to, 's.to');
  checkPropagatorPower(from);
  checkPropagatorPower(to);
  const sValues = Array.from({ length: job.s.points }, (_, i) => qAdd(from, qMul(qSub(to, from), q(i, job.s.points - 1))));
  refuseThirdAtThreeLoops(sValues, job.loops);
  const any = deriveFor(model, null, job.loops, job.digits);
  const flow = any.flow as DerivedFlow<Expression>;
  const crossover = crossoverFor(job.model, d, job.shortRange?.Delta_sigma);
  const shortRangeS = crossover?.sStar ?? null;
  // The derivation is a small share of a long scan; the points carry the rest of the progress.
  const onProgress = hooks.onProgress ? (f: number) => hooks.onProgress!(0.05 + 0.95 * f) : undefined;
  hooks.onProgress?.(0.05);
  const marks = {
    meanFieldEnd: decimalText(meanFieldEnd(d), job.digits),
    meanFieldEndNote: 'd = 2s: the upper critical dimension (mean-field exponents with logarithmic corrections)',
    ...(crossover ? { sStar: decimalText(crossover.sStar, job.digits), sStarSource: crossover.source } : {}),
  };
  // s = 2 is the short-range theory: that point uses the flow derived at s = 2, exactly as the exponents job does
  let shortRangeFlow: Extract<AnyFlow, { mode: 'numeric' }> | null = null;
  const shortRangePoint = (eps: Q): ExternalPoint => {
    shortRangeFlow ??= deriveFor(model, q(2), job.loops, job.digits) as Extract<AnyFlow, { mode: 'numeric' }>;
    const { point, at } = exponentsAtS(shortRangeFlow, model, job.fixedPoint, { d, s: q(2), eps, crossover }, job.digits);
    const padeEntry = (k: Quantity) => at.pade[k]?.find((entry) => entry.M === 1 && entry.L === job.loops - 1) ?? null;
    return { ...padeFields(job.quantities.map(padeEntry)), padeDefects: job.quantities.map((k) => padeEntry(k)?.reason ?? null), values: job.quantities.map((k) => at.values[k]), notices: at.notices, fixedPoint: point.name };
  };
  const text = (r: Real | null | undefined) => (r === null || r === undefined ? null : (formatCoefficient(r, job.digits) as string));
  const pointText = (p: ScanPoint) => {
    const defects = p.padeDefects ? Object.fromEntries(job.quantities.flatMap((k: Quantity, i: number) => (p.padeDefects?.[i] ? [[k, p.padeDefects[i]]] : []))) : {};
    return {
      s: decimalText(p.s, job.digits),
      eps: decimalText(p.eps, job.digits),
      regime: p.regime,
      flagged: p.regime !== 'long-range',
      values: Object.fromEntries(job.quantities.map((k: Quantity, i: number) => [k, text(p.values[i])])),
      pade: Object.fromEntries(job.quantities.map((k: Quantity, i: number) => [k, text(p.pade[i])])),
      ...(Object.keys(defects).length ? { padeDefects: defects } : {}),
      ...(p.notices.length ? { notices: [...new Set(p.notices.map((n) => n.kind))] } : {}),
    };
  };
  const grid = { d, sValues, quantities: job.quantities, digits: job.digits, shortRangeS, crossover, onProgress, shortRangePoint };
  if (model.couplings.length > 1) {
    // several couplings: fixed points solved numerically at each ε (flow derived once in s)
    const points = scanFlow({ ...grid, model, flow, choose: (candidates) => chooseFixedPoint(candidates, job.fixedPoint, false, omittedFixedPoints(flow)) });
    const used = points.find((p) => p.fixedPoint !== null && p.regime === 'long-range')?.fixedPoint ?? points.find((p) => p.fixedPoint !== null)?.fixedPoint ?? null;
    return {
      notices: scanNotices(points, job.digits),
      d: job.d,
      fixedPoint: job.fixedPoint ?? used,
      quantities: job.quantities,
      marks,
      points: points.map((p) => ({ ...pointText(p), fixedPoint: p.fixedPoint, ...(p.note ? { note: p.note } : {}) })),
    };
  }
  const point = chooseFixedPoint(findFixedPoints(model, flow, { eps: null }), job.fixedPoint, true, omittedFixedPoints(flow));
  const { series } = exponentSeriesPartial(flow, point);
  const compiled = (k: Quantity) => (series[k] ? { coefficients: powerCoefficients(series[k] as LaurentSeries<Expression>) } : { coefficients: [] });
  const primaries = { nuInv: series.nuInv ? compiled('nuInv') : null, omega: compiled('omega'), eta: compiled('eta') };
  const beta = { quadratic: flow.beta[0].terms.get('2')?.coeff ?? Expression.rational(q(0)), cubic: flow.beta[0].terms.get('3')?.coeff ?? null, quartic: flow.beta[0].terms.get('4')?.coeff ?? null };
  const points = scanSeries({ ...grid, series: job.quantities.map(compiled), primaries, beta });
  return {
    notices: scanNotices(points, job.digits),
    d: job.d,
    fixedPoint: point.name,
    quantities: job.quantities,
    marks,
    points: points.map(pointText),
  };
}
