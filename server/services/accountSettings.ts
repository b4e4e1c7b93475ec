import { IsNull, Not, type DataSource } from 'typeorm';
import type { ChangeEmailInput, ChangePasswordInput, EmailChanged, EmailChangeStarted, PasswordChanged } from '../../shared/api/account';
import type { PublicUser } from '../../shared/api/schemas';
import { isUsableLink, newLinkToken, sha256Hex } from '../auth/linkTokens';
import { hashPassword, verifyPassword } from '../auth/passwords';
import type { SessionService } from '../auth/sessions';
import { EmailVerificationToken, PasswordResetToken, User } from '../db/entities';
import { AppError } from '../http/errors';
import type { Mailer, OutgoingMessage } from '../mail/mailer';
import { mailSafe } from '../mail/mailSafe';
import { emailKey, toPublicUser } from './accounts';
import type { AccountSessionService } from './accountSessions';
import { attemptLimit } from './attemptLimits';
import { VERIFICATION_TOKEN_LIFETIME_MS } from './emailVerification';
import type { NotebookEventBus } from './notebookEvents';
import { acceptInvitations } from './sharing';

const FIFTEEN_MINUTES = 15 * 60 * 1000;
const ONE_HOUR = 60 * 60 * 1000;

/** Wrong current passwords per person per 15 minutes: as many as failed sign-ins per account (SIGNIN_LIMIT_PER_ACCOUNT's default). */
export const WRONG_PASSWORDS_PER_PERSON_PER_15_MIN = 8;
/** Address-change e-mails one person may cause per hour: as many as confirmation e-mails per address. */
export const EMAIL_CHANGE_MAILS_PER_PERSON_PER_HOUR = 5;
/** Failed address-change confirmations per network address per 15 minutes (RESET_LIMIT_PER_IP's default). */
export const FAILED_EMAIL_CONFIRMATIONS_PER_SOURCE_PER_15_MIN = 20;

const invalidChangeLink = () =>
  new AppError('invalid_verification_token', 'This link is invalid, already used or expired. Your address has not changed: ask for a new link under Account.');

export interface AccountSettingsService {
  changeName(userId: string, name: string): Promise<PublicUser>;
  /** Needs the current password; ends every other session of the person. */
  changePassword(userId: string, currentSessionId: string | null, input: ChangePasswordInput): Promise<PasswordChanged>;
  /**
   * Needs the current password; e-mails a link to the new address (after the reply, which is the same
   * whether or not the address already has an account). The address changes only when the link is opened.
   */
  requestEmailChange(userId: string, input: ChangeEmailInput): Promise<EmailChangeStarted>;
  /** Open a change link: the account takes the new address and the old address is told. `source` counts failures. */
  confirmEmailChange(token: string, source: string): Promise<EmailChanged>;
}

export interface AccountSettingsDeps {
  dataSource: DataSource;
  mailer: Mailer;
  sessions: SessionService;
  accountSessions: AccountSessionService;
  publicUrl: string;
  events?: Pick<NotebookEventBus, 'publish' | 'accessChanged'>;
  now?: () => Date;
}

export function createAccountSettingsService({ dataSource, mailer, sessions, accountSessions, publicUrl, events, now = () => new Date() }: AccountSettingsDeps): AccountSettingsService {
  const users = dataSource.getRepository(User);
  const tokens = dataSource.getRepository(EmailVerificationToken);
  const wrongPasswords = attemptLimit(
    WRONG_PASSWORDS_PER_PERSON_PER_15_MIN,
    FIFTEEN_MINUTES,
    'Too many wrong passwords. Wait 15 minutes, or sign out and use "Forgot password" on the sign-in page.',
  );
  const changeMails = attemptLimit(
    EMAIL_CHANGE_MAILS_PER_PERSON_PER_HOUR,
    ONE_HOUR,
    `You can ask for at most ${EMAIL_CHANGE_MAILS_PER_PERSON_PER_HOUR} address-change e-mails per hour. Check the inbox (and spam folder) of the new address, or wait a while.`,
  );
  const failedConfirmations = attemptLimit(
    FAILED_EMAIL_CONFIRMATIONS_PER_SOURCE_PER_15_MIN,
    FIFTEEN_MINUTES,
    'Too many failed confirmations from this network. Wait a few minutes.',
  );

  async function requirePassword(userId: string, password: string): Promise<User> {
    await wrongPasswords.refuseIfReached(userId);
    const user = await users.findOneByOrFail({ id: userId });
    if (await verifyPassword(user.passwordHash, password)) return user;
    await wrongPasswords.count(userId);
    throw new AppError('wrong_password', 'That is not your current password.', { currentPassword: 'Not your current password' });
  }

  const isChangeLink = (row: EmailVerificationToken | null): row is EmailVerificationToken & { newEmail: string } => isUsableLink(row, now()) && row?.newEmail != null;

  async function changeLinkMessage(user: User, newEmail: string): Promise<OutgoingMessage> {
    const token = newLinkToken();
    await tokens.update({ userId: user.id, usedAt: IsNull(), newEmail: Not(IsNull()) }, { usedAt: now() });
    await tokens.insert({ tokenHash: sha256Hex(token), userId: user.id, expiresAt: new Date(now().getTime() + VERIFICATION_TOKEN_LIFETIME_MS), usedAt: null, newEmail });
    return {
      to: newEmail,
      subject: 'Confirm the new address of your Rungbook account',
      text:
        `Hello ${mailSafe(user.name)},\n\nyou asked to use this address for your Rungbook account instead of ${user.email}. ` +
        `Open this link within 24 hours to make the change (it works once):\n\n${publicUrl}/confirm-email?token=${token}\n\n` +
        `Until then you keep signing in with ${user.email}. If you did not ask for this, ignore this message: nothing changes.\n`,
    };
  }

  function addressTakenNote(user: User, newEmail: string): OutgoingMessage {
    return {
      to: newEmail,
      subject: 'Someone tried to move a Rungbook account to your address',
      text:
        `Hello,\n\nsomeone signed in as ${mailSafe(user.name)} asked to use this address for their Rungbook account. ` +
        `It already belongs to an account, so nothing was changed.\n\nIf this was you, keep using the account that has this address; ` +
        `forgot its password? Reset it: ${publicUrl}/forgot-password\n`,
    };
  }

  function changedNotice(user: Pick<User, 'name'>, oldEmail: string, newEmail: string): OutgoingMessage {
    return {
      to: oldEmail,
      subject: 'The address of your Rungbook account has changed',
      text:
        `Hello ${mailSafe(user.name)},\n\nthe e-mail address of your Rungbook account was changed from ${oldEmail} to ${newEmail}, ` +
        `through a link sent to the new address. Sign in with ${newEmail} from now on; mail about the account goes there.\n\n` +
        `If you did not make this change, someone else knows your password: tell the administrator of this Rungbook site.\n`,
    };
  }

  async function takeAddress(userId: string, token: string): Promise<{ before: User; after: User; accepted: Awaited<ReturnType<typeof acceptInvitations>> }> {
    return dataSource.transaction(async (manager) => {
      const row = await manager.findOneBy(EmailVerificationToken, { tokenHash: sha256Hex(token) });
      if (!isChangeLink(row) || row.userId !== userId) throw invalidChangeLink();
      const before = await manager.findOneByOrFail(User, { id: userId });
      const taken = await manager.findOneBy(User, { emailKey: emailKey(row.newEmail) });
      if (taken && taken.id !== userId) throw new AppError('email_taken', 'Another account now uses this address, so yours was not changed.', { email: 'Already in use' });
      await manager.update(EmailVerificationToken, { userId, usedAt: IsNull(), newEmail: Not(IsNull()) }, { usedAt: now() });
      await manager.update(User, { id: userId }, { email: row.newEmail, emailKey: emailKey(row.newEmail), emailVerifiedAt: before.emailVerifiedAt ?? now() });
      const after = await manager.findOneByOrFail(User, { id: userId });
      // As at sign-up: the confirmed address proves who was invited, so notebooks shared with it open now.
      return { before, after, accepted: await acceptInvitations(manager, after, now()) };
    });
  }

  return {
    async changeName(userId, name) {
      await users.update({ id: userId }, { name });
      sessions.forgetCached(userId);
      return toPublicUser(await users.findOneByOrFail({ id: userId }));
    },

    async changePassword(userId, currentSessionId, { currentPassword, newPassword }) {
      await requirePassword(userId, currentPassword);
      const passwordHash = await hashPassword(newPassword);
      await dataSource.transaction(async (manager) => {
        await manager.update(User, { id: userId }, { passwordHash });
        // A reset link asked for earlier would set a password over this one.
        await manager.update(PasswordResetToken, { userId, usedAt: IsNull() }, { usedAt: now() });
      });
      const ended = await accountSessions.endOthers(userId, currentSessionId);
      const others = ended === 1 ? '1 other session was' : `${ended} other sessions were`;
      return { ended, message: `Password changed. You stay signed in here; ${ended ? others : 'no other session was'} signed out.` };
    },

    async requestEmailChange(userId, { email, currentPassword }) {
      const user = await requirePassword(userId, currentPassword);
      if (emailKey(email) === user.emailKey) throw new AppError('validation_failed', 'This is already your address.', { email: 'This is already your address' });
      await changeMails.refuseIfReached(userId);
      await changeMails.count(userId);
      mailer.sendLater(async () => ((await users.findOneBy({ emailKey: emailKey(email) })) ? addressTakenNote(user, email) : changeLinkMessage(user, email)));
      return { message: `We sent a link to ${email}. Your address changes when you open it; until then you sign in with ${user.email}.` };
    },

    async confirmEmailChange(token, source) {
      await failedConfirmations.refuseIfReached(source);
      const row = await tokens.findOneBy({ tokenHash: sha256Hex(token) });
      if (!isChangeLink(row)) {
        await failedConfirmations.count(source);
        throw invalidChangeLink();
      }
      const { before, after, accepted } = await takeAddress(row.userId, token);
      for (const change of accepted) {
        events?.publish(change);
        events?.accessChanged({ notebookId: change.notebookId });
      }
      sessions.forgetCached(after.id);
      mailer.sendLater(async () => changedNotice(after, before.email, after.email));
      return { user: toPublicUser(after), message: `Your address is now ${after.email}. Sign in with it from now on.` };
    },
  };
}
