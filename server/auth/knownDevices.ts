import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request } from 'express';
import type { DataSource } from 'typeorm';
import { keptSecret } from './serverSecrets';

const COOKIE_NAME = 'rungbook_device';
const ONE_YEAR_S = 365 * 24 * 3600;
const KEY_NAME = 'known-device-key';

/**
 * A browser where an account signed in successfully gets a signed "known device" cookie:
 * `<device id>.<HMAC(key, device id | account e-mail key)>`. Failed sign-ins from a known device count
 * against that device only, so a stranger's failures (from anywhere) cannot lock its owner out.
 * The key is kept in the database (deviceKeyIn), so devices stay known across restarts.
 */
export interface KnownDevices {
  /** The device id when the request carries a valid known-device cookie for this account, else null. */
  deviceFor(req: Request, accountKey: string): Promise<string | null>;
  /** Set-Cookie value remembering this browser for the account. */
  cookieFor(accountKey: string): Promise<string>;
}

/** The HMAC key: fixed bytes, or loaded once on first use. */
export type DeviceKey = Buffer | (() => Promise<Buffer>);

/** The key kept in the database's server_secrets table, drawn on first use. */
export const deviceKeyIn = (dataSource: DataSource) => () => keptSecret(dataSource, KEY_NAME);

function readCookie(header: string | undefined, name: string): string | undefined {
  for (const part of (header ?? '').split(';')) {
    const [key, ...rest] = part.trim().split('=');
    if (key === name) return rest.join('=');
  }
  return undefined;
}

/** Without a key source every start draws a new key (devices are forgotten at restart): for tests only. */
export function createKnownDevices(secureCookie: boolean, key: DeviceKey = randomBytes(32)): KnownDevices {
  let loaded: Promise<Buffer> | null = null;
  const theKey = () => {
    if (Buffer.isBuffer(key)) return Promise.resolve(key);
    // A failed load (database busy) is retried at the next request rather than remembered.
    loaded ??= key().catch((error) => {
      loaded = null;
      throw error;
    });
    return loaded;
  };
  const sign = async (deviceId: string, accountKey: string) =>
    createHmac('sha256', await theKey()).update(`${deviceId}|${accountKey}`).digest('base64url');
  return {
    async deviceFor(req, accountKey) {
      const [deviceId, mac] = (readCookie(req.headers.cookie, COOKIE_NAME) ?? '').split('.');
      if (!deviceId || !mac) return null;
      const expected = Buffer.from(await sign(deviceId, accountKey));
      const given = Buffer.from(mac);
      return given.length === expected.length && timingSafeEqual(given, expected) ? deviceId : null;
    },
    async cookieFor(accountKey) {
      const deviceId = randomBytes(16).toString('base64url');
      const attributes = [`Max-Age=${ONE_YEAR_S}`, 'Path=/api/auth', 'HttpOnly', 'SameSite=Lax', ...(secureCookie ? ['Secure'] : [])];
      return [`${COOKIE_NAME}=${deviceId}.${await sign(deviceId, accountKey)}`, ...attributes].join('; ');
    },
  };
}
