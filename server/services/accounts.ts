import type { DataSource } from 'typeorm';
import type { PublicUser, SignInInput, SignUpInput } from '../../shared/api/schemas';
import { hashPassword, verifyAgainstDecoy, verifyPassword } from '../auth/passwords';
import { User } from '../db/entities';
import { AppError } from '../http/errors';
import { newId } from '../ids';
import type { Mailer } from '../mail/mailer';

export const emailKey = (email: string) => email.trim().toLowerCase();

export function toPublicUser(user: Pick<User, 'id' | 'name' | 'email' | 'siteRole'>): PublicUser {
  return { id: user.id, name: user.name, email: user.email, siteRole: user.siteRole };
}

export interface AccountService {
  signUp(input: SignUpInput): Promise<{ user: PublicUser; notices: string[] }>;
  checkCredentials(input: SignInInput): Promise<PublicUser>;
  findByEmail(email: string): Promise<User | null>;
}

export function createAccountService(dataSource: DataSource, mailer: Mailer, publicUrl: string): AccountService {
  const users = dataSource.getRepository(User);

  async function findByEmail(email: string) {
    return users.findOneBy({ emailKey: emailKey(email) });
  }

  return {
    findByEmail,

    async signUp(input) {
      if (await findByEmail(input.email)) {
        throw new AppError('email_taken', 'An account with this e-mail already exists. Sign in or reset your password.', {
          email: 'This e-mail is already registered',
        });
      }
      const user = users.create({
        id: newId(),
        name: input.name,
        email: input.email,
        emailKey: emailKey(input.email),
        passwordHash: await hashPassword(input.password),
        siteRole: 'member',
      });
      try {
        await users.insert(user);
      } catch (error) {
        // Two sign-ups racing for one address: the unique index decides.
        if (String(error).includes('UNIQUE')) throw new AppError('email_taken', 'An account with this e-mail already exists.');
        throw error;
      }
      const { delivered } = await mailer.send({
        to: user.email,
        subject: 'Welcome to Rungbook',
        text: `Hello ${user.name},\n\nyour Rungbook account is ready: ${publicUrl}/sign-in\n`,
      });
      const notices = delivered ? [] : ['Your account was created, but the welcome e-mail could not be sent.'];
      return { user: toPublicUser(user), notices };
    },

    async checkCredentials({ email, password }) {
      const user = await findByEmail(email);
      const valid = user ? await verifyPassword(user.passwordHash, password) : await verifyAgainstDecoy(password);
      if (!user || !valid) throw new AppError('wrong_credentials', 'E-mail or password is not correct.');
      return toPublicUser(user);
    },
  };
}
