import { rateLimit, ipKeyGenerator, type Store } from 'express-rate-limit';
import type { Request, RequestHandler } from 'express';
import { addMemberInput, resendVerificationInput, signInInput, verifyEmailInput } from '../../shared/api/schemas';
import type { KnownDevices } from '../auth/knownDevices';
import type { ServerConfig } from '../config';
import { AppError } from './errors';

const FIFTEEN_MINUTES = 15 * 60 * 1000;
const ONE_HOUR = 60 * 60 * 1000;

/** Failed sign-ins for one account from all unknown sources together, per hour (known devices are not counted nor stopped). */
export const FAILED_SIGNINS_PER_ACCOUNT_PER_HOUR = 100;

/** Past the cap across sources, every sign-in attempt for the account waits this long before its password is checked. */
export const SIGN_IN_DELAY_AT_CAP_MS = 1000;

/** Confirmation e-mails one address may be sent on request, per hour, whoever asks. */
export const CONFIRMATION_MAILS_PER_ADDRESS_PER_HOUR = 5;

const CAP_REACHED = 'signInCapReached';

let sharedStores: ((prefix: string) => Store) | null = null;

/**
 * With several server processes, counters must be shared (e.g. a Redis store): limiters created after
 * this call count in stores from `factory` (one per limiter, by prefix); null returns to in-memory counting.
 */
export function useSharedLimitStores(factory: ((prefix: string) => Store) | null): void {
  sharedStores = factory;
}

/** The store a limiter named `name` counts in: shared when configured, else undefined (express-rate-limit's memory store). */
export function limitStore(name: string): Store | undefined {
  return sharedStores?.(`rungbook:limit:${name}:`);
}

function refuse(message: string): RequestHandler {
  return (_req, _res, next) => next(new AppError('rate_limited', message));
}

/** The client's network address; behind a proxy only as trusted by TRUST_PROXY (Express 'trust proxy'). */
const sourceAddress = (req: Request) => ipKeyGenerator(req.ip ?? '');

/** The signed-in person (set by the session loader), if any. */
const signedInUserId = (req: Request) => (req.res?.locals.user as { id?: string } | null | undefined)?.id;

/** Several middlewares as one: each must call next() for the following one to run. */
function inSequence(...handlers: RequestHandler[]): RequestHandler {
  return (req, res, next) => {
    const run = (index: number): void => {
      if (index === handlers.length) return next();
      void handlers[index](req, res, (error?: unknown) => (error ? next(error) : run(index + 1)));
    };
    run(0);
  };
}

function perSource(name: string, limit: number, message: string): RequestHandler {
  return rateLimit({
    store: limitStore(name),
    windowMs: FIFTEEN_MINUTES,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: sourceAddress,
    handler: (req, res, next) => refuse(message)(req, res, next),
  });
}

export interface SignInLimits {
  perIpPer15Min: number;
  perAccountPer15Min: number;
  /** Defaults to FAILED_SIGNINS_PER_ACCOUNT_PER_HOUR. */
  failedPerAccountPerHour?: number;
}

export function signInLimiters(limits: SignInLimits, knownDevices: KnownDevices): RequestHandler[] {
  /** The account named in a well-formed body (its e-mail key), else null: malformed attempts never count against an account. */
  const accountOf = (req: Request) => {
    const parsed = signInInput.safeParse(req.body);
    return parsed.success ? parsed.data.email.toLowerCase() : null;
  };
  const deviceOf = async (req: Request) => {
    const account = accountOf(req);
    return account ? knownDevices.deviceFor(req, account) : null;
  };
  // A shared network address (campus NAT) must not let one stranger lock everyone out: successes do not
  // count, and a browser that has signed in to the named account before is not counted per address.
  const perIp = rateLimit({
    store: limitStore('sign-in-per-source'),
    windowMs: FIFTEEN_MINUTES,
    limit: limits.perIpPer15Min,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    skip: async (req) => (await deviceOf(req)) !== null,
    keyGenerator: sourceAddress,
    handler: (req, res, next) => refuse('Too many sign-in attempts from this network. Wait a few minutes.')(req, res, next),
  });
  // Failures count per (account, source): a known device of the account, else the network address.
  const perAccountAndSource = rateLimit({
    store: limitStore('sign-in-per-account-and-source'),
    windowMs: FIFTEEN_MINUTES,
    limit: limits.perAccountPer15Min,
    standardHeaders: false,
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    skip: (req) => accountOf(req) === null,
    keyGenerator: async (req) => {
      const device = await deviceOf(req);
      return `account:${accountOf(req)}|${device ? `device:${device}` : `ip:${sourceAddress(req)}`}`;
    },
    handler: (req, res, next) => refuse('Too many failed sign-ins for this account. Wait 15 minutes or reset the password.')(req, res, next),
  });
  // Guessing spread over many addresses still meets a cap per account. Past it the password is still
  // checked (so no stranger can lock the owner out), but slowly, and a wrong one is refused and counted:
  // see checkAtAccountCap. The account's known devices are neither slowed nor counted.
  const perAccountFromAnywhere = rateLimit({
    store: limitStore('sign-in-per-account'),
    windowMs: ONE_HOUR,
    limit: limits.failedPerAccountPerHour ?? FAILED_SIGNINS_PER_ACCOUNT_PER_HOUR,
    standardHeaders: false,
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    skip: async (req) => accountOf(req) === null || (await deviceOf(req)) !== null,
    keyGenerator: (req) => `account:${accountOf(req)}`,
    handler: (_req, res, next) => {
      res.locals[CAP_REACHED] = true;
      next();
    },
  });
  return [perIp, perAccountAndSource, perAccountFromAnywhere];
}

/**
 * Runs the credential check of a sign-in. When the account has reached its cap of failures across
 * sources, the check waits SIGN_IN_DELAY_AT_CAP_MS first and a failure is refused as rate-limited
 * (and counted); a correct password still signs in.
 */
export async function checkAtAccountCap<T>(req: Request, check: () => Promise<T>): Promise<T> {
  if (req.res?.locals[CAP_REACHED] !== true) return check();
  await new Promise((resolve) => setTimeout(resolve, SIGN_IN_DELAY_AT_CAP_MS));
  try {
    return await check();
  } catch (error) {
    if (error instanceof AppError && error.code === 'wrong_credentials') {
      throw new AppError(
        'rate_limited',
        'E-mail or password is not correct, and this account has had many failed sign-ins from many places: each attempt now takes a moment. ' +
          'Check the password, or reset it.',
      );
    }
    throw error;
  }
}

export interface AuthRequestLimiters {
  signUp: RequestHandler;
  forgot: RequestHandler;
  reset: RequestHandler;
  /** Failed confirmations (wrong password or link) per source; each costs a password hash check. */
  verify: RequestHandler;
  /** Confirmation-link requests per source, and per address asked for. */
  resendVerification: RequestHandler;
  /** Mount after the session loader: people one person tries to add to groups (each try tells whether an address has an account). */
  groupAdds: RequestHandler;
}

export function authRequestLimiters(limits: ServerConfig['authLimits']): AuthRequestLimiters {
  return {
    signUp: perSource('sign-up', limits.signUpPerIpPer15Min, 'Too many sign-ups from this network. Wait a few minutes.'),
    forgot: perSource('forgot', limits.forgotPerIpPer15Min, 'Too many reset requests. Wait a few minutes.'),
    reset: perSource('reset', limits.resetPerIpPer15Min, 'Too many password-reset attempts from this network. Wait a few minutes.'),
    verify: rateLimit({
      store: limitStore('verify'),
      windowMs: FIFTEEN_MINUTES,
      limit: limits.resetPerIpPer15Min,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      skipSuccessfulRequests: true,
      skip: (req) => !verifyEmailInput.safeParse(req.body).success,
      keyGenerator: sourceAddress,
      handler: (req, res, next) => refuse('Too many failed confirmations from this network. Wait a few minutes.')(req, res, next),
    }),
    resendVerification: inSequence(
      perSource('resend-per-source', limits.forgotPerIpPer15Min, 'Too many confirmation e-mails asked for from this network. Wait a few minutes.'),
      rateLimit({
        store: limitStore('resend-per-address'),
        windowMs: ONE_HOUR,
        limit: CONFIRMATION_MAILS_PER_ADDRESS_PER_HOUR,
        standardHeaders: 'draft-8',
        legacyHeaders: false,
        // Counted per address asked for, whether or not it has an account: the answer tells nothing.
        skip: (req) => !resendVerificationInput.safeParse(req.body).success,
        keyGenerator: (req) => `email:${resendVerificationInput.parse(req.body).email.toLowerCase()}`,
        handler: (req, res, next) => refuse('Several confirmation e-mails were sent to this address in the last hour. Check its inbox (and spam folder), or wait a while.')(req, res, next),
      }),
    ),
    groupAdds: rateLimit({
      store: limitStore('group-adds'),
      windowMs: ONE_HOUR,
      limit: limits.groupAddsPerUserPerHour,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      // Signed-out callers get their 401 from the route; malformed bodies reveal nothing and are not counted.
      skip: (req) => !signedInUserId(req) || !addMemberInput.safeParse(req.body).success,
      keyGenerator: (req) => `user:${signedInUserId(req)}`,
      handler: (req, res, next) => refuse('You have added (or tried to add) many people to groups in the last hour. Wait a while before adding more.')(req, res, next),
    }),
  };
}
