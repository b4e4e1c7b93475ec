// The only module that knows about lucia: the rest of the server asks for sessions through these
// functions, so the session library can be replaced without touching routes or services.
import { sha256Hex } from './linkTokens';
import { Lucia, type Adapter, type DatabaseSession, type DatabaseUser } from 'lucia';
import { LessThan, type DataSource } from 'typeorm';
import { Session, User } from '../db/entities';
import type { SiteRole } from '../../shared/api/schemas';

interface UserAttributes {
  name: string;
  email: string;
  siteRole: SiteRole;
  emailVerified: boolean;
}

declare module 'lucia' {
  interface Register {
    Lucia: SessionManager;
    DatabaseUserAttributes: UserAttributes;
  }
}

/** The database key of a session: SHA-256 (hex) of the token that only the cookie carries. */
export const sessionKey = (sessionId: string) => sha256Hex(sessionId);

/**
 * lucia 3 hands its adapter the session token itself as `id`. This adapter stores and looks up only
 * sessionKey(id), so a copy of the sessions table yields no usable cookie; replies to lucia carry
 * the token it asked about, so lucia's cookie handling is unchanged. getUserSessions can only return
 * the stored keys (lucia uses it only for its own listing API, which Rungbook does not call).
 */
class HashingSessionAdapter implements Adapter {
  constructor(private readonly dataSource: DataSource) {}

  private get sessions() {
    return this.dataSource.getRepository(Session);
  }

  async getSessionAndUser(sessionId: string): Promise<[DatabaseSession | null, DatabaseUser | null]> {
    const row = await this.sessions.findOne({ where: { id: sessionKey(sessionId) }, relations: { user: true } });
    if (!row || !row.user) return [null, null];
    const { user } = row;
    return [
      { id: sessionId, userId: row.userId, expiresAt: row.expiresAt, attributes: {} },
      { id: user.id, attributes: { name: user.name, email: user.email, siteRole: user.siteRole, emailVerified: user.emailVerifiedAt !== null } },
    ];
  }

  async getUserSessions(userId: string): Promise<DatabaseSession[]> {
    const rows = await this.sessions.findBy({ userId });
    return rows.map((row) => ({ id: row.id, userId: row.userId, expiresAt: row.expiresAt, attributes: {} }));
  }

  async setSession(session: DatabaseSession): Promise<void> {
    await this.sessions.insert({ id: sessionKey(session.id), userId: session.userId, expiresAt: session.expiresAt });
  }

  async updateSessionExpiration(sessionId: string, expiresAt: Date): Promise<void> {
    await this.sessions.update({ id: sessionKey(sessionId) }, { expiresAt });
  }

  async deleteSession(sessionId: string): Promise<void> {
    await this.sessions.delete({ id: sessionKey(sessionId) });
  }

  async deleteUserSessions(userId: string): Promise<void> {
    await this.sessions.delete({ userId });
  }

  async deleteExpiredSessions(): Promise<void> {
    await this.sessions.delete({ expiresAt: LessThan(new Date()) });
  }
}

function createLucia(dataSource: DataSource, secureCookie: boolean) {
  return new Lucia(new HashingSessionAdapter(dataSource), {
    sessionCookie: { name: 'rungbook_session', attributes: { secure: secureCookie, sameSite: 'lax' } },
    getUserAttributes: (attributes) => attributes,
  });
}

export type SessionManager = ReturnType<typeof createLucia>;

export interface SignedInUser {
  id: string;
  name: string;
  email: string;
  siteRole: SiteRole;
  emailVerified: boolean;
}

export interface SessionService {
  cookieName: string;
  /** Start a session; returns the Set-Cookie header value. */
  start(userId: string): Promise<string>;
  /** Resolve a session id; `refreshCookie` is set when the session was extended or must be cleared. */
  resolve(sessionId: string | undefined): Promise<{ user: SignedInUser | null; sessionId: string | null; refreshCookie?: string }>;
  end(sessionId: string): Promise<string>;
  endAllFor(userId: string): Promise<void>;
  /** Drop cached copies of this person (after a change such as verifying the e-mail address). */
  forgetCached(userId: string): void;
  blankCookie(): string;
}

/** How long a validated session is trusted without asking the database again (single server process). */
const VALIDATION_CACHE_MS = 5_000;

export function createSessionService(dataSource: DataSource, secureCookie: boolean): SessionService {
  const lucia = createLucia(dataSource, secureCookie);
  const recentlyValidated = new Map<string, { user: SignedInUser; until: number }>();
  const forgetUser = (userId: string) => {
    for (const [id, entry] of recentlyValidated) if (entry.user.id === userId) recentlyValidated.delete(id);
  };
  return {
    cookieName: lucia.sessionCookieName,
    async start(userId) {
      const session = await lucia.createSession(userId, {});
      return lucia.createSessionCookie(session.id).serialize();
    },
    async resolve(sessionId) {
      if (!sessionId) return { user: null, sessionId: null };
      const cached = recentlyValidated.get(sessionId);
      if (cached && cached.until > Date.now()) return { user: cached.user, sessionId };
      recentlyValidated.delete(sessionId);
      const { session, user } = await lucia.validateSession(sessionId);
      if (!session || !user) return { user: null, sessionId: null, refreshCookie: lucia.createBlankSessionCookie().serialize() };
      const signedIn: SignedInUser = { id: user.id, name: user.name, email: user.email, siteRole: user.siteRole, emailVerified: user.emailVerified };
      if (recentlyValidated.size > 10_000) recentlyValidated.clear();
      recentlyValidated.set(session.id, { user: signedIn, until: Math.min(Date.now() + VALIDATION_CACHE_MS, session.expiresAt.getTime()) });
      const refreshCookie = session.fresh ? lucia.createSessionCookie(session.id).serialize() : undefined;
      return { user: signedIn, sessionId: session.id, refreshCookie };
    },
    async end(sessionId) {
      await lucia.invalidateSession(sessionId);
      recentlyValidated.delete(sessionId);
      return lucia.createBlankSessionCookie().serialize();
    },
    async endAllFor(userId) {
      await lucia.invalidateUserSessions(userId);
      forgetUser(userId);
    },
    forgetCached: forgetUser,
    blankCookie: () => lucia.createBlankSessionCookie().serialize(),
  };
}
