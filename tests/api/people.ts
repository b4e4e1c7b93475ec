// Test identities created straight in the database (one argon2 hash each), then signed in through the
// API like a browser: fast, and independent of how sign-up and address verification work.
import { hashPassword } from '../../server/auth/passwords';
import { GroupMembership, User } from '../../server/db/entities';
import { newId } from '../../server/ids';
import type { Harness } from './harness';

export type Client = ReturnType<Harness['browser']>;

export interface TestPerson {
  id: string;
  email: string;
  password: string;
  client: Client;
}

let counter = 0;

export async function createPerson(
  h: Harness,
  options: { verified?: boolean; siteAdmin?: boolean; tag?: string; signIn?: boolean } = {},
): Promise<TestPerson> {
  counter += 1;
  const tag = options.tag ?? `p${counter}`;
  const email = `${tag}-${counter}@test.rungbook.example`;
  const password = `long-enough-pass-${tag}-${counter}`;
  const id = newId();
  await h.rungbook.services.dataSource.getRepository(User).insert({
    id,
    name: `Invented ${tag}`,
    email,
    emailKey: email,
    passwordHash: await hashPassword(password),
    siteRole: options.siteAdmin ? 'admin' : 'member',
    emailVerifiedAt: options.verified === false ? null : new Date(),
  });
  const client = h.browser();
  if (options.signIn !== false) await client.post('/api/auth/sign-in').send({ email, password }).expect(200);
  return { id, email, password, client };
}

export async function joinGroup(h: Harness, groupId: string, userId: string, role: 'lead' | 'member'): Promise<void> {
  await h.rungbook.services.dataSource.getRepository(GroupMembership).insert({ groupId, userId, role });
}
