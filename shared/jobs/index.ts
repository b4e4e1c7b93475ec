export * from './schemas';
export { JOB_LIMITS } from './limits';
export { runJob, runBatch, jobError, isJobError } from './run';
export { FlowCalcJob, FlowJob, FixedPointsJob, ExponentsJob, ScanJob, ModelInput, isFlowJob, runFlowJob, type JobHooks } from './flowJobs';
