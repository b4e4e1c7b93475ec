import { rateLimit } from 'express-rate-limit';
import type { Request, RequestHandler } from 'express';
import { AppError } from './errors';
import { limitStore } from './rateLimits';

const ONE_HOUR = 60 * 60 * 1000;

/**
 * Limits versions saved by hand per signed-in person; mount after the session loader. Signed-out
 * requests pass through to the route, which refuses them.
 */
export function versionSaveLimiter(limit: number): RequestHandler {
  const userId = (req: Request) => (req.res?.locals.user as { id?: string } | null | undefined)?.id;
  return rateLimit({
    store: limitStore('version-saves'),
    windowMs: ONE_HOUR,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skip: (req) => !userId(req),
    keyGenerator: (req) => `user:${userId(req)}`,
    handler: (_req, _res, next) => next(new AppError('rate_limited', `You can save at most ${limit} versions per hour; try again later.`)),
  });
}
