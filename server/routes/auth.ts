import { z } from 'zod';
import { forgotPasswordInput, resendVerificationInput, resetPasswordInput, signInInput, signUpInput, verifyEmailInput } from '../../shared/api/schemas';
import { checkAtAccountCap } from '../http/rateLimits';
import { route, type RouteContext } from '../http/route';
import type { Services } from '../services';
import { emailKey } from '../services/accounts';
import { accountRoutes } from './account';

export function authRoutes(services: Services) {
  const { accounts, sessions, passwordReset, emailVerification, knownDevices } = services;
  /** One session per browser: whoever was signed in here before is signed out on the server too. */
  async function startSessionReplacing(ctx: Pick<RouteContext<unknown, unknown>, 'sessionId' | 'setCookie' | 'req'>, userId: string) {
    if (ctx.sessionId) await sessions.end(ctx.sessionId);
    ctx.setCookie(await sessions.startFor(userId, { userAgent: ctx.req.get('user-agent') }));
  }

  return [
    route({
      method: 'post',
      path: '/auth/sign-up',
      access: 'public',
      summary: 'Create an account; the reply is the same for a new and a taken address (the address owner is e-mailed either way). It signs in only once confirmed',
      body: signUpInput,
      status: 202,
      handler: async ({ body }) => accounts.signUp(body),
    }),
    route({
      method: 'post',
      path: '/auth/verify',
      access: 'public',
      summary: "Confirm an e-mail address with the token from the e-mailed link and the account's password; ends the account's other sessions and signs its owner in",
      body: verifyEmailInput,
      async handler(ctx) {
        const user = await emailVerification.verify(ctx.body.token, ctx.body.password);
        await startSessionReplacing(ctx, user.id);
        // The password was just proven, as at sign-in: this browser becomes a known device.
        ctx.setCookie(await knownDevices.cookieFor(emailKey(user.email)));
        return { user };
      },
    }),
    route({
      method: 'post',
      path: '/auth/verify/resend',
      access: 'public',
      summary: 'E-mail a fresh confirmation link to an account waiting for confirmation; the reply is the same for every address',
      body: resendVerificationInput,
      status: 202,
      handler: async ({ body }) => emailVerification.resend(body.email),
    }),
    route({
      method: 'post',
      path: '/auth/sign-in',
      access: 'public',
      body: signInInput,
      async handler(ctx) {
        const user = await checkAtAccountCap(ctx.req, () => accounts.checkCredentials(ctx.body));
        await startSessionReplacing(ctx, user.id);
        ctx.setCookie(await knownDevices.cookieFor(emailKey(user.email)));
        return { user };
      },
    }),
    route({
      method: 'post',
      path: '/auth/sign-out',
      access: 'public',
      body: z.unknown(),
      async handler({ sessionId, setCookie }) {
        setCookie(sessionId ? await sessions.end(sessionId) : sessions.blankCookie());
        return undefined;
      },
    }),
    route({
      method: 'post',
      path: '/auth/forgot',
      access: 'public',
      body: forgotPasswordInput,
      status: 202,
      async handler({ body }) {
        passwordReset.requestReset(body.email);
        return { message: 'If an account has this e-mail, a reset link is on its way.' };
      },
    }),
    route({
      method: 'post',
      path: '/auth/reset',
      access: 'public',
      body: resetPasswordInput,
      async handler({ body }) {
        await passwordReset.reset(body.token, body.password);
        return { message: 'Password changed. Sign in with the new password.' };
      },
    }),
    route({
      method: 'get',
      path: '/me',
      access: 'signed-in',
      async handler({ user }) {
        return { user };
      },
    }),
    ...accountRoutes(services),
  ];
}
