import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { Logger } from 'pino';
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
    const selfOrigin = `${req.protocol}://${req.get('host')}`;
    if (allowed.has(origin) || origin === selfOrigin) return next();
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

function toAppError(error: unknown): AppError {
  if (error instanceof AppError) return error;
  const httpError = error as { type?: string; status?: number };
  if (httpError.type === 'entity.parse.failed') return new AppError('malformed_json', 'The request body is not valid JSON.');
  if (httpError.type === 'entity.too.large') return new AppError('payload_too_large', 'The request body is too large.');
  if (httpError.type === 'encoding.unsupported' || httpError.type === 'charset.unsupported') {
    return new AppError('validation_failed', 'Unsupported request encoding.');
  }
  return new AppError('internal', 'Something went wrong on the server. The error was logged.');
}
