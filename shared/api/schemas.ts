import { z } from 'zod';
import { JOB_LIMITS } from '../jobs/contract/limits';

/** Input schemas shared by the API (validation at the edge) and the app (form checks). */

export const emailSchema = z
  .string({ error: 'E-mail is required' })
  .trim()
  .max(254, 'E-mail is too long')
  .pipe(z.email({ error: 'Enter a valid e-mail address' }));

export const passwordSchema = z
  .string({ error: 'Password is required' })
  .min(10, 'Password must be at least 10 characters')
  .max(200, 'Password must be at most 200 characters');

export const personNameSchema = z
  .string({ error: 'Name is required' })
  .trim()
  .min(1, 'Name is required')
  .max(120, 'Name must be at most 120 characters');

export const signUpInput = z.strictObject({
  name: personNameSchema,
  email: emailSchema,
  password: passwordSchema,
});

export const signInInput = z.strictObject({
  email: emailSchema,
  password: z.string({ error: 'Password is required' }).min(1, 'Password is required').max(200),
});

export const forgotPasswordInput = z.strictObject({ email: emailSchema });

export const resetPasswordInput = z.strictObject({
  token: z.string({ error: 'Reset token is required' }).regex(/^[A-Za-z0-9_-]{20,100}$/, 'Reset link is malformed'),
  password: passwordSchema,
});

/** Confirming an address takes the account's password too: a link alone must not sign anyone in to an account someone else set up. */
export const verifyEmailInput = z.strictObject({
  token: z.string({ error: 'Verification token is required' }).regex(/^[A-Za-z0-9_-]{20,100}$/, 'Verification link is malformed'),
  password: z.string({ error: 'Password is required' }).min(1, 'Password is required').max(200),
});

/** Asking for a fresh confirmation link: public, so it names the address (the reply is the same for any address). */
export const resendVerificationInput = z.strictObject({ email: emailSchema });

export const siteRoles = ['admin', 'member'] as const;
export const groupRoles = ['lead', 'member'] as const;
export type SiteRole = (typeof siteRoles)[number];
export type GroupRole = (typeof groupRoles)[number];

export const createGroupInput = z.strictObject({
  name: z.string().trim().min(2, 'Group name must be at least 2 characters').max(120),
  description: z.string().trim().max(1000).default(''),
});

export const addMemberInput = z.strictObject({
  email: emailSchema,
  role: z.enum(groupRoles).default('member'),
});

export const changeMemberRoleInput = z.strictObject({ role: z.enum(groupRoles) });

export const idParam = z.string().regex(/^[a-z0-9]{10,40}$/, 'Malformed id');

export type SignUpInput = z.infer<typeof signUpInput>;
export type SignInInput = z.infer<typeof signInInput>;
export type VerifyEmailInput = z.infer<typeof verifyEmailInput>;
export type CreateGroupInput = z.infer<typeof createGroupInput>;
export type AddMemberInput = z.infer<typeof addMemberInput>;

/** Shapes the API returns. */
export interface PublicUser {
  id: string;
  name: string;
  email: string;
  siteRole: SiteRole;
  /** Whether the owner confirmed the address through the e-mailed link (needed to join a group). */
  emailVerified: boolean;
}

export interface GroupSummary {
  id: string;
  name: string;
  description: string;
  myRole: GroupRole | null;
  memberCount: number;
}

export interface GroupMember {
  userId: string;
  name: string;
  email: string;
  role: GroupRole;
}

export interface GroupDetail extends GroupSummary {
  members: GroupMember[];
}

export interface CapturedMessage {
  id: number;
  from: string;
  to: string;
  subject: string;
  text: string;
  receivedAt: string;
}

export interface HealthReport {
  status: 'ok' | 'degraded';
  database: 'ok' | 'unreachable';
  /** Where engine jobs run: this server's own threads, or a shared queue (reachable or not). */
  queue: 'in-process' | 'ok' | 'unreachable' | 'unknown';
  /** Worker processes serving the shared queue, or this server's job threads. */
  workers: number;
  mail: 'fake' | 'smtp';
  version: string;
}

/** Numbers in the LaTeX export: `digits` significant digits (all computed digits when absent); `exact=false` keeps decimals instead of fractions. */
export const latexExportQuery = z.strictObject({
  digits: z.coerce.number().int('Digits must be a whole number').min(3, 'At least 3 digits').max(JOB_LIMITS.maxDigits, `At most ${JOB_LIMITS.maxDigits} digits`).optional(),
  exact: z.enum(['true', 'false'], 'exact is true or false').optional(),
});
export type LatexExportQuery = z.infer<typeof latexExportQuery>;
