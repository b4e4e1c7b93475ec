import type { HealthReport } from '../../shared/api/schemas';
import { route } from '../http/route';
import type { Services } from '../services';

export function healthRoutes({ dataSource, config }: Services) {
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
        return {
          status: database === 'ok' ? 'ok' : 'degraded',
          database,
          mail: config.mail.startFake ? 'fake' : 'smtp',
          version: process.env.npm_package_version ?? '0.1.0',
        };
      },
    }),
  ];
}
