import assert from 'node:assert/strict';
import { randomBytes } from 'node:crypto';
import { after, before, describe, test } from 'node:test';
import { sha256Hex } from '../../server/auth/linkTokens';
import { ShareLink } from '../../server/db/entities';
import { MAX_ACTIVE_LINKS_PER_NOTEBOOK } from '../../server/services/sharing';
import { SHARE_LINK_MAX_DAYS } from '../../shared/notebook/sharing';
import { ORIGIN, startHarness, type Harness } from './harness';
import { createPerson, joinGroup, notebookWithRun, settleRun, type TestPerson } from './people';

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
    // the far edge itself (a minute inside a year) is allowed
    const atTheEdge = new Date(Date.now() + SHARE_LINK_MAX_DAYS * DAY_MS - 60_000).toISOString();
    const edge = (await owner.client.post(base).send({ role: 'viewer', expiresAt: atTheEdge }).expect(201)).body;
    await owner.client.delete(`${base}/${edge.id}`).expect(200);
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

// Documented behaviour (sharing panel, README): a share link acts for the person who created it; it opens
// the notebook only while that person may still manage sharing (editor or owner) — removed, lowered or out
// of the group, the link answers the same 404 as an unknown one, and the panel lists it as inactive.
describe('a share link opens only while its creator may manage sharing', () => {
  let h: Harness;
  let owner: TestPerson;
  let editor: TestPerson;
  let notebookId: string;

  const membersPath = () => `/api/notebooks/${notebookId}/members`;
  const memberIdOf = async (person: TestPerson) =>
    ((await owner.client.get(membersPath()).expect(200)).body.members as { id: string; subjectId: string }[]).find((m) => m.subjectId === person.id)!.id;
  const listedLink = async (linkId: string) =>
    ((await owner.client.get(membersPath()).expect(200)).body.links as { id: string; active: boolean; inactiveReason: string | null }[]).find((l) => l.id === linkId)!;
  const unknownReply = async () => (await h.raw.get(`/api/shared/${randomBytes(32).toString('base64url')}`).expect(404)).text;

  before(async () => {
    h = await startHarness();
    owner = await createPerson(h, { tag: 'creator-owner' });
    editor = await createPerson(h, { tag: 'creator-editor' });
    notebookId = (await owner.client.post('/api/notebooks').send({ title: 'Invented delegated links', summary: '', groupId: null }).expect(201)).body.notebook.id;
  });
  after(() => h.close());

  test('removed editor: their commenter link answers 404 for the notebook and its comments, and is listed inactive with the reason', async () => {
    await owner.client.post(membersPath()).send({ email: editor.email, role: 'editor' }).expect(200);
    const link = (await editor.client.post(`/api/notebooks/${notebookId}/links`).send({ role: 'commenter' }).expect(201)).body;
    await h.raw.get(`/api/shared/${link.token}`).expect(200);
    await editor.client.post(`/api/shared/${link.token}/comments`).send({ body: 'through my own link' }).expect(201);
    const listedFirst = await listedLink(link.id);
    assert.deepEqual([listedFirst.active, listedFirst.inactiveReason], [true, null]);

    await owner.client.delete(`${membersPath()}/${await memberIdOf(editor)}`).expect(200);
    const expected = await unknownReply();
    assert.equal((await h.raw.get(`/api/shared/${link.token}`).expect(404)).text, expected);
    assert.equal((await editor.client.get(`/api/shared/${link.token}/comments`).expect(404)).text, expected);
    assert.equal((await editor.client.post(`/api/shared/${link.token}/comments`).send({ body: 'still here?' }).expect(404)).text, expected);
    const listed = await listedLink(link.id);
    assert.equal(listed.active, false);
    assert.equal(listed.inactiveReason, 'its creator no longer manages sharing');
  });

  test('lowered to commenter: the link stops; made editor again: the same link opens again (checked when used)', async () => {
    await owner.client.post(membersPath()).send({ email: editor.email, role: 'editor' }).expect(200);
    const link = (await editor.client.post(`/api/notebooks/${notebookId}/links`).send({ role: 'viewer' }).expect(201)).body;
    await owner.client.patch(`${membersPath()}/${await memberIdOf(editor)}`).send({ role: 'commenter' }).expect(200);
    await h.raw.get(`/api/shared/${link.token}`).expect(404);
    assert.equal((await listedLink(link.id)).active, false);
    await owner.client.patch(`${membersPath()}/${await memberIdOf(editor)}`).send({ role: 'editor' }).expect(200);
    assert.equal((await h.raw.get(`/api/shared/${link.token}`).expect(200)).body.notebook.id, notebookId);
    const again = await listedLink(link.id);
    assert.deepEqual([again.active, again.inactiveReason], [true, null]);
  });

  test('an editor through a group who leaves the group: the link stops', async () => {
    const groupId = (await owner.client.post('/api/groups').send({ name: 'Invented Delegating Group', description: '' }).expect(201)).body.group.id;
    const member = await createPerson(h, { tag: 'group-editor' });
    await joinGroup(h, groupId, member.id, 'member');
    await owner.client.post(membersPath()).send({ groupId, role: 'editor' }).expect(200);
    const link = (await member.client.post(`/api/notebooks/${notebookId}/links`).send({ role: 'viewer' }).expect(201)).body;
    await h.raw.get(`/api/shared/${link.token}`).expect(200);
    await member.client.delete(`/api/groups/${groupId}/members/${member.id}`).expect(200);
    await member.client.get(`/api/notebooks/${notebookId}`).expect(404);
    await h.raw.get(`/api/shared/${link.token}`).expect(404);
  });

  test('the former owner after handing the notebook on stays an editor: their links keep working', async () => {
    const heir = await createPerson(h, { tag: 'heir' });
    const own = (await owner.client.post('/api/notebooks').send({ title: 'Invented handed on', summary: '', groupId: null }).expect(201)).body.notebook.id;
    await owner.client.post(`/api/notebooks/${own}/members`).send({ email: heir.email, role: 'viewer' }).expect(200);
    const link = (await owner.client.post(`/api/notebooks/${own}/links`).send({ role: 'commenter' }).expect(201)).body;
    await owner.client.post(`/api/notebooks/${own}/owner`).send({ userId: heir.id }).expect(200);
    assert.equal((await owner.client.get(`/api/notebooks/${own}`).expect(200)).body.notebook.role, 'editor');
    await h.raw.get(`/api/shared/${link.token}`).expect(200);
  });
});

describe('active share links per notebook are capped', () => {
  let h: Harness;
  let owner: TestPerson;
  before(async () => {
    h = await startHarness();
    owner = await createPerson(h, { tag: 'many-links' });
  });
  after(() => h.close());

  test(`${MAX_ACTIVE_LINKS_PER_NOTEBOOK} unrevoked, unexpired links at once; the next is 409 until one is revoked; expired and revoked ones do not count`, async () => {
    assert.equal(MAX_ACTIVE_LINKS_PER_NOTEBOOK, 20, 'README: at most 20 active share links per notebook');
    const notebookId = (await owner.client.post('/api/notebooks').send({ title: 'Invented crowded notebook', summary: '', groupId: null }).expect(201)).body.notebook.id;
    const base = `/api/notebooks/${notebookId}/links`;
    const expired = (await owner.client.post(base).send({ role: 'viewer', expiresAt: new Date(Date.now() + DAY_MS).toISOString() }).expect(201)).body;
    await h.rungbook.services.dataSource.getRepository(ShareLink).update({ id: expired.id }, { expiresAt: new Date(Date.now() - 1000) });
    const revoked = (await owner.client.post(base).send({ role: 'viewer' }).expect(201)).body;
    await owner.client.delete(`${base}/${revoked.id}`).expect(200);
    const ids: string[] = [];
    for (let i = 0; i < 20; i += 1) ids.push((await owner.client.post(base).send({ role: i % 2 ? 'viewer' : 'commenter' }).expect(201)).body.id);
    const refused = await owner.client.post(base).send({ role: 'viewer' }).expect(409);
    assert.equal(refused.body.error.code, 'conflict');
    assert.match(refused.body.error.message, /at most 20 active share links; revoke/);
    assert.equal(await h.rungbook.services.dataSource.getRepository(ShareLink).countBy({ notebookId }), 22, 'nothing was stored');
    await owner.client.delete(`${base}/${ids[0]}`).expect(200);
    await owner.client.post(base).send({ role: 'viewer' }).expect(201);
    // the cap is per notebook
    const other = (await owner.client.post('/api/notebooks').send({ title: 'Invented quiet notebook', summary: '', groupId: null }).expect(201)).body.notebook.id;
    await owner.client.post(`/api/notebooks/${other}/links`).send({ role: 'viewer' }).expect(201);
  });
});
