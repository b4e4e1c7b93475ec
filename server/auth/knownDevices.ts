import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request } from 'express';

const COOKIE_NAME = 'rungbook_device';
const ONE_YEAR_S = 365 * 24 * 3600;

/**
 * A browser where an account signed in successfully gets a signed "known device" cookie:
 * `<device id>.<HMAC(key, device id | account e-mail key)>`. Failed sign-ins from a known device count
 * against that device only, so a stranger's failures (from anywhere) cannot lock its owner out.
 * The key is drawn at each server start: after a restart devices are unknown again until their next
 * successful sign-in, and count per network address meanwhile.
 */
export interface KnownDevices {
  /** The device id when the request carries a valid known-device cookie for this account, else null. */
  deviceFor(req: Request, accountKey: string): string | null;
  /** Set-Cookie value remembering this browser for the account. */
  cookieFor(accountKey: string): string;
}

function readCookie(header: string | undefined, name: string): string | undefined {
  for (const part of (header ?? '').split(';')) {
    const [key, ...rest] = part.trim().split('=');
    if (key === name) return rest.join('=');
  }
  return undefined;
}

export function createKnownDevices(secureCookie: boolean, key: Buffer = randomBytes(32)): KnownDevices {
  const sign = (deviceId: string, accountKey: string) => createHmac('sha256', key).update(`${deviceId}|${accountKey}`).digest('base64url');
  return {
    deviceFor(req, accountKey) {
      const [deviceId, mac] = (readCookie(req.headers.cookie, COOKIE_NAME) ?? '').split('.');
      if (!deviceId || !mac) return null;
      const expected = Buffer.from(sign(deviceId, accountKey));
      const given = Buffer.from(mac);
      return given.length === expected.length && timingSafeEqual(given, expected) ? deviceId : null;
    },
    cookieFor(accountKey) {
      const deviceId = randomBytes(16).toString('base64url');
      const attributes = [`Max-Age=${ONE_YEAR_S}`, 'Path=/api/auth', 'HttpOnly', 'SameSite=Lax', ...(secureCookie ? ['Secure'] : [])];
      return [`${COOKIE_NAME}=${deviceId}.${sign(deviceId, accountKey)}`, ...attributes].join('; ');
    },
  };
}
