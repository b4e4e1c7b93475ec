import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { Logger } from 'pino';
import type { ErrorCode } from '../../shared/api/errors';
import type { SessionService } from '../auth/sessions';
import { AppError } from './errors';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

function readCookie(header: string | undefined, name: string): string | undefined {
  if (!header) return undefined;
  for (const part of header.split(';')) {
    const [key, ...rest] = part.trim().split('=');
    if (key !== name) continue;
    try {
      return decodeURIComponent(rest.join('='));
    } catch {
      return undefined; // a mangled cookie is no session, not a server error
    }
  }
  return undefined;
}

/**
 * CSRF defence by origin check: a state-changing request must come from our own origin. Browsers
 * always send Origin (or at least Referer) on cross-site POSTs, so a missing pair is accepted only
 * when no session cookie rides along (scripts and API clients without cookies).
 */
export function sameOriginGuard(allowedOrigins: string[], sessionCookieName: string): RequestHandler {
  const allowed = new Set(allowedOrigins);
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    const origin = req.get('origin') ?? originOf(req.get('referer'));
    if (origin === undefined) {
      if (readCookie(req.headers.cookie, sessionCookieName)) {
        return next(new AppError('cross_site_request', 'Request refused: it did not say which site sent it.'));
      }
      return next();
    }
    // Only the configured origins: an origin derived from the Host header would let a DNS-rebinding page
    // (its own name pointed at this server) pass the check.
    if (allowed.has(origin)) return next();
    next(new AppError('cross_site_request', 'Request refused: it came from another site.'));
  };
}

function originOf(referer: string | undefined): string | undefined {
  if (!referer) return undefined;
  try {
    return new URL(referer).origin;
  } catch {
    return 'invalid';
  }
}

/** Attach the signed-in user (or null) to res.locals and keep the session cookie fresh. */
export function sessionLoader(sessions: SessionService): RequestHandler {
  return async (req, res, next) => {
    try {
      const sessionId = readCookie(req.headers.cookie, sessions.cookieName);
      const { user, sessionId: validId, refreshCookie } = await sessions.resolve(sessionId);
      res.locals.user = user;
      res.locals.sessionId = validId;
      if (refreshCookie) res.append('Set-Cookie', refreshCookie);
      next();
    } catch (error) {
      next(error);
    }
  };
}

/** Before a large body is read: whoever is not signed in is refused without it (every such route is for signed-in people). */
export const signedInBeforeBody: RequestHandler = (_req, res, next) => {
  if (res.locals.user) return next();
  next(new AppError('unauthenticated', 'Sign in to continue.'));
};

export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new AppError('not_found', `No API route ${req.method} ${req.path}`));
};

/** The single place where errors become HTTP replies. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (error, req, res, _next) => {
    const appError = toAppError(error);
    if (appError.code === 'internal') logger.error({ err: error, path: req.path }, 'unhandled error');
    if (res.headersSent) return;
    res.status(appError.status).json(appError.toBody());
  };
}

/** Errors from Express and its body parser that describe the request (status 4xx) keep a 4xx. */
const STATUS_CODES: Partial<Record<number, ErrorCode>> = {
  400: 'validation_failed',
  401: 'unauthenticated',
  403: 'forbidden',
  404: 'not_found',
  413: 'payload_too_large',
  415: 'unsupported_encoding',
  429: 'rate_limited',
};

function toAppError(error: unknown): AppError {
  if (error instanceof AppError) return error;
  const httpError = (typeof error === 'object' && error !== null ? error : {}) as { type?: string; status?: number; statusCode?: number };
  if (httpError.type === 'entity.parse.failed') return new AppError('malformed_json', 'The request body is not valid JSON.');
  if (httpError.type === 'entity.too.large') return new AppError('payload_too_large', 'The request body is too large.');
  if (httpError.type === 'encoding.unsupported') return new AppError('unsupported_encoding', 'Request bodies may be sent plain or compressed with gzip or deflate.');
  if (httpError.type === 'charset.unsupported') return new AppError('unsupported_encoding', 'Request bodies must be JSON in UTF-8.');
  const status = httpError.status ?? httpError.statusCode;
  if (typeof status === 'number' && status >= 400 && status < 500) {
    return new AppError(STATUS_CODES[status] ?? 'validation_failed', 'The request could not be read (malformed, incomplete or not what this address accepts).');
  }
  return new AppError('internal', 'Something went wrong on the server. The error was logged.');
}
