import { ipKeyGenerator } from 'express-rate-limit';
import { z } from 'zod';
import { changeEmailInput, changeNameInput, changePasswordInput, confirmEmailChangeInput, sessionIdParam } from '../../shared/api/account';
import { route } from '../http/route';
import type { Services } from '../services';

/** Account settings of the signed-in person: name, password, e-mail address, sessions. */
export function accountRoutes({ accountSettings, accountSessions }: Services) {
  return [
    route({
      method: 'patch',
      path: '/me',
      access: 'signed-in',
      summary: 'Change the name shown to other people',
      body: changeNameInput,
      handler: async ({ user, body }) => ({ user: await accountSettings.changeName(user!.id, body.name) }),
    }),
    route({
      method: 'post',
      path: '/me/password',
      access: 'signed-in',
      summary: 'Change the password, given the current one; every other session of the account ends',
      body: changePasswordInput,
      handler: async ({ user, sessionId, body }) => accountSettings.changePassword(user!.id, sessionId, body),
    }),
    route({
      method: 'post',
      path: '/me/email',
      access: 'signed-in',
      summary: 'Ask to change the e-mail address, given the password: a link goes to the new address, and the address changes only when it is opened',
      body: changeEmailInput,
      status: 202,
      handler: async ({ user, body }) => accountSettings.requestEmailChange(user!.id, body),
    }),
    route({
      method: 'post',
      path: '/auth/email-change/confirm',
      access: 'public',
      summary: 'Open the link e-mailed to a new address: the account takes that address, and the old address is told',
      body: confirmEmailChangeInput,
      handler: async ({ body, req }) => accountSettings.confirmEmailChange(body.token, ipKeyGenerator(req.ip ?? '')),
    }),
    route({
      method: 'get',
      path: '/me/sessions',
      access: 'signed-in',
      summary: 'The live sessions of the account: when each started, when it was last seen, which browser, and which one is asking',
      handler: async ({ user, sessionId }) => ({ sessions: await accountSessions.list(user!.id, sessionId) }),
    }),
    route({
      method: 'delete',
      path: '/me/sessions/:sessionId',
      access: 'signed-in',
      summary: 'End one other session of the account (the current one signs out instead)',
      params: sessionIdParam,
      handler: async ({ user, sessionId, params }) => accountSessions.endOne(user!.id, sessionId, params.sessionId),
    }),
    route({
      method: 'post',
      path: '/me/sessions/end-others',
      access: 'signed-in',
      summary: 'End every session of the account but this one',
      body: z.unknown(),
      async handler({ user, sessionId }) {
        const ended = await accountSessions.endOthers(user!.id, sessionId);
        return { ended, message: ended ? `Signed out everywhere else (${ended === 1 ? '1 session' : `${ended} sessions`}).` : 'No other session was open.' };
      },
    }),
  ];
}
