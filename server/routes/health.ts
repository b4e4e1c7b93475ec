import type { HealthReport } from '../../shared/api/schemas';
import { route } from '../http/route';
import { sharedStateOf } from '../jobs/sharedState';
import type { Services } from '../services';

export function healthRoutes(services: Services) {
  const { dataSource, config } = services;
  return [
    route({
      method: 'get',
      path: '/health',
      access: 'public',
      async handler(): Promise<HealthReport> {
        let database: HealthReport['database'] = 'ok';
        try {
          await dataSource.query('SELECT 1');
        } catch {
          database = 'unreachable';
        }
        const jobs = (await sharedStateOf(services)?.status()) ?? { queue: 'unknown' as const, workers: 0 };
        // a shared queue no worker serves accepts jobs that never run
        const jobsOk = jobs.queue === 'in-process' || jobs.queue === 'unknown' || (jobs.queue === 'ok' && jobs.workers > 0);
        return {
          status: database === 'ok' && jobsOk ? 'ok' : 'degraded',
          database,
          queue: jobs.queue,
          workers: jobs.workers,
          mail: config.mail.startFake ? 'fake' : 'smtp',
          version: process.env.npm_package_version ?? '0.1.0',
        };
      },
    }),
  ];
}
