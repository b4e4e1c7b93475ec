import { ipKeyGenerator } from 'express-rate-limit';
import type { Request } from 'express';
import { z } from 'zod';
import { idParam } from '../../shared/api/schemas';
import { presentationInput } from '../../shared/notebook/sharing';
import { EventStreamReply, route } from '../http/route';
import type { Services } from '../services';
import type { SignedInUser } from '../auth/sessions';
import type { LinkHolder } from '../services/live';

const notebookParams = z.object({ notebookId: idParam });
// Any text: a malformed token gets the same 404 as an unknown one.
const sharedParams = z.object({ token: z.string() });

// Counted per person when signed in, else per network address (an IPv6 /56 counts as one, as in the rate limits).
const linkHolder = (user: SignedInUser | null | undefined, req: Request): LinkHolder => (user ? { userId: user.id } : { address: ipKeyGenerator(req.ip ?? '') });

export function liveRoutes({ live }: Services) {
  return [
    route({ method: 'get', path: '/notebooks/:notebookId/events', access: 'signed-in', eventStream: true, summary: 'Live events of a notebook (text/event-stream: hello, changed, presence, presenter, role, revoked; 429 beyond 10 open streams per person)', params: notebookParams,
      handler: async ({ user, params, sessionId }) => new EventStreamReply(await live.watch(user!, params.notebookId, sessionId)) }),
    route({ method: 'get', path: '/shared/:token/events', access: 'public', eventStream: true, summary: 'Live events of the notebook behind a share link, read-only (404 for unknown, expired or revoked links; 429 beyond 10 open streams per network address, 100 per notebook)', params: sharedParams,
      handler: async ({ params, user, req }) => new EventStreamReply(await live.watchShared(params.token, linkHolder(user, req))) }),
    route({ method: 'post', path: '/notebooks/:notebookId/presentation', access: 'signed-in', summary: 'Present the notebook, or move your presentation to another cell (editors, with the notebook open: 409 otherwise)', params: notebookParams, body: presentationInput,
      handler: async ({ user, params, body }) => ({ presenter: await live.present(user!, params.notebookId, body.cellId) }) }),
    route({ method: 'delete', path: '/notebooks/:notebookId/presentation', access: 'signed-in', summary: 'Stop the presentation (the presenter, or anyone who may present)', params: notebookParams,
      handler: async ({ user, params }) => live.stopPresenting(user!, params.notebookId) }),
  ];
}
