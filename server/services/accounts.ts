import type { DataSource } from 'typeorm';
import type { PublicUser, SignInInput, SignUpInput } from '../../shared/api/schemas';
import { hashPassword, verifyAgainstDecoy, verifyPassword } from '../auth/passwords';
import { User } from '../db/entities';
import { AppError } from '../http/errors';
import { newId } from '../ids';
import type { Mailer, OutgoingMessage } from '../mail/mailer';
import type { EmailVerificationService } from './emailVerification';
import { isUniqueViolation } from '../db/sql';

export const emailKey = (email: string) => email.trim().toLowerCase();

export function toPublicUser(user: Pick<User, 'id' | 'name' | 'email' | 'siteRole' | 'emailVerifiedAt'>): PublicUser {
  return { id: user.id, name: user.name, email: user.email, siteRole: user.siteRole, emailVerified: user.emailVerifiedAt !== null };
}

export interface AccountService {
  /**
   * Answers the same way whether or not the address already has an account, so sign-up cannot be used
   * to find out who has one: a new address gets a verification link, a taken one a note to its owner.
   */
  signUp(input: SignUpInput): Promise<{ message: string }>;
  /** The account for these credentials; an unconfirmed account is refused exactly like a wrong password. */
  checkCredentials(input: SignInInput): Promise<PublicUser>;
  findByEmail(email: string): Promise<User | null>;
}

export function createAccountService(dataSource: DataSource, mailer: Mailer, verification: EmailVerificationService, publicUrl: string): AccountService {
  const users = dataSource.getRepository(User);

  async function findByEmail(email: string) {
    return users.findOneBy({ emailKey: emailKey(email) });
  }

  function attemptNote(owner: Pick<User, 'name' | 'email'>): OutgoingMessage {
    return {
      to: owner.email,
      subject: 'Someone tried to sign up with your address',
      text:
        `Hello ${owner.name},\n\nsomeone (perhaps you) tried to create a Rungbook account with this e-mail address, ` +
        `which already has one.\n\nSign in: ${publicUrl}/sign-in\nForgot the password? Reset it: ${publicUrl}/forgot-password\n\n` +
        `If you started a sign-up with this address earlier and never finished it, or the password you chose is not accepted, ` +
        `someone else may have registered your address: set your own password at ${publicUrl}/forgot-password. ` +
        `That confirms the address and signs everyone else out.\n\n` +
        `If none of this was you and you have signed in before, ignore this message; nothing has changed.\n`,
    };
  }

  /** Inserts the account; false when the address is already taken (also when a concurrent sign-up won). */
  async function insertNew(user: User): Promise<boolean> {
    try {
      await users.insert(user);
      return true;
    } catch (error) {
      if (isUniqueViolation(error)) return false;
      throw error;
    }
  }

  return {
    findByEmail,

    async signUp(input) {
      // Only the hash happens before the reply, for new and taken addresses alike; the lookup, the insert
      // and the mail happen after it, so neither the reply nor its timing tells who has an account.
      const passwordHash = await hashPassword(input.password);
      const user = users.create({
        id: newId(),
        name: input.name,
        email: input.email,
        emailKey: emailKey(input.email),
        passwordHash,
        siteRole: 'member',
        emailVerifiedAt: null,
      });
      mailer.sendLater(async () => {
        if (await insertNew(user)) return verification.linkMessage(user);
        const owner = await findByEmail(input.email);
        return owner ? attemptNote(owner) : null;
      });
      return { message: `Almost done: we sent a message to ${input.email}. Follow its link to confirm the address and sign in.` };
    },

    async checkCredentials({ email, password }) {
      const user = await findByEmail(email);
      const valid = user ? await verifyPassword(user.passwordHash, password) : await verifyAgainstDecoy(password);
      // An unconfirmed account answers like a wrong password: otherwise signing up an address and then
      // signing in with the chosen password would tell whether the address was free. Its owner signs in
      // through the confirmation link, which takes the password too.
      if (!user || !valid || user.emailVerifiedAt === null) throw new AppError('wrong_credentials', 'E-mail or password is not correct.');
      return toPublicUser(user);
    },
  };
}
