// npm run bench:scale — the same 40 scan jobs on the in-process pool and on the shared queue with 1 and 2
// worker processes: throughput and p50/p99 latency from hand-off to result. Needs Debian's redis-server.
import { pino } from 'pino';
import { startRedis } from '../../scripts/services/redis';
import { createQueueRunner } from '../../server/jobs/queueRunner';
import { createWorkerPoolRunner, type JobRunner } from '../../server/jobs/runner';
import { startWorkerProcess, type WorkerProcess } from '../queue/processes';

const JOBS = 40;
/** Threads per side: the pool's threads, each worker process's concurrency. */
const THREADS = 1;
// O(1) model in d = 3, 40 points each at 20 digits: tens to hundreds of milliseconds of engine time.
const scanJob = (n: number) => ({ job: 'scan', model: { preset: 'on', N: 1 }, d: '3', s: { from: '1.55', to: (1.8 + n / 1000).toFixed(3), points: 40 }, quantities: ['nuInv'], loops: 2, digits: 20 });

interface Row {
  setup: string;
  jobsPerSecond: number;
  p50: number;
  p99: number;
}

const quantile = (sorted: number[], q: number) => sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)];

/** All jobs handed over at once; at most `parallel` run at a time, as the run service's fair queue would allow. */
async function measure(setup: string, runner: JobRunner, parallel: number): Promise<Row> {
  const latencies: number[] = [];
  let next = 0;
  const began = performance.now();
  const lane = async () => {
    for (let n = next++; n < JOBS; n = next++) {
      const handedOver = performance.now();
      await runner.run(scanJob(n), { signal: new AbortController().signal });
      latencies.push(performance.now() - handedOver);
    }
  };
  await Promise.all(Array.from({ length: parallel }, lane));
  const seconds = (performance.now() - began) / 1000;
  latencies.sort((a, b) => a - b);
  return { setup, jobsPerSecond: JOBS / seconds, p50: quantile(latencies, 0.5), p99: quantile(latencies, 0.99) };
}

async function main() {
  const rows: Row[] = [];
  const pool = createWorkerPoolRunner({ threads: THREADS });
  await measure('warm-up', pool, THREADS);
  rows.push(await measure(`in-process pool, ${THREADS} thread`, pool, THREADS));
  await pool.close();
  const widerPool = createWorkerPoolRunner({ threads: 2 * THREADS });
  await measure('warm-up', widerPool, 2 * THREADS);
  rows.push(await measure(`in-process pool, ${2 * THREADS} threads`, widerPool, 2 * THREADS));
  await widerPool.close();

  const redis = await startRedis();
  const logger = pino({ level: 'silent' });
  const runner = await createQueueRunner({ url: redis.url, timeLimitMs: 120_000, queueWaitLimitMs: 600_000, logger });
  const workers: WorkerProcess[] = [];
  try {
    for (const count of [1, 2]) {
      while (workers.length < count) workers.push(await startWorkerProcess(redis.url, { JOB_WORKER_CONCURRENCY: String(THREADS) }));
      await measure('warm-up', runner, count * THREADS);
      rows.push(await measure(`queue, ${count} worker process${count > 1 ? 'es' : ''}`, runner, count * THREADS));
    }
  } finally {
    await runner.close();
    for (const worker of workers) await worker.stop();
    await redis.stop();
  }
  printTable(rows);
}

function printTable(rows: Row[]) {
  const lines = [
    `${JOBS} scan jobs (O(1), d = 3, 40 points, 20 digits), ${THREADS} engine thread per worker process`,
    '| setup | jobs/s | p50 latency (ms) | p99 latency (ms) |',
    '|---|---:|---:|---:|',
    ...rows.map((row) => `| ${row.setup} | ${row.jobsPerSecond.toFixed(2)} | ${row.p50.toFixed(0)} | ${row.p99.toFixed(0)} |`),
  ];
  process.stdout.write(lines.join('\n') + '\n');
}

main().catch((error) => {
  process.stderr.write(`${error instanceof Error ? error.stack : String(error)}\n`);
  process.exit(1);
});
