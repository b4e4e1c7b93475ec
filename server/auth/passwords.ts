import { hash, verify } from '@node-rs/argon2';

// OWASP Password Storage Cheat Sheet: argon2id, m = 19 MiB, t = 2, p = 1.
// `algorithm: 2` is Algorithm.Argon2id; the enum is a const enum that esbuild cannot inline across packages.
const ARGON2ID_OWASP = { algorithm: 2, memoryCost: 19456, timeCost: 2, parallelism: 1, outputLen: 32 } as const;

let hashesComputed = 0;

export function hashPassword(password: string): Promise<string> {
  hashesComputed += 1;
  return hash(password, ARGON2ID_OWASP);
}

/** How many password hashes this process has computed: lets tests see that junk input is refused before any. */
export const passwordHashesComputed = (): number => hashesComputed;

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

let decoyHash: Promise<string> | undefined;

/** Spend the same time on unknown accounts as on known ones, so timing does not reveal who has one. */
export async function verifyAgainstDecoy(password: string): Promise<false> {
  decoyHash ??= hashPassword('decoy-password-never-valid');
  await verifyPassword(await decoyHash, password);
  return false;
}
