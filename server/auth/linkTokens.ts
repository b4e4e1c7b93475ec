import { createHash, randomBytes } from 'node:crypto';

/**
 * Secrets that travel in e-mailed links and cookies are stored only as their SHA-256 (hex), so a copy of
 * the database yields nothing usable.
 */
export const sha256Hex = (text: string) => createHash('sha256').update(text).digest('hex');

/** 256 random bits, URL-safe: the secret of one e-mailed link. */
export const newLinkToken = () => randomBytes(32).toString('base64url');

/** A stored link is usable once, until it expires. */
export function isUsableLink<T extends { usedAt: Date | null; expiresAt: Date }>(row: T | null, now: Date): row is T {
  return Boolean(row && !row.usedAt && row.expiresAt.getTime() > now.getTime());
}
