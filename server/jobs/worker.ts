// Runs in a worker thread: one engine job per task, so a long or stuck job never blocks the server.
import { runJob } from '../../shared/jobs';

export default function runEngineJob(job: unknown): unknown {
  return runJob(job);
}
