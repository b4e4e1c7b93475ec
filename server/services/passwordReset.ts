import { isUsableLink, newLinkToken, sha256Hex as sha256 } from '../auth/linkTokens';
import { IsNull, type DataSource } from 'typeorm';
import { hashPassword } from '../auth/passwords';
import type { SessionService } from '../auth/sessions';
import { PasswordResetToken, User } from '../db/entities';
import { AppError } from '../http/errors';
import type { Mailer } from '../mail/mailer';
import { emailKey } from './accounts';
import { spendVerificationLinks } from './emailVerification';
import type { NotebookEventBus } from './notebookEvents';
import { acceptInvitations } from './sharing';

export const RESET_TOKEN_LIFETIME_MS = 30 * 60 * 1000;


const invalidToken = () => new AppError('invalid_reset_token', 'This reset link is invalid, already used or expired. Ask for a new one.');

export interface PasswordResetService {
  /**
   * Returns at once, the same way whether or not the account exists: the lookup, the token and the
   * e-mail happen off the request path, so neither the reply nor its timing reveals anything.
   */
  requestReset(email: string): void;
  reset(token: string, newPassword: string): Promise<void>;
}

export function createPasswordResetService(
  dataSource: DataSource,
  mailer: Mailer,
  sessions: SessionService,
  publicUrl: string,
  now: () => Date = () => new Date(),
  events?: Pick<NotebookEventBus, 'publish' | 'accessChanged'>,
): PasswordResetService {
  const tokens = dataSource.getRepository(PasswordResetToken);
  const users = dataSource.getRepository(User);

  const isUsable = (row: PasswordResetToken | null): row is PasswordResetToken => isUsableLink(row, now());

  return {
    requestReset(email) {
      const token = newLinkToken();
      mailer.sendLater(
        async () => {
          const user = await users.findOneBy({ emailKey: emailKey(email) });
          if (!user) return null;
          await tokens.insert({
            tokenHash: sha256(token),
            userId: user.id,
            expiresAt: new Date(now().getTime() + RESET_TOKEN_LIFETIME_MS),
            usedAt: null,
          });
          return {
            to: user.email,
            subject: 'Reset your Rungbook password',
            text:
              `Hello ${user.name},\n\nsomeone asked to reset the password of your Rungbook account.\n` +
              `Open this link within 30 minutes to choose a new one (it works once):\n\n${publicUrl}/reset-password?token=${token}\n\n` +
              `If it was not you, ignore this message; your password stays as it is.\n`,
          };
        },
        // A link nobody received must not stay usable.
        async () => void (await tokens.delete({ tokenHash: sha256(token) })),
      );
    },

    async reset(token, newPassword) {
      // Check the token before paying for a password hash, so junk requests cost nothing.
      if (!isUsable(await tokens.findOneBy({ tokenHash: sha256(token) }))) throw invalidToken();
      const passwordHash = await hashPassword(newPassword);
      const { userId, accepted } = await dataSource.transaction(async (manager) => {
        const row = await manager.findOneBy(PasswordResetToken, { tokenHash: sha256(token) });
        if (!isUsable(row)) throw invalidToken();
        // Using one link spends every other outstanding link of the account.
        await manager.update(PasswordResetToken, { userId: row.userId, usedAt: IsNull() }, { usedAt: now() });
        await manager.update(User, { id: row.userId }, { passwordHash });
        // Following the e-mailed link proves the address as well as a verification link does.
        const confirmed = await manager.update(User, { id: row.userId, emailVerifiedAt: IsNull() }, { emailVerifiedAt: now() });
        await spendVerificationLinks(manager, row.userId, now());
        // As with a verification link: notebooks shared with the address before it was confirmed open now.
        const accepted = confirmed.affected ? await acceptInvitations(manager, await manager.findOneByOrFail(User, { id: row.userId }), now()) : [];
        return { userId: row.userId, accepted };
      });
      for (const change of accepted) {
        events?.publish(change);
        events?.accessChanged({ notebookId: change.notebookId });
      }
      await sessions.endAllFor(userId);
    },
  };
}
