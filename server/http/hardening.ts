import type { IncomingMessage } from 'node:http';
import type { RequestHandler } from 'express';
import helmet from 'helmet';
import { AppError } from './errors';

/**
 * Security headers on every reply. The Content-Security-Policy fits the exported web app: its
 * scripts are files under /_expo, KaTeX's stylesheet and fonts come from /katex, and
 * react-native-web writes its styles into <style> elements at run time (hence 'unsafe-inline' for
 * styles only). HSTS and upgrade-insecure-requests only when the public address is https: over
 * plain http on localhost they would send the browser to a port nobody listens on.
 */
export function securityHeaders(publicUrl: string): RequestHandler {
  const https = publicUrl.startsWith('https://');
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        'default-src': ["'self'"],
        'script-src': ["'self'"],
        'script-src-attr': ["'none'"],
        'style-src': ["'self'", "'unsafe-inline'"],
        'img-src': ["'self'", 'data:', 'blob:'],
        'font-src': ["'self'", 'data:'],
        'connect-src': ["'self'"],
        'object-src': ["'none'"],
        'base-uri': ["'self'"],
        'form-action': ["'self'"],
        'frame-ancestors': ["'none'"],
        ...(https ? { 'upgrade-insecure-requests': [] } : {}),
      },
    },
    // Not helmet's no-referrer: under it browsers send `Origin: null` on our own POSTs, which the CSRF origin check refuses.
    referrerPolicy: { policy: 'same-origin' },
    strictTransportSecurity: https ? { maxAge: 180 * 24 * 3600, includeSubDomains: false } : false,
    xFrameOptions: { action: 'deny' },
  });
}

/** API replies carry personal data: no browser or proxy may keep a copy. */
export const noStore: RequestHandler = (_req, res, next) => {
  res.set('Cache-Control', 'no-store');
  next();
};

/** A path whose percent-encoding does not decode (e.g. "%E0%A4%A", "%ff") is a 400 for every route and static file. */
export const rejectMalformedPath: RequestHandler = (req, _res, next) => {
  try {
    decodeURIComponent(req.path);
    next();
  } catch {
    next(new AppError('validation_failed', 'The address is malformed: each % must start a valid percent-encoded UTF-8 character (e.g. %20).'));
  }
};

/** Compressions the JSON body parser undoes on every supported Node version; anything else is refused up front. */
const BODY_ENCODINGS = new Set(['identity', 'gzip', 'deflate']);

const hasBody = (req: IncomingMessage) => req.headers['transfer-encoding'] !== undefined || Number(req.headers['content-length'] ?? 0) > 0;

export const acceptedBodyEncodings: RequestHandler = (req, _res, next) => {
  const encoding = req.headers['content-encoding'];
  if (encoding === undefined || !hasBody(req) || BODY_ENCODINGS.has(encoding.trim().toLowerCase())) return next();
  const shown = encoding.slice(0, 40).replace(/[^\x20-\x7e]/g, '?');
  next(new AppError('unsupported_encoding', `Request bodies may be sent plain or compressed with gzip or deflate, not as "${shown}".`));
};

/** Deeper than any request the app sends (a notebook file nests about ten levels). */
export const MAX_BODY_DEPTH = 32;

/** Whether a parsed JSON value nests deeper than `limit` arrays/objects. Iterative: the check itself cannot exhaust the stack. */
export function nestsDeeperThan(value: unknown, limit: number): boolean {
  const pending: { value: unknown; depth: number }[] = [{ value, depth: 0 }];
  while (pending.length) {
    const { value: current, depth } = pending.pop()!;
    if (typeof current !== 'object' || current === null) continue;
    if (depth + 1 > limit) return true;
    for (const child of Object.values(current)) pending.push({ value: child, depth: depth + 1 });
  }
  return false;
}

/**
 * JSON.parse reads arbitrarily deep nesting, but everything after it (validation, JSON.stringify
 * on the way to the database) recurses and would overflow the stack: refuse such bodies first.
 */
export const boundedBodyDepth: RequestHandler = (req, _res, next) => {
  if (!nestsDeeperThan(req.body, MAX_BODY_DEPTH)) return next();
  next(new AppError('validation_failed', `The request body nests more than ${MAX_BODY_DEPTH} levels deep.`));
};

/** Whatever no route answered outside /api (a POST to an app page, say) gets a JSON 404 too. */
export const webNotFound: RequestHandler = (req, _res, next) => {
  next(new AppError('not_found', `Nothing at ${req.method} ${req.path}`));
};

const LOOPBACK_HOST = /^(localhost|127\.\d{1,3}\.\d{1,3}\.\d{1,3}|\[::1\])(:\d+)?$/i;

/**
 * On a local start (demo admin with a published password, captured sign-in links readable at /mail) only
 * requests addressed to a loopback name are served: a web page elsewhere that points its own host name at
 * 127.0.0.1 (DNS rebinding) gets nothing.
 */
export const loopbackHostOnly: RequestHandler = (req, _res, next) => {
  if (LOOPBACK_HOST.test(req.headers.host ?? '')) return next();
  next(new AppError('forbidden', 'This Rungbook runs for this machine only: open it at http://localhost or 127.0.0.1.'));
};
