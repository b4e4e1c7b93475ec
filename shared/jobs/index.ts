export * from './schemas';
export { JOB_LIMITS } from './limits';
export { runJob, runBatch, jobError, isJobError } from './run';
