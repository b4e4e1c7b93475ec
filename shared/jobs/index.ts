export * from './contract';

export { runJob, runBatch, jobError, isJobError } from './run';
export { FlowCalcJob, isFlowJob, runFlowJob, type JobHooks } from './flowJobs';
