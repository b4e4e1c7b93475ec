import { z } from 'zod';
import { forgotPasswordInput, resetPasswordInput, signInInput, signUpInput } from '../../shared/api/schemas';
import { route } from '../http/route';
import type { Services } from '../services';

export function authRoutes({ accounts, sessions, passwordReset }: Services) {
  return [
    route({
      method: 'post',
      path: '/auth/sign-up',
      access: 'public',
      body: signUpInput,
      status: 201,
      async handler({ body, setCookie }) {
        const { user, notices } = await accounts.signUp(body);
        setCookie(await sessions.start(user.id));
        return { user, notices };
      },
    }),
    route({
      method: 'post',
      path: '/auth/sign-in',
      access: 'public',
      body: signInInput,
      async handler({ body, setCookie }) {
        const user = await accounts.checkCredentials(body);
        setCookie(await sessions.start(user.id));
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
        await passwordReset.requestReset(body.email);
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
  ];
}
