import { randomBytes } from 'node:crypto';

const ALPHABET = 'abcdefghijklmnopqrstuvwxyz0123456789';

/** 20 characters of a 36-letter alphabet: ~103 bits, URL-safe and readable in logs. */
export function newId(): string {
  const bytes = randomBytes(20);
  let id = '';
  for (const byte of bytes) id += ALPHABET[byte % ALPHABET.length];
  return id;
}
