import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import type { Request, RequestHandler } from 'express';
import { signInInput } from '../../shared/api/schemas';
import type { KnownDevices } from '../auth/knownDevices';
import type { ServerConfig } from '../config';
import { AppError } from './errors';

const FIFTEEN_MINUTES = 15 * 60 * 1000;

function refuse(message: string): RequestHandler {
  return (_req, _res, next) => next(new AppError('rate_limited', message));
}

/** The client's network address; behind a proxy only as trusted by TRUST_PROXY (Express 'trust proxy'). */
const sourceAddress = (req: Request) => ipKeyGenerator(req.ip ?? '');

function perSource(limit: number, message: string): RequestHandler {
  return rateLimit({
    windowMs: FIFTEEN_MINUTES,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: sourceAddress,
    handler: (req, res, next) => refuse(message)(req, res, next),
  });
}

export function signInLimiters(limits: ServerConfig['signInLimits'], knownDevices: KnownDevices): RequestHandler[] {
  const perIp = perSource(limits.perIpPer15Min, 'Too many sign-in attempts from this network. Wait a few minutes.');
  // Failures count per (account, source): a known device of the account, else the network address.
  // Malformed attempts never reach the account count, and successes do not count at all.
  const perAccountAndSource = rateLimit({
    windowMs: FIFTEEN_MINUTES,
    limit: limits.perAccountPer15Min,
    standardHeaders: false,
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    skip: (req) => !signInInput.safeParse(req.body).success,
    keyGenerator: (req) => {
      const account = signInInput.parse(req.body).email.toLowerCase();
      const device = knownDevices.deviceFor(req, account);
      return `account:${account}|${device ? `device:${device}` : `ip:${sourceAddress(req)}`}`;
    },
    handler: (req, res, next) => refuse('Too many failed sign-ins for this account. Wait 15 minutes or reset the password.')(req, res, next),
  });
  return [perIp, perAccountAndSource];
}

export interface AuthRequestLimiters {
  signUp: RequestHandler;
  forgot: RequestHandler;
  reset: RequestHandler;
  /** Mount after the session loader: counts per signed-in person. */
  resendVerification: RequestHandler;
}

export function authRequestLimiters(limits: ServerConfig['authLimits']): AuthRequestLimiters {
  return {
    signUp: perSource(limits.signUpPerIpPer15Min, 'Too many sign-ups from this network. Wait a few minutes.'),
    forgot: perSource(limits.forgotPerIpPer15Min, 'Too many reset requests. Wait a few minutes.'),
    reset: perSource(limits.resetPerIpPer15Min, 'Too many password-reset attempts from this network. Wait a few minutes.'),
    resendVerification: rateLimit({
      windowMs: FIFTEEN_MINUTES,
      limit: limits.forgotPerIpPer15Min,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      keyGenerator: (req) => {
        const userId = (req.res?.locals.user as { id?: string } | null | undefined)?.id;
        return userId ? `user:${userId}` : `ip:${sourceAddress(req)}`;
      },
      handler: (req, res, next) => refuse('Too many verification e-mails asked for. Wait a few minutes.')(req, res, next),
    }),
  };
}
