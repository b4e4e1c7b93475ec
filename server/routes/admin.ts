import { AppError } from '../http/errors';
import { route } from '../http/route';
import type { Services } from '../services';
import { listCapturedMail } from '../services/mailbox';

export function adminRoutes({ dataSource, config }: Services) {
  return [
    route({
      method: 'get',
      path: '/admin/mail',
      access: 'admin',
      summary: 'Mail captured by the local mail fake (development only: captured mail holds sign-in links)',
      handler: async () => {
        // Captured mail carries reset and verification links for every account: reading it in production
        // would let one admin take over anyone's account.
        if (config.production) throw new AppError('not_found', 'The captured-mail reader exists only in development.');
        return { messages: await listCapturedMail(dataSource) };
      },
    }),
  ];
}
