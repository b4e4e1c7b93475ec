import { MoreThan, Not, type DataSource } from 'typeorm';
import type { AccountSession, EndedSessions } from '../../shared/api/account';
import { sha256Hex } from '../auth/linkTokens';
import { sessionKey, type SessionService } from '../auth/sessions';
import { Session } from '../db/entities';
import { AppError } from '../http/errors';
import { deviceSummary } from './deviceSummary';

/** Last-seen times are written at most this often per session (not on every request). */
export const LAST_SEEN_RESOLUTION_MS = 60_000;

const USER_AGENT_LENGTH = 300;

export interface SessionDevice {
  userAgent: string | undefined;
}

/** The session service, also remembering when each session started, was last seen, and in which browser. */
export interface TrackedSessionService extends SessionService {
  /** Start a session for a sign-in from this browser; returns the Set-Cookie header value. */
  startFor(userId: string, device: SessionDevice): Promise<string>;
}

export interface AccountSessionService {
  /** The person's live sessions, most recently seen first; `current` marks the one asking. */
  list(userId: string, currentSessionId: string | null): Promise<AccountSession[]>;
  /** End one of the person's other sessions (the current one signs out instead). */
  endOne(userId: string, currentSessionId: string | null, publicId: string): Promise<EndedSessions>;
  /** End every session of the person but the current one. */
  endOthers(userId: string, currentSessionId: string | null): Promise<number>;
}

/** The id a session is shown under: derived from its stored key, so neither token nor key leaves the server. */
export const publicSessionId = (key: string) => sha256Hex(`listed-session:${key}`).slice(0, 32);

/** lucia's Set-Cookie value starts with "name=token"; the token is what sessionKey hashes. */
const tokenInCookie = (setCookie: string) => setCookie.split(';')[0].split('=').slice(1).join('=');

export function trackSessionActivity(sessions: SessionService, dataSource: DataSource, now: () => Date = () => new Date()): TrackedSessionService {
  const rows = dataSource.getRepository(Session);
  const lastWritten = new Map<string, number>();

  async function stamp(setCookie: string, userAgent: string | null) {
    const at = now();
    await rows.update({ id: sessionKey(tokenInCookie(setCookie)) }, { createdAt: at, lastSeenAt: at, userAgent });
    return setCookie;
  }

  async function noteSeen(sessionId: string) {
    const at = now().getTime();
    if (at - (lastWritten.get(sessionId) ?? 0) < LAST_SEEN_RESOLUTION_MS) return;
    if (lastWritten.size > 10_000) lastWritten.clear();
    lastWritten.set(sessionId, at);
    await rows.update({ id: sessionKey(sessionId) }, { lastSeenAt: new Date(at) });
  }

  return {
    ...sessions,
    start: async (userId) => stamp(await sessions.start(userId), null),
    startFor: async (userId, device) => stamp(await sessions.start(userId), device.userAgent?.slice(0, USER_AGENT_LENGTH) ?? null),
    async resolve(sessionId) {
      const resolved = await sessions.resolve(sessionId);
      if (resolved.user && resolved.sessionId) await noteSeen(resolved.sessionId);
      return resolved;
    },
  };
}

export function createAccountSessionService(dataSource: DataSource, sessions: SessionService, now: () => Date = () => new Date()): AccountSessionService {
  const rows = dataSource.getRepository(Session);
  const currentKey = (sessionId: string | null) => (sessionId ? sessionKey(sessionId) : '');

  async function endOthers(userId: string, currentSessionId: string | null) {
    const result = await rows.delete({ userId, id: Not(currentKey(currentSessionId)) });
    // Drop validations cached in this process, so the ended sessions are refused at once.
    sessions.forgetCached(userId);
    return result.affected ?? 0;
  }

  return {
    async list(userId, currentSessionId) {
      const live = await rows.find({ where: { userId, expiresAt: MoreThan(now()) } });
      const listed = live.map((row) => ({
        id: publicSessionId(row.id),
        createdAt: row.createdAt?.toISOString() ?? null,
        lastSeenAt: row.lastSeenAt?.toISOString() ?? null,
        device: deviceSummary(row.userAgent),
        current: row.id === currentKey(currentSessionId),
      }));
      return listed.sort((a, b) => Number(b.current) - Number(a.current) || (b.lastSeenAt ?? '').localeCompare(a.lastSeenAt ?? ''));
    },

    async endOne(userId, currentSessionId, publicId) {
      const target = (await rows.findBy({ userId })).find((row) => publicSessionId(row.id) === publicId);
      if (!target) throw new AppError('not_found', 'This session has already ended.');
      if (target.id === currentKey(currentSessionId)) {
        throw new AppError('conflict', 'This is the session you are using now: sign out to end it.');
      }
      await rows.delete({ id: target.id, userId });
      sessions.forgetCached(userId);
      return { ended: 1, message: 'That session has ended: the browser is signed out.' };
    },

    endOthers,
  };
}
