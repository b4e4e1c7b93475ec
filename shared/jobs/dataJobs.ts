import { z } from 'zod';
import { ConsistencyError } from '../engine/diagrams/subtraction';
import { EngineError } from '../engine/precision/errors';
import { runCompareJob } from './compareJob';
import { CompareJob, KinksJob } from './contract';
import { type JobHooks } from './flowJobs';
import { runKinksJob } from './kinksJob';
import { type JobError } from './contract';

type ErrorCode = JobError['error']['code'];
const jobError = (code: ErrorCode, message: string): JobError => ({ error: { code, message } });

/** Validate and run one data job ("kinks" or "compare"); never throws (errors come back as {error:{code,message}}). */
export function runDataJob(input: unknown, hooks: JobHooks = {}): unknown {
  const name = (input as { job?: unknown }).job;
  const parsed = name === 'kinks' ? KinksJob.safeParse(input) : CompareJob.safeParse(input);
  if (!parsed.success) return jobError('invalid-job', z.prettifyError(parsed.error));
  try {
    const job = parsed.data;
    return job.job === 'kinks' ? runKinksJob(job) : runCompareJob(job, hooks);
  } catch (e) {
    if (e instanceof EngineError) return jobError(e.code === 'invalid' ? 'invalid-job' : e.code, e.message);
    if (e instanceof ConsistencyError) return jobError('internal', `consistency check failed: ${e.message}`);
    if (e instanceof RangeError) return jobError('limit', `computation exceeded a limit: ${e.message}`);
    return jobError('internal', `internal error: ${(e as Error)?.message ?? String(e)}`);
  }
}
