import { route } from '../http/route';
import type { Services } from '../services';
import { listCapturedMail } from '../services/mailbox';

export function adminRoutes({ dataSource }: Services) {
  return [
    route({
      method: 'get',
      path: '/admin/mail',
      access: 'admin',
      handler: async () => ({ messages: await listCapturedMail(dataSource) }),
    }),
  ];
}
