// Test identities created straight in the database (one argon2 hash each), then signed in through the
// API like a browser: fast, and independent of how sign-up and address verification work. An unconfirmed
// account cannot sign in; it gets a session straight from the session service instead, standing for a
// session opened before sign-in required a confirmed address.
import assert from 'node:assert/strict';
import { hashPassword } from '../../server/auth/passwords';
import { newLinkToken, sha256Hex } from '../../server/auth/linkTokens';
import { Comment, GroupMembership, NotebookInvitation, NotebookMember, ShareLink, User } from '../../server/db/entities';
import { newId } from '../../server/ids';
import { JOBS, type ResultOf } from '../../shared/jobs/contract';
import type { RunView } from '../../shared/notebook/api';
import type { GrantableRole } from '../../shared/notebook/sharing';
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
  /** A personal grant on the notebook (viewer, to an account outside the test identities). */
  memberId: string;
  /** A pending invitation to the notebook. */
  invitationId: string;
  /** The viewer share link's id. */
  linkId: string;
  /** A share-link token (which link depends on the caller; see collaborationFixture). */
  token: string;
  /** A thread on the fixture's cell, started by the owner. */
  commentId: string;
  /** A dataset of the notebook (see datasetFixture). */
  datasetId: string;
  /** A well-formed session id that belongs to nobody (ending it answers 404). */
  sessionId: string;
}

export interface CollaborationFixture {
  memberId: string;
  invitationId: string;
  linkId: string;
  viewerToken: string;
  commenterToken: string;
  commentId: string;
}

/**
 * Grants, links, a pending invitation and a comment on a notebook, written straight into the database
 * (the sharing routes have tests of their own): `grants` maps user or group ids to their roles.
 */
export async function collaborationFixture(
  h: Harness,
  notebook: { notebookId: string; cellId: string; ownerId: string },
  grants: { userId?: string; groupId?: string; role: GrantableRole }[],
): Promise<CollaborationFixture> {
  const ds = h.rungbook.services.dataSource;
  const members = grants.map((grant) => ({ id: newId(), notebookId: notebook.notebookId, userId: grant.userId ?? null, groupId: grant.groupId ?? null, role: grant.role, grantedById: notebook.ownerId }));
  // read before inserting: TypeORM's multi-row insert writes generated values back into the objects, not always in order
  const firstMemberId = members[0]?.id ?? 'zzzzzzzzzzzz';
  for (const member of members) await ds.getRepository(NotebookMember).insert(member);
  const invitationId = newId();
  await ds.getRepository(NotebookInvitation).insert({
    id: invitationId, notebookId: notebook.notebookId, email: `invited-${invitationId}@test.rungbook.example`, emailKey: `invited-${invitationId}@test.rungbook.example`,
    role: 'viewer', invitedById: notebook.ownerId, expiresAt: new Date(Date.now() + 86_400_000),
  });
  const viewerToken = newLinkToken();
  const commenterToken = newLinkToken();
  const linkId = newId();
  await ds.getRepository(ShareLink).insert([
    { id: linkId, notebookId: notebook.notebookId, tokenHash: sha256Hex(viewerToken), role: 'viewer', createdById: notebook.ownerId, expiresAt: null, revokedAt: null },
    { id: newId(), notebookId: notebook.notebookId, tokenHash: sha256Hex(commenterToken), role: 'commenter', createdById: notebook.ownerId, expiresAt: null, revokedAt: null },
  ]);
  const commentId = newId();
  await ds.getRepository(Comment).insert({ id: commentId, notebookId: notebook.notebookId, cellId: notebook.cellId, cellLabel: 'bubble', cellRevision: 1, parentId: null, authorId: notebook.ownerId, body: 'Invented fixture thread' });
  h.rungbook.services.notebooks.forget(notebook.notebookId);
  return { memberId: firstMemberId, invitationId, linkId, viewerToken, commenterToken, commentId };
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

/** Invented test data: Δφ², a few points with symmetric errors (not a published measurement). */
export const INVENTED_TABLE = 's,Delta_phi2,err\n1.5,1.41,0.02\n1.6,1.43,0.02\n1.7,1.46,0.03\n1.8,1.50,0.03\n';

/** A pasted dataset "lattice" (INVENTED_TABLE) in the notebook, made through the API; returns its id. */
export async function datasetFixture(client: Client, notebookId: string, label = 'lattice'): Promise<string> {
  const reply = await client.post(`/api/notebooks/${notebookId}/datasets/pasted`).send({
    label, name: 'Invented lattice points', source: 'invented for tests', shape: 'points',
    xAxis: { kind: 's' }, yAxis: { kind: 'Delta_phi2' },
    mapping: { x: 0, y: 1, yError: { kind: 'symmetric', column: 2 } },
    text: INVENTED_TABLE,
  });
  if (reply.status !== 201) throw new Error(`datasetFixture: ${reply.status} ${reply.text.slice(0, 300)}`);
  return reply.body.dataset.id as string;
}

/** Runs one engine job through POST /api/calc as `who`, waits for it, and checks the result against the contract's schema. */
export async function calcAs<K extends keyof typeof JOBS>(who: TestPerson, kind: K, job: Record<string, unknown>): Promise<ResultOf<K>> {
  const started = (await who.client.post('/api/calc').send({ job: { job: kind, ...job } }).expect(200)).body.run as RunView;
  const run = await settleRun(who.client, started);
  assert.equal(run.status, 'done', JSON.stringify(run).slice(0, 500));
  const parsed = JOBS[kind].result.safeParse(run.result);
  assert.ok(parsed.success, `the ${kind} result does not match the contract: ${JSON.stringify(run.result).slice(0, 300)}`);
  return parsed.data as ResultOf<K>;
}
