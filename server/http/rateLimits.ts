import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import type { RequestHandler } from 'express';
import { AppError } from './errors';

const FIFTEEN_MINUTES = 15 * 60 * 1000;

function refuse(message: string): RequestHandler {
  return (_req, _res, next) => next(new AppError('rate_limited', message));
}

export function signInLimiters(limits: { perIpPer15Min: number; perAccountPer15Min: number }): RequestHandler[] {
  const perIp = rateLimit({
    windowMs: FIFTEEN_MINUTES,
    limit: limits.perIpPer15Min,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
    handler: (req, res, next) => refuse('Too many sign-in attempts from this network. Wait a few minutes.')(req, res, next),
  });
  // Only failed attempts count against an account, so its owner is not locked out by their own use.
  const perAccount = rateLimit({
    windowMs: FIFTEEN_MINUTES,
    limit: limits.perAccountPer15Min,
    standardHeaders: false,
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    keyGenerator: (req) => `account:${String((req.body as { email?: unknown })?.email ?? '').trim().toLowerCase()}`,
    handler: (req, res, next) => refuse('Too many failed sign-ins for this account. Wait 15 minutes or reset the password.')(req, res, next),
  });
  return [perIp, perAccount];
}

export function mailRequestLimiter(): RequestHandler {
  return rateLimit({
    windowMs: FIFTEEN_MINUTES,
    limit: 10,
    legacyHeaders: false,
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
    handler: (req, res, next) => refuse('Too many reset requests. Wait a few minutes.')(req, res, next),
  });
}
