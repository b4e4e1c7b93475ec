export * from './contract';

export { runJob, runBatch, jobError, isJobError, type JobOutput } from './run';
export { FlowCalcJob, isFlowJob, runFlowJob, type JobHooks } from './flowJobs';
