import { z } from 'zod';
import { BubbleJob, FourierJob, LaurentJob, PadeJob, PadeResult, SeriesResult, SpecialJob, SpecialResult, StarTriangleJob } from './calc';
import { CompareJob, CompareResult, KinksJob, KinksResult } from './data';
import { ExponentsJob, ExponentsResult } from './exponents';
import { FixedPointsJob, FixedPointsResult } from './fixedPoints';
import { FlowJob, FlowResult } from './flow';
import { ScanJob, ScanResult } from './scan';

/**
 * The job contract: the input and result schema of every job, zod only (it is bundled into the app,
 * so nothing here imports the engine). The dispatcher, the server, the notebook's cell layer and the
 * app all import it from here. docs/flows.md lists every job with its fields.
 */
export * from './calc';
export * from './data';
export * from './exponents';
export * from './fixedPoints';
export * from './flow';
export * from './limits';
export * from './model';
export * from './primitives';
export * from './scan';

/**
 * Every job kind with its family (which runner takes it), its input and its result schema; a failed
 * job answers with JobError instead. Lists of kinds elsewhere are read off this table.
 */
export const JOBS = {
  special: { family: 'calc', input: SpecialJob, result: SpecialResult },
  laurent: { family: 'calc', input: LaurentJob, result: SeriesResult },
  bubble: { family: 'calc', input: BubbleJob, result: SeriesResult },
  fourier: { family: 'calc', input: FourierJob, result: SeriesResult },
  startriangle: { family: 'calc', input: StarTriangleJob, result: SeriesResult },
  pade: { family: 'calc', input: PadeJob, result: PadeResult },
  flow: { family: 'flow', input: FlowJob, result: FlowResult },
  fixedpoints: { family: 'flow', input: FixedPointsJob, result: FixedPointsResult },
  exponents: { family: 'flow', input: ExponentsJob, result: ExponentsResult },
  scan: { family: 'flow', input: ScanJob, result: ScanResult },
  kinks: { family: 'data', input: KinksJob, result: KinksResult },
  compare: { family: 'data', input: CompareJob, result: CompareResult },
} as const;

export type JobKind = keyof typeof JOBS;
export const JOB_KINDS = Object.keys(JOBS) as JobKind[];

export type JobFamily = (typeof JOBS)[JobKind]['family'];
export type KindOf<F extends JobFamily> = { [K in JobKind]: (typeof JOBS)[K]['family'] extends F ? K : never }[JobKind];

/** The kinds of one family, in the order of JOBS. */
export function kindsOf<F extends JobFamily>(family: F): KindOf<F>[] {
  return JOB_KINDS.filter((kind): kind is KindOf<F> => JOBS[kind].family === family);
}

/** Flow jobs (shared/jobs/flowJobs.ts) and data jobs (shared/jobs/dataJobs.ts). */
export const FLOW_JOB_KINDS = kindsOf('flow');
export const DATA_JOB_KINDS = kindsOf('data');

/** True for a job the data runner takes. */
export function isDataJob(input: unknown): boolean {
  const kind = jobKindOf(input);
  return kind !== null && JOBS[kind].family === 'data';
}

/** A job of one kind as the runner receives it (defaults filled in) and the result it answers with. */
export type JobOf<K extends JobKind> = z.infer<(typeof JOBS)[K]['input']>;
export type ResultOf<K extends JobKind> = z.infer<(typeof JOBS)[K]['result']>;

export const AnyJob = z.discriminatedUnion('job', [SpecialJob, LaurentJob, BubbleJob, FourierJob, StarTriangleJob, PadeJob, FlowJob, FixedPointsJob, ExponentsJob, ScanJob, KinksJob, CompareJob]);
export type AnyJob = z.infer<typeof AnyJob>;

/** The kind a job names in its "job" field, or null when it names none of JOB_KINDS. */
export function jobKindOf(input: unknown): JobKind | null {
  const kind = namedKind(input);
  return typeof kind === 'string' && Object.hasOwn(JOBS, kind) ? (kind as JobKind) : null;
}

function namedKind(input: unknown): unknown {
  return typeof input === 'object' && input !== null && !Array.isArray(input) ? (input as { job?: unknown }).job : undefined;
}

/** Why a job names no known kind, listing every kind there is. */
export function unknownJobMessage(input: unknown): string {
  const kinds = JOB_KINDS.join(', ');
  const kind = namedKind(input);
  if (kind === undefined) return `a job is an object whose "job" field names its kind, one of: ${kinds}`;
  return `unknown job ${JSON.stringify(kind)?.slice(0, 80) ?? String(kind)}; the job kinds are: ${kinds}`;
}
