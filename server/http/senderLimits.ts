import { ipKeyGenerator, MemoryStore, rateLimit, type Options, type Store } from 'express-rate-limit';
import type { Request, RequestHandler } from 'express';
import { AppError } from './errors';
import { limitStore } from './rateLimits';

const ONE_HOUR = 60 * 60 * 1000;
const FIFTEEN_MINUTES = 15 * 60 * 1000;

/**
 * How many e-mails of one kind (invitations, mentions) one person may cause per hour. Counted in an
 * express-rate-limit Store, so a shared store (e.g. Redis) can replace the in-memory one unchanged.
 */
export interface SenderLimit {
  readonly limitPerHour: number;
  /** Counts one e-mail for this sender; false (and nothing counted) once the hour's limit is reached. */
  take(userId: string): Promise<boolean>;
  /** Like take, but refuses with 429 rate_limited and a message naming the limit. */
  takeOrRefuse(userId: string): Promise<void>;
}

/** `name` says what is counted, in the plural, e.g. "invitation e-mails". */
export function senderLimit(limitPerHour: number, name: string, store: Store = limitStore(`sender-${name.replace(/\W+/g, '-')}`) ?? new MemoryStore()): SenderLimit {
  void store.init?.({ windowMs: ONE_HOUR } as Options);
  const key = (userId: string) => `sender:${userId}`;

  async function take(userId: string): Promise<boolean> {
    const { totalHits } = await store.increment(key(userId));
    if (totalHits <= limitPerHour) return true;
    await store.decrement(key(userId));
    return false;
  }

  return {
    limitPerHour,
    take,
    async takeOrRefuse(userId) {
      if (!(await take(userId))) {
        throw new AppError('rate_limited', `You can send at most ${limitPerHour} ${name} per hour; try again later.`);
      }
    },
  };
}

/** Mount on /shared: every request through a share link counts against its source address (slows anyone guessing tokens; SHARED_LINK_LIMIT_PER_IP). */
export function sharedLinkOpenLimiter(limit: number): RequestHandler {
  return rateLimit({
    store: limitStore('shared-link-opens'),
    windowMs: FIFTEEN_MINUTES,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req: Request) => ipKeyGenerator(req.ip ?? ''),
    handler: (_req, _res, next) => next(new AppError('rate_limited', 'Too many shared links opened from this network. Wait a few minutes.')),
  });
}
