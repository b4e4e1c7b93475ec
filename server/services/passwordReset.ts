import { createHash, randomBytes } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { hashPassword } from '../auth/passwords';
import type { SessionService } from '../auth/sessions';
import { PasswordResetToken, User } from '../db/entities';
import { AppError } from '../http/errors';
import type { Mailer } from '../mail/mailer';
import { emailKey } from './accounts';

export const RESET_TOKEN_LIFETIME_MS = 30 * 60 * 1000;

const sha256 = (text: string) => createHash('sha256').update(text).digest('hex');

export interface PasswordResetService {
  /** Always resolves the same way whether or not the account exists, so the reply reveals nothing. */
  requestReset(email: string): Promise<void>;
  reset(token: string, newPassword: string): Promise<void>;
}

export function createPasswordResetService(
  dataSource: DataSource,
  mailer: Mailer,
  sessions: SessionService,
  publicUrl: string,
  now: () => Date = () => new Date(),
): PasswordResetService {
  const tokens = dataSource.getRepository(PasswordResetToken);
  const users = dataSource.getRepository(User);

  return {
    async requestReset(email) {
      const user = await users.findOneBy({ emailKey: emailKey(email) });
      if (!user) return;
      const token = randomBytes(32).toString('base64url');
      await tokens.insert({
        tokenHash: sha256(token),
        userId: user.id,
        expiresAt: new Date(now().getTime() + RESET_TOKEN_LIFETIME_MS),
        usedAt: null,
      });
      const link = `${publicUrl}/reset-password?token=${token}`;
      const { delivered } = await mailer.send({
        to: user.email,
        subject: 'Reset your Rungbook password',
        text:
          `Hello ${user.name},\n\nsomeone asked to reset the password of your Rungbook account.\n` +
          `Open this link within 30 minutes to choose a new one (it works once):\n\n${link}\n\n` +
          `If it was not you, ignore this message; your password stays as it is.\n`,
      });
      if (!delivered) {
        await tokens.delete({ tokenHash: sha256(token) });
        throw new AppError('mail_unavailable', 'The reset e-mail could not be sent right now. Try again in a few minutes.');
      }
    },

    async reset(token, newPassword) {
      const passwordHash = await hashPassword(newPassword);
      const userId = await dataSource.transaction(async (manager) => {
        const row = await manager.findOneBy(PasswordResetToken, { tokenHash: sha256(token) });
        if (!row || row.usedAt || row.expiresAt.getTime() <= now().getTime()) {
          throw new AppError('invalid_reset_token', 'This reset link is invalid, already used or expired. Ask for a new one.');
        }
        await manager.update(PasswordResetToken, { tokenHash: row.tokenHash }, { usedAt: now() });
        await manager.update(User, { id: row.userId }, { passwordHash });
        return row.userId;
      });
      await sessions.endAllFor(userId);
    },
  };
}
