import { z } from 'zod';
import { ConsistencyError } from '../engine/diagrams/subtraction';
import { type DerivedFlow, type TrailEntry } from '../engine/diagrams/renormalization';
import { quadraticAtRoot, quadraticSpectrum } from '../engine/exponents/quadratic';
import { exactLongRangeValue, exponentSeries, meanFieldValues, RELATIONS, SERIES_QUANTITIES, type Quantity } from '../engine/exponents/exponents';
import { type FixedPoint, baseName, findFixedPoints } from '../engine/fixedpoints/fixedPoints';
import { type ComplexReal } from '../engine/fixedpoints/complexRoots';
import { type AnyFlow, checkPropagatorPower, flowFor } from '../engine/flows/flow';
import { type CouplingPolynomial } from '../engine/models/couplingPolynomial';
import { customModel } from '../engine/models/custom';
import { type ModelSpec } from '../engine/models/model';
import { cubicFamily, cubicModel, onFamily, onModel } from '../engine/models/presets';
import { EngineError, fail } from '../engine/precision/errors';
import { type Real, realContext, toExactRational } from '../engine/precision/real';
import { crossoverS, meanFieldEnd, padeValue, scanSeries } from '../engine/scans/scan';
import { scanFlow } from '../engine/scans/flowScan';
import { type LaurentSeries } from '../engine/series/laurent';
import { type Expression } from '../engine/symbolic/expression';
import { expressionToLatex, expressionToString } from '../engine/symbolic/format';
import { polyToString } from '../engine/symbolic/polynomial';
import { type Q, q, qAdd, qCompare, qMul, qSub, qToString } from '../engine/symbolic/rational';
import { ExponentsJob, FixedPointsJob, FlowJob, ModelInput, ScanJob, type JobError } from './contract';

export const FlowCalcJob = z.discriminatedUnion('job', [FlowJob, FixedPointsJob, ExponentsJob, ScanJob]);
export type FlowCalcJob = z.infer<typeof FlowCalcJob>;
export const FLOW_JOB_NAMES: readonly string[] = ['flow', 'fixedpoints', 'exponents', 'scan'];

/** True for a job this module runs (dispatch hook for the calc runner). */
export function isFlowJob(input: unknown): boolean {
  return typeof input === 'object' && input !== null && FLOW_JOB_NAMES.includes((input as { job?: unknown }).job as string);
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
  if (input.preset === 'on') return input.N === 'N' ? onFamily : onModel(input.N);
  return input.N === 'N' ? cubicFamily : cubicModel(input.N);
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
  const width = entry.graph.function === 'vertex' ? couplings : ['δ_ab'];
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
    gamma_phi2: flow.gammaPhi2 ? formatPolynomial(flow.gammaPhi2, c, digits) : { note: flow.gammaPhi2Note },
    ...(flow.quadratic
      ? {
          gamma_quadratic: {
            convention: 'γ_{(kl),(ij)}: insertion t_ij φ_iφ_j (i ≤ j) → counterterm Σ γ_{(kl),(ij)} t_ij φ_kφ_l; Δ = d − s + eigenvalue',
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

export function deriveFor(model: ModelSpec, s: Q | null, loops: 1 | 2, digits: number): AnyFlow {
  return flowFor({ model, s, loops, digits });
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
  };
}

function gaussianOnly(model: ModelSpec, d: string, s: string) {
  return {
    meanField: true,
    statement: meanFieldValues(d, s).statement,
    fixedPoints: [{ name: 'Gaussian', status: 'real', couplings: Object.fromEntries(model.couplings.map((c) => [c, { series: ['0'], value: '0' }])), stability: { series: null, values: model.couplings.map(() => String(Number(d) - 2 * Number(s))) }, stable: true, notes: [] }],
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

export function decimalText(x: Q, digits: number): string {
  const R = realContext(digits);
  return new R(x.num.toString()).div(x.den.toString()).toSignificantDigits(digits).toString();
}

/** The IR-stable non-Gaussian fixed point (or a named one). */
export function chooseFixedPoint<C>(points: FixedPoint<C>[], name: string | undefined, symbolic: boolean): FixedPoint<C> {
  if (name !== undefined) {
    const byBase = points.filter((p) => baseName(p.name) === name);
    const found = points.find((p) => p.name === name) ?? (byBase.length === 1 ? byBase[0] : undefined);
    if (!found) fail('invalid', `no fixed point named ${JSON.stringify(name)}; available: ${points.map((p) => p.name).join(', ')}`);
    return found;
  }
  // a point complex only at the physical ε still has a real ε-series (the exponents are its truncations)
  const candidates = points.filter((p) => p.name !== 'Gaussian' && (p.status === 'real' || (p.status === 'complex' && p.couplingSeries !== null)));
  const stableByLeadingOrder = (p: FixedPoint<C>) => !!p.eigenvalueSeries && p.eigenvalueSeries.every((e) => e !== null && Number(String(symbolic ? (e.coefficient(1) as unknown as Expression).rationalValue()?.num ?? NaN : e.coefficient(1))) > 0);
  const stable = candidates.find((p) => p.stable === true) ?? candidates.find(stableByLeadingOrder);
  if (!stable) {
    const names = candidates.map((p) => p.name).join(', ');
    fail('not-representable', symbolic ? `which fixed point is IR-stable depends on the symbolic parameters; name one with "fixedPoint" (${names}) or give N and s as numbers` : `no IR-stable non-Gaussian fixed point; name one with "fixedPoint" (${names})`);
  }
  return stable;
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
  if (eps && qCompare(eps, q(0)) <= 0) {
    const { statement, ...values } = meanFieldValues(job.d as string, job.s as string);
    return { eps: qToString(eps), meanField: true, statement, fixedPoint: 'Gaussian', values };
  }
  const any = deriveFor(model, s, job.loops, job.digits);
  const flow = any.flow as DerivedFlow<unknown>;
  const numeric = any.mode === 'numeric';
  const epsCoefficient = numeric && eps ? any.flow.calculus.ctx.ring.fromRational(eps.num, eps.den) : null;
  const points = findFixedPoints(model, flow, { eps: epsCoefficient });
  const point = chooseFixedPoint(points, job.fixedPoint, !numeric);
  const series = exponentSeries(flow, point, singletAtPoint(any, point, s, model));
  const out: Record<string, unknown> = {
    eps: eps ? decimalText(eps, job.digits) : 'eps',
    meanField: false,
    fixedPoint: point.name,
    series: Object.fromEntries(SERIES_QUANTITIES.map((k) => [k, series[k].coefficients().map((c) => formatCoefficient(c, job.digits))])),
    relations: RELATIONS,
  };
  if (numeric && s && !('member' in model)) {
    const quadratic = formatQuadratic(any.flow as DerivedFlow<Real>, point as FixedPoint<Real>, s, eps, model.fields, job.digits);
    if (quadratic) out.quadraticOperators = quadratic;
  }
  if (numeric && eps && epsCoefficient) {
    const e = epsCoefficient as Real;
    const { ring } = (any.flow as DerivedFlow<Real>).calculus.ctx;
    const nu = () => (series.nu as LaurentSeries<Real>).evaluate(e);
    const exact = (k: Quantity) => (d && s ? exactLongRangeValue(k, ring.fromRational(d.num, d.den), ring.fromRational(s.num, s.den), nu) : null);
    out.values = Object.fromEntries(SERIES_QUANTITIES.map((k) => [k, formatCoefficient(exact(k) ?? (series[k] as LaurentSeries<Real>).evaluate(e), job.digits)]));
    out.pade = Object.fromEntries(SERIES_QUANTITIES.map((k) => {
      const v = padeValue((series[k] as LaurentSeries<Real>).coefficients(), e, job.digits);
      return [k, v ? formatCoefficient(v, job.digits) : null];
    }));
  }
  return out;
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
  const any = deriveFor(model, null, job.loops, job.digits);
  const flow = any.flow as DerivedFlow<Expression>;
  const shortRangeS = job.shortRange ? crossoverS(d, toExactRational(job.shortRange.Delta_sigma)) : null;
  // The derivation is a small share of a long scan; the points carry the rest of the progress.
  const onProgress = hooks.onProgress ? (f: number) => hooks.onProgress!(0.05 + 0.95 * f) : undefined;
  hooks.onProgress?.(0.05);
  const marks = { meanFieldEnd: decimalText(meanFieldEnd(d), job.digits), ...(shortRangeS ? { sStar: decimalText(shortRangeS, job.digits) } : {}) };
  const pointText = (p: { s: Q; eps: Q; regime: string }) => ({ s: decimalText(p.s, job.digits), eps: decimalText(p.eps, job.digits), regime: p.regime, flagged: p.regime !== 'long-range' });
  if (model.couplings.length > 1) {
    // several couplings: fixed points solved numerically at each ε (flow derived once in s)
    const points = scanFlow({ model, flow, d, sValues, quantities: job.quantities, digits: job.digits, shortRangeS, onProgress, choose: (candidates) => chooseFixedPoint(candidates, job.fixedPoint, false) });
    const used = points.find((p) => p.fixedPoint !== null && p.regime === 'long-range')?.fixedPoint ?? points.find((p) => p.fixedPoint !== null)?.fixedPoint ?? null;
    return {
      d: job.d,
      fixedPoint: job.fixedPoint ?? used,
      quantities: job.quantities,
      marks,
      points: points.map((p) => ({
        ...pointText(p),
        fixedPoint: p.fixedPoint,
        values: Object.fromEntries(job.quantities.map((k: Quantity, i: number) => [k, p.fixedPoint === null ? null : formatCoefficient(p.values[i], job.digits)])),
        pade: Object.fromEntries(job.quantities.map((k: Quantity, i: number) => [k, p.pade[i] ? formatCoefficient(p.pade[i], job.digits) : null])),
        ...(p.note ? { note: p.note } : {}),
      })),
    };
  }
  const point = chooseFixedPoint(findFixedPoints(model, flow, { eps: null }), job.fixedPoint, true);
  const series = exponentSeries(flow, point);
  const points = scanSeries({ d, sValues, series: job.quantities.map((k: Quantity) => ({ coefficients: (series[k] as LaurentSeries<Expression>).coefficients() })), quantities: job.quantities, nu: { coefficients: (series.nu as LaurentSeries<Expression>).coefficients() }, digits: job.digits, shortRangeS, onProgress });
  return {
    d: job.d,
    fixedPoint: point.name,
    quantities: job.quantities,
    marks,
    points: points.map((p) => ({
      ...pointText(p),
      values: Object.fromEntries(job.quantities.map((k: Quantity, i: number) => [k, formatCoefficient(p.values[i], job.digits)])),
      pade: Object.fromEntries(job.quantities.map((k: Quantity, i: number) => [k, p.pade[i] ? formatCoefficient(p.pade[i], job.digits) : null])),
    })),
  };
}
