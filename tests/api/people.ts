// Test identities created straight in the database (one argon2 hash each), then signed in through the
// API like a browser: fast, and independent of how sign-up and address verification work. An unconfirmed
// account cannot sign in; it gets a session straight from the session service instead, standing for a
// session opened before sign-in required a confirmed address.
import { hashPassword } from '../../server/auth/passwords';
import { GroupMembership, User } from '../../server/db/entities';
import { newId } from '../../server/ids';
import type { RunView } from '../../shared/notebook/api';
import type { Harness } from './harness';

export type Client = ReturnType<Harness['browser']>;

export interface TestPerson {
  id: string;
  email: string;
  password: string;
  verified: boolean;
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
  const created: TestPerson = { id, email, password, verified: options.verified !== false, client: h.browser() };
  if (options.signIn !== false) await signInAgain(h, created);
  return created;
}

/** Sign the person in in their own client: through the API, or, for an unconfirmed account, with a session made directly. */
export async function signInAgain(h: Harness, who: TestPerson): Promise<void> {
  if (who.verified) await who.client.post('/api/auth/sign-in').send({ email: who.email, password: who.password }).expect(200);
  else await giveSession(h, who.client, who.id);
}

/** Put a fresh session of this account into the client's cookie jar, as a reply's Set-Cookie would. */
export async function giveSession(h: Harness, client: Client, userId: string): Promise<void> {
  const setCookie = await h.rungbook.services.sessions.start(userId);
  // supertest serves the app on 127.0.0.1; the session cookie has Path=/.
  client.jar.setCookie(setCookie, '127.0.0.1', '/');
}

export async function joinGroup(h: Harness, groupId: string, userId: string, role: 'lead' | 'member'): Promise<void> {
  await h.rungbook.services.dataSource.getRepository(GroupMembership).insert({ groupId, userId, role });
}

/** Poll a run until it is neither queued nor running (at most about 20 s). */
export async function settleRun(client: Client, run: RunView): Promise<RunView> {
  let current = run;
  for (let i = 0; i < 400 && (current.status === 'queued' || current.status === 'running'); i += 1) {
    await new Promise((resolve) => setTimeout(resolve, 50));
    current = (await client.get(`/api/runs/${run.id}`).expect(200)).body.run;
  }
  return current;
}

/** The ids a route path may name, for tests that call every route of the route table. */
export interface RouteFixture {
  notebookId: string;
  cellId: string;
  versionId: string;
  runId: string;
  groupId: string;
  /** A group member (for membership routes). */
  userId: string;
}

/** A notebook in `groupId` with a setup cell, a run loop-integral cell and a saved version, made through the API. */
export async function notebookWithRun(client: Client, groupId: string): Promise<Pick<RouteFixture, 'notebookId' | 'cellId' | 'runId' | 'versionId'>> {
  const notebookId = (await client.post('/api/notebooks').send({ title: 'Invented route-test notebook', summary: '', groupId }).expect(201)).body.notebook.id as string;
  await client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'setup', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.5', loops: 2, digits: 20 } }).expect(201);
  const cells = (await client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'bubble', input: { kind: 'integral', uses: 'setup', form: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1 } }).expect(201)).body.notebook.cells;
  const cellId = cells.find((c: { label: string }) => c.label === 'bubble').id as string;
  const runId = (await client.post(`/api/notebooks/${notebookId}/cells/${cellId}/run`).expect(202)).body.run.id as string;
  const versionId = (await client.post(`/api/notebooks/${notebookId}/versions`).send({ message: 'Route-test base' }).expect(201)).body.version.id as string;
  return { notebookId, cellId, runId, versionId };
}
