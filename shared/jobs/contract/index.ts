import { z } from 'zod';
import { CalcJob, CalcResult } from './calc';
import { CompareJob, CompareResult, KinksJob, KinksResult } from './data';
import { ExponentsJob, ExponentsResult } from './exponents';
import { FixedPointsJob, FixedPointsResult } from './fixedPoints';
import { FlowJob, FlowResult } from './flow';
import { ScanJob, ScanResult } from './scan';

/**
 * The job contract: the input and result schema of every job, zod only. The engine's dispatcher,
 * the server, the notebook's cell layer and the app all import it from here.
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

/** Every job kind with its input and result schema (a failed job answers with JobError instead). */
export const JOBS = {
  special: { input: CalcJob.options[0], result: CalcResult },
  laurent: { input: CalcJob.options[1], result: CalcResult },
  bubble: { input: CalcJob.options[2], result: CalcResult },
  fourier: { input: CalcJob.options[3], result: CalcResult },
  startriangle: { input: CalcJob.options[4], result: CalcResult },
  pade: { input: CalcJob.options[5], result: CalcResult },
  flow: { input: FlowJob, result: FlowResult },
  fixedpoints: { input: FixedPointsJob, result: FixedPointsResult },
  exponents: { input: ExponentsJob, result: ExponentsResult },
  scan: { input: ScanJob, result: ScanResult },
  kinks: { input: KinksJob, result: KinksResult },
  compare: { input: CompareJob, result: CompareResult },
} as const;

export type JobKind = keyof typeof JOBS;
export const JOB_KINDS = Object.keys(JOBS) as JobKind[];

export const AnyJob = z.discriminatedUnion('job', [...CalcJob.options, FlowJob, FixedPointsJob, ExponentsJob, ScanJob, KinksJob, CompareJob]);
export type AnyJob = z.infer<typeof AnyJob>;
