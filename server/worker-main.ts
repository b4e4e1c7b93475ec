import 'reflect-metadata';
import { ConfigError, loadConfig } from './config';
import { processLogger } from './jobs/logging';
import { startQueueWorker } from './jobs/queueWorker';

/** Worker settings beyond the shared configuration (JOB_QUEUE_URL, JOB_THREADS, LOG_LEVEL). */
function workerSettings(env: Record<string, string | undefined>, threads: number) {
  const int = (name: string, fallback: number) => {
    const value = env[name];
    if (value === undefined || value === '') return fallback;
    const parsed = Number.parseInt(value, 10);
    if (!Number.isFinite(parsed) || parsed < 0) throw new ConfigError(`${name} must be a non-negative integer, got "${value}"`);
    return parsed;
  };
  return {
    concurrency: Math.max(1, int('JOB_WORKER_CONCURRENCY', threads)),
    lockMs: Math.max(1000, int('JOB_WORKER_LOCK_MS', 30_000)),
    retriesAfterDeath: int('JOB_WORKER_RETRIES', 1),
  };
}

async function main() {
  const config = loadConfig();
  if (!config.jobQueueUrl) throw new ConfigError('npm run worker serves the shared job queue: set JOB_QUEUE_URL=redis://… (the same value the web servers use).');
  const logger = processLogger(config.logLevel, 'worker');
  const settings = workerSettings(process.env, config.jobs.threads);
  const worker = await startQueueWorker({ url: config.jobQueueUrl, logger, ...settings });
  logger.info(settings, 'started');

  let stopping = false;
  async function shutdown(signal: string) {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'shutting down: finishing the jobs in hand');
    const forceExit = setTimeout(() => process.exit(1), config.jobs.timeLimitMs + 10_000).unref();
    await worker.close();
    clearTimeout(forceExit);
    logger.info('stopped');
    process.exit(0);
  }
  process.on('SIGINT', () => void shutdown('SIGINT'));
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
}

main().catch((error) => {
  const message = error instanceof ConfigError ? error.message : error instanceof Error ? error.stack : String(error);
  process.stderr.write(`Rungbook worker refused to start: ${message}\n`);
  process.exit(1);
});
