import assert from 'node:assert/strict';
import { randomBytes } from 'node:crypto';
import { after, before, describe, test } from 'node:test';
import { sha256Hex } from '../../server/auth/linkTokens';
import { ShareLink } from '../../server/db/entities';
import { SHARE_LINK_MAX_DAYS } from '../../shared/notebook/sharing';
import { ORIGIN, startHarness, type Harness } from './harness';
import { createPerson, notebookWithRun, settleRun, type TestPerson } from './people';

// Documented behaviour (issue 9, "Share links"): a secret viewer/commenter link, optional expiry, revocable;
// opened without an account it shows the notebook read-only; unknown, expired and revoked links give 404 and
// reveal nothing; tokens are 32 random bytes, URL-safe base64 (43 characters), stored only as SHA-256.

const DAY_MS = 24 * 3600 * 1000;

describe('share links', () => {
  let h: Harness;
  let owner: TestPerson;
  let holder: TestPerson;
  let fixture: Awaited<ReturnType<typeof notebookWithRun>>;
  let viewerLink: { id: string; token: string; url: string };

  before(async () => {
    h = await startHarness();
    owner = await createPerson(h, { tag: 'link-owner' });
    holder = await createPerson(h, { tag: 'link-holder' });
    const groupId = (await owner.client.post('/api/groups').send({ name: 'Invented Link Group', description: '' }).expect(201)).body.group.id;
    fixture = await notebookWithRun(owner.client, groupId);
    const run = (await owner.client.get(`/api/runs/${fixture.runId}`).expect(200)).body.run;
    await settleRun(owner.client, run);
  });
  after(() => h.close());

  test('creating a link answers the token once; only its SHA-256 is stored', async () => {
    const reply = await owner.client.post(`/api/notebooks/${fixture.notebookId}/links`).send({ role: 'viewer' }).expect(201);
    viewerLink = reply.body;
    assert.match(viewerLink.token, /^[A-Za-z0-9_-]{43}$/);
    assert.equal(viewerLink.url, `${ORIGIN}/shared/${viewerLink.token}`);
    const stored = await h.rungbook.services.dataSource.getRepository(ShareLink).findOneByOrFail({ id: viewerLink.id });
    assert.equal(stored.tokenHash, sha256Hex(viewerLink.token));
    assert.equal(stored.expiresAt, null);
    const listed = (await owner.client.get(`/api/notebooks/${fixture.notebookId}/members`).expect(200)).body.links;
    assert.deepEqual(listed.map((l: { id: string; role: string; active: boolean }) => [l.id, l.role, l.active]), [[viewerLink.id, 'viewer', true]]);
    assert.ok(!JSON.stringify(listed).includes(viewerLink.token));
  });

  test('opened signed out, a link shows the notebook read-only with the link role and nothing about its people', async () => {
    const reply = await h.raw.get(`/api/shared/${viewerLink.token}`).expect(200);
    const ownersCopy = (await owner.client.get(`/api/notebooks/${fixture.notebookId}`).expect(200)).body.notebook;
    const shared = reply.body.notebook;
    assert.equal(shared.id, fixture.notebookId);
    assert.equal(shared.role, 'viewer');
    assert.equal(shared.canEdit, false);
    assert.equal(shared.sharedBy, null);
    assert.equal(shared.title, ownersCopy.title);
    assert.deepEqual(shared.cells.map((c: { id: string; revision: number }) => [c.id, c.revision]), ownersCopy.cells.map((c: { id: string; revision: number }) => [c.id, c.revision]));
    assert.ok(!reply.text.includes(owner.email), 'no owner e-mail in the reply');
  });

  test('a commenter link opens with the commenter role', async () => {
    const link = (await owner.client.post(`/api/notebooks/${fixture.notebookId}/links`).send({ role: 'commenter' }).expect(201)).body;
    const shared = (await h.raw.get(`/api/shared/${link.token}`).expect(200)).body.notebook;
    assert.equal(shared.role, 'commenter');
    assert.equal(shared.canEdit, false);
  });

  test('an expiry must lie in the future and at most a year ahead', async () => {
    const base = `/api/notebooks/${fixture.notebookId}/links`;
    const past = await owner.client.post(base).send({ role: 'viewer', expiresAt: new Date(Date.now() - 60_000).toISOString() }).expect(400);
    assert.equal(past.body.error.code, 'validation_failed');
    assert.ok(past.body.error.fields.expiresAt);
    const tooFar = new Date(Date.now() + (SHARE_LINK_MAX_DAYS + 1) * DAY_MS).toISOString();
    assert.equal((await owner.client.post(base).send({ role: 'viewer', expiresAt: tooFar }).expect(400)).body.error.code, 'validation_failed');
    const inTenDays = new Date(Date.now() + 10 * DAY_MS);
    const created = (await owner.client.post(base).send({ role: 'viewer', expiresAt: inTenDays.toISOString() }).expect(201)).body;
    const stored = await h.rungbook.services.dataSource.getRepository(ShareLink).findOneByOrFail({ id: created.id });
    assert.equal(stored.expiresAt?.getTime(), inTenDays.getTime());
    await h.raw.get(`/api/shared/${created.token}`).expect(200);
  });

  test('unknown, malformed, expired and revoked links all answer the same 404 on every /shared route', async () => {
    const base = `/api/notebooks/${fixture.notebookId}/links`;
    const expiring = (await owner.client.post(base).send({ role: 'viewer', expiresAt: new Date(Date.now() + DAY_MS).toISOString() }).expect(201)).body;
    await h.rungbook.services.dataSource.getRepository(ShareLink).update({ id: expiring.id }, { expiresAt: new Date(Date.now() - 1000) });
    const revoked = (await owner.client.post(base).send({ role: 'commenter' }).expect(201)).body;
    await h.raw.get(`/api/shared/${revoked.token}`).expect(200);
    const afterRevoke = (await owner.client.delete(`${base}/${revoked.id}`).expect(200)).body.links;
    const revokedView = afterRevoke.find((l: { id: string }) => l.id === revoked.id);
    assert.equal(revokedView.active, false);
    assert.ok(revokedView.revokedAt);
    assert.equal(afterRevoke.find((l: { id: string }) => l.id === expiring.id).active, false);

    const unknown = randomBytes(32).toString('base64url');
    const replies = [];
    const asked: string[] = [];
    for (const token of [unknown, 'not-a-token', `${unknown}x`, expiring.token, revoked.token]) {
      replies.push(await h.raw.get(`/api/shared/${token}`));
      replies.push(await h.raw.get(`/api/shared/${token}/comments`));
      replies.push(await holder.client.get(`/api/shared/${token}/comments`));
      replies.push(await holder.client.post(`/api/shared/${token}/comments`).send({ body: 'through a dead link' }));
      asked.push(`GET ${token}`, `GET ${token}/comments`, `GET ${token}/comments (signed in)`, `POST ${token}/comments`);
    }
    replies.forEach((reply, i) => assert.equal(reply.status, 404, asked[i]));
    assert.deepEqual(JSON.parse(replies[0].text), { error: { code: 'not_found', message: 'No such notebook.' } });
    for (const reply of replies.slice(1)) assert.equal(reply.text, replies[0].text);
    // A signed-in caller gets the very same answer.
    assert.equal((await holder.client.get(`/api/shared/${revoked.token}`).expect(404)).text, replies[0].text);
  });

  test('a link holder with a session reaches nothing else: not the notebook, its versions, runs, export or members', async () => {
    await holder.client.get(`/api/shared/${viewerLink.token}`).expect(200);
    const paths = [
      `/api/notebooks/${fixture.notebookId}`,
      `/api/notebooks/${fixture.notebookId}/versions`,
      `/api/notebooks/${fixture.notebookId}/versions/${fixture.versionId}`,
      `/api/notebooks/${fixture.notebookId}/export.json`,
      `/api/notebooks/${fixture.notebookId}/members`,
      `/api/runs/${fixture.runId}`,
    ];
    for (const path of paths) assert.equal((await holder.client.get(path)).status, 404, path);
    const listed = (await holder.client.get('/api/notebooks').expect(200)).body.notebooks;
    assert.deepEqual(listed, []);
    await holder.client.post(`/api/notebooks/${fixture.notebookId}/cells/${fixture.cellId}/run`).expect(404);
  });
});

describe('opening share links is limited per network address', () => {
  const LIMIT = 40;
  let h: Harness;
  before(async () => {
    h = await startHarness({ SHARED_LINK_LIMIT_PER_IP: String(LIMIT) });
  });
  after(() => h.close());

  test('the first SHARED_LINK_LIMIT_PER_IP requests through links in 15 minutes are answered, the next is refused, whatever the route', async () => {
    const unknown = randomBytes(32).toString('base64url');
    for (let i = 0; i < LIMIT / 2; i += 1) await h.raw.get(`/api/shared/${unknown}`).expect(404);
    for (let i = 0; i < LIMIT / 2; i += 1) await h.raw.get(`/api/shared/${unknown}/comments`).expect(404);
    const refused = await h.raw.get(`/api/shared/${unknown}`).expect(429);
    assert.equal(refused.body.error.code, 'rate_limited');
  });
});
