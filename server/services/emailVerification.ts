import { isUsableLink, newLinkToken, sha256Hex as sha256 } from '../auth/linkTokens';
import { IsNull, type DataSource, type EntityManager } from 'typeorm';
import type { PublicUser } from '../../shared/api/schemas';
import { verifyAgainstDecoy, verifyPassword } from '../auth/passwords';
import type { SessionService } from '../auth/sessions';
import { EmailVerificationToken, User } from '../db/entities';
import { AppError } from '../http/errors';
import type { Mailer, OutgoingMessage } from '../mail/mailer';
import { emailKey, toPublicUser } from './accounts';
import type { NotebookEventBus } from './notebookEvents';
import { acceptInvitations } from './sharing';

export const VERIFICATION_TOKEN_LIFETIME_MS = 24 * 3600 * 1000;


const invalidLink = () =>
  new AppError('invalid_verification_token', 'This confirmation link is invalid, already used or expired. Ask for a new one under "Resend the confirmation e-mail" on the sign-in page.');

const PASSWORD_MISMATCH =
  'This link is for an account with a different password. If you mistyped, try again. If you did not create this account, or forgot its password, ' +
  'use "Forgot password" to set your own: that confirms the address and signs everyone else out.';

const wrongPassword = () => new AppError('invalid_verification_token', PASSWORD_MISMATCH, { password: 'Not the password of this account' });

export interface EmailVerificationService {
  /** Create a link for this account and return the message carrying it (call from a mailer task, off the request path). */
  linkMessage(user: Pick<User, 'id' | 'name' | 'email'>): Promise<OutgoingMessage>;
  /** Create a link for this account and e-mail it, off the request path. */
  sendLinkLater(user: Pick<User, 'id' | 'name' | 'email'>): void;
  /**
   * Send a fresh link to this address if it belongs to an account waiting for confirmation. The lookup
   * and the mail happen after the reply, which is the same for every address.
   */
  resend(email: string): { message: string };
  /**
   * Consume a link, given the account's password: marks the address verified, spends every link of the
   * account and ends all its sessions; returns the account (whose owner may now be signed in).
   */
  verify(token: string, password: string): Promise<PublicUser>;
}

/** Spends every outstanding confirmation link of the account (after a confirmation or a password reset). */
export async function spendVerificationLinks(manager: EntityManager, userId: string, at: Date): Promise<void> {
  await manager.update(EmailVerificationToken, { userId, usedAt: IsNull() }, { usedAt: at });
}

export function createEmailVerificationService(
  dataSource: DataSource,
  mailer: Mailer,
  sessions: SessionService,
  publicUrl: string,
  now: () => Date = () => new Date(),
  /** Told about notebooks whose invitations a confirmation accepted. */
  events?: Pick<NotebookEventBus, 'publish' | 'accessChanged'>,
): EmailVerificationService {
  const tokens = dataSource.getRepository(EmailVerificationToken);
  const users = dataSource.getRepository(User);

  // A link confirming a change of address (newEmail set) never confirms a sign-up.
  const isUsable = (row: EmailVerificationToken | null): row is EmailVerificationToken => isUsableLink(row, now()) && row?.newEmail === null;

  async function linkMessage(user: Pick<User, 'id' | 'name' | 'email'>): Promise<OutgoingMessage> {
    const token = newLinkToken();
    await tokens.insert({
      tokenHash: sha256(token),
      userId: user.id,
      expiresAt: new Date(now().getTime() + VERIFICATION_TOKEN_LIFETIME_MS),
      usedAt: null,
      newEmail: null,
    });
    return {
      to: user.email,
      subject: 'Confirm your Rungbook e-mail address',
      text:
        `Hello ${user.name},\n\nplease confirm that this is your address by opening this link within 24 hours ` +
        `and entering your Rungbook password (the link works once and signs you in):\n\n${publicUrl}/verify-email?token=${token}\n\n` +
        `If the password you chose is not accepted, someone else may have signed up with your address: ` +
        `set your own password at ${publicUrl}/forgot-password instead.\n\n` +
        `If you did not create a Rungbook account, ignore this message.\n`,
    };
  }

  /** The account the link confirms, or null; spends an argon2 verification either way so timing tells nothing. */
  async function accountMatching(token: string, password: string): Promise<{ user: User | null; passwordMatches: boolean }> {
    const row = await tokens.findOneBy({ tokenHash: sha256(token) });
    const user = isUsable(row) ? await users.findOneBy({ id: row.userId }) : null;
    const passwordMatches = user ? await verifyPassword(user.passwordHash, password) : await verifyAgainstDecoy(password);
    return { user, passwordMatches };
  }

  return {
    linkMessage,

    sendLinkLater(user) {
      mailer.sendLater(() => linkMessage(user));
    },

    resend(email) {
      mailer.sendLater(async () => {
        const user = await users.findOneBy({ emailKey: emailKey(email) });
        return user && user.emailVerifiedAt === null ? linkMessage(user) : null;
      });
      return { message: 'If an account with this e-mail is waiting for confirmation, a new link is on its way. It works for 24 hours.' };
    },

    async verify(token, password) {
      // The password is checked before the link is spent: a wrong one leaves the link usable.
      const { user, passwordMatches } = await accountMatching(token, password);
      if (!user) throw invalidLink();
      if (!passwordMatches) throw wrongPassword();
      const { verified, accepted } = await dataSource.transaction(async (manager) => {
        if (!isUsable(await manager.findOneBy(EmailVerificationToken, { tokenHash: sha256(token) }))) throw invalidLink();
        await spendVerificationLinks(manager, user.id, now());
        await manager.update(User, { id: user.id, emailVerifiedAt: IsNull() }, { emailVerifiedAt: now() });
        // The confirmed address now proves who was invited: notebooks shared with it before sign-up open.
        const accepted = await acceptInvitations(manager, user, now());
        return { verified: await manager.findOneByOrFail(User, { id: user.id }), accepted };
      });
      for (const change of accepted) {
        events?.publish(change);
        events?.accessChanged({ notebookId: change.notebookId });
      }
      // Whoever was signed in to this account before it was confirmed is signed out.
      await sessions.endAllFor(user.id);
      return toPublicUser(verified);
    },
  };
}
