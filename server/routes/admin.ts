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
      summary: 'Mail captured by the local mail fake (local development starts only: captured mail holds sign-in links)',
      handler: async () => {
        // Captured mail carries reset and verification links for every account: reading it on a server
        // others can reach would let one admin take over anyone's account.
        if (!config.localOnly) throw new AppError('not_found', 'The captured-mail reader exists only on a local development start (HOST on loopback, not production).');
        return { messages: await listCapturedMail(dataSource) };
      },
    }),
  ];
}
