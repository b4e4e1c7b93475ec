import { createHash, randomBytes } from 'node:crypto';
import { IsNull, type DataSource } from 'typeorm';
import type { PublicUser } from '../../shared/api/schemas';
import type { SessionService, SignedInUser } from '../auth/sessions';
import { EmailVerificationToken, User } from '../db/entities';
import { AppError } from '../http/errors';
import type { Mailer } from '../mail/mailer';
import { toPublicUser } from './accounts';

export const VERIFICATION_TOKEN_LIFETIME_MS = 24 * 3600 * 1000;

const sha256 = (text: string) => createHash('sha256').update(text).digest('hex');

export interface EmailVerificationService {
  /** Create a link for this account and e-mail it, off the request path. */
  sendLinkLater(user: Pick<User, 'id' | 'name' | 'email'>): void;
  /** Send a fresh link to a signed-in person whose address is not verified yet. */
  resend(viewer: SignedInUser): Promise<{ message: string }>;
  /** Consume a link: marks the address verified and returns the account (whose owner may now be signed in). */
  verify(token: string): Promise<PublicUser>;
}

export function createEmailVerificationService(
  dataSource: DataSource,
  mailer: Mailer,
  sessions: SessionService,
  publicUrl: string,
  now: () => Date = () => new Date(),
): EmailVerificationService {
  const tokens = dataSource.getRepository(EmailVerificationToken);

  function sendLinkLater(user: Pick<User, 'id' | 'name' | 'email'>) {
    mailer.sendLater(async () => {
      const token = randomBytes(32).toString('base64url');
      await tokens.insert({
        tokenHash: sha256(token),
        userId: user.id,
        expiresAt: new Date(now().getTime() + VERIFICATION_TOKEN_LIFETIME_MS),
        usedAt: null,
      });
      return {
        to: user.email,
        subject: 'Confirm your Rungbook e-mail address',
        text:
          `Hello ${user.name},\n\nplease confirm that this is your address by opening this link within 24 hours ` +
          `(it works once and signs you in):\n\n${publicUrl}/verify-email?token=${token}\n\n` +
          `If you did not create a Rungbook account, ignore this message.\n`,
      };
    });
  }

  return {
    sendLinkLater,

    async resend(viewer) {
      if (viewer.emailVerified) throw new AppError('conflict', 'Your e-mail address is already verified.');
      sendLinkLater(viewer);
      return { message: `A new confirmation link is on its way to ${viewer.email}.` };
    },

    async verify(token) {
      const user = await dataSource.transaction(async (manager) => {
        const row = await manager.findOneBy(EmailVerificationToken, { tokenHash: sha256(token) });
        if (!row || row.usedAt || row.expiresAt.getTime() <= now().getTime()) {
          throw new AppError('invalid_verification_token', 'This confirmation link is invalid, already used or expired. Sign in and ask for a new one.');
        }
        await manager.update(EmailVerificationToken, { userId: row.userId, usedAt: IsNull() }, { usedAt: now() });
        await manager.update(User, { id: row.userId, emailVerifiedAt: IsNull() }, { emailVerifiedAt: now() });
        return manager.findOneByOrFail(User, { id: row.userId });
      });
      sessions.forgetCached(user.id);
      return toPublicUser(user);
    },
  };
}
