import { z } from 'zod';
import { emailSchema, passwordSchema, personNameSchema, type PublicUser } from './schemas';

/** Account settings: inputs checked at the edge (and in the app's forms), and the replies. */

const currentPasswordSchema = z
  .string({ error: 'Enter your current password' })
  .min(1, 'Enter your current password')
  .max(200, 'Password must be at most 200 characters');

const linkTokenSchema = z.string({ error: 'The link is incomplete' }).regex(/^[A-Za-z0-9_-]{20,100}$/, 'This link is malformed: open it again from the e-mail');

export const changeNameInput = z.strictObject({ name: personNameSchema });

export const changePasswordInput = z
  .strictObject({ currentPassword: currentPasswordSchema, newPassword: passwordSchema })
  .refine((input) => input.currentPassword !== input.newPassword, { path: ['newPassword'], message: 'Choose a password different from the current one' });

/** The password proves it is the owner asking; the new address proves itself through the e-mailed link. */
export const changeEmailInput = z.strictObject({ email: emailSchema, currentPassword: currentPasswordSchema });

export const confirmEmailChangeInput = z.strictObject({ token: linkTokenSchema });

/** Sessions are named by an id derived from their stored key: the key itself never leaves the server. */
export const sessionIdParam = z.object({ sessionId: z.string().regex(/^[a-f0-9]{32}$/, 'Malformed session id') });

export type ChangeNameInput = z.infer<typeof changeNameInput>;
export type ChangePasswordInput = z.infer<typeof changePasswordInput>;
export type ChangeEmailInput = z.infer<typeof changeEmailInput>;

export interface AccountSession {
  id: string;
  /** Null for sessions opened before the server kept this. */
  createdAt: string | null;
  lastSeenAt: string | null;
  /** e.g. "Firefox on Linux"; "Unknown browser" when the browser did not say. */
  device: string;
  current: boolean;
}

export interface SessionList {
  sessions: AccountSession[];
}

export interface EndedSessions {
  ended: number;
  message: string;
}

export interface PasswordChanged extends EndedSessions {}

export interface EmailChangeStarted {
  message: string;
}

export interface EmailChanged {
  user: PublicUser;
  message: string;
}
