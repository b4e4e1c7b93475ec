import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { Notebook, NotebookEvent, NotebookMember, Notification } from '../../server/db/entities';
import type { AccessChange, NotebookChange } from '../../server/services/notebookEvents';
import { mailTo, startHarness, type Harness } from './harness';
import { createPerson, joinGroup, type Client, type TestPerson } from './people';

// Documented behaviour: shared/notebook/sharing.ts (ROLE_NEEDED: manageSharing = editor, transferOwnership = owner,
// edit = editor) and issue 9 ("the higher of personal and group role wins", "nobody grants a role above their own").

const SETUP_CELL = { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.5', loops: 2, digits: 20 };

async function newNotebook(client: Client, title: string, groupId: string | null = null): Promise<string> {
  return (await client.post('/api/notebooks').send({ title, summary: '', groupId }).expect(201)).body.notebook.id as string;
}

async function roleOn(client: Client, notebookId: string): Promise<string | null> {
  const reply = await client.get(`/api/notebooks/${notebookId}`);
  return reply.status === 200 ? (reply.body.notebook.role as string) : null;
}

async function memberIdOf(client: Client, notebookId: string, subjectId: string): Promise<string> {
  const members = (await client.get(`/api/notebooks/${notebookId}/members`).expect(200)).body.members as { id: string; subjectId: string; role: string }[];
  const found = members.find((m) => m.subjectId === subjectId && m.role !== 'owner');
  assert.ok(found, `no grant for ${subjectId}`);
  return found.id;
}

describe('sharing a notebook with people and groups', () => {
  let h: Harness;
  let owner: TestPerson;
  let bea: TestPerson;
  let carl: TestPerson;
  let dora: TestPerson;
  let groupId: string;

  before(async () => {
    h = await startHarness();
    owner = await createPerson(h, { tag: 'owner' });
    bea = await createPerson(h, { tag: 'bea' });
    carl = await createPerson(h, { tag: 'carl' });
    dora = await createPerson(h, { tag: 'dora' });
    groupId = (await owner.client.post('/api/groups').send({ name: 'Invented Sharing Group', description: '' }).expect(201)).body.group.id;
    await joinGroup(h, groupId, carl.id, 'member');
  });
  after(() => h.close());

  test('sharing by e-mail with a confirmed account grants the role at once, mails and notifies that person', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented two-loop check');
    assert.equal(await roleOn(bea.client, notebookId), null, 'before sharing the notebook is a 404');
    const view = (await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: bea.email.toUpperCase(), role: 'viewer' }).expect(200)).body;
    assert.equal(view.role, 'owner');
    assert.deepEqual(view.members.map((m: { subjectId: string; role: string }) => [m.subjectId, m.role]), [[owner.id, 'owner'], [bea.id, 'viewer']]);
    assert.equal(await roleOn(bea.client, notebookId), 'viewer');
    const listed = (await bea.client.get('/api/notebooks?filter=shared').expect(200)).body.notebooks;
    assert.deepEqual(listed.map((n: { id: string; role: string; sharedBy: { personName: string } }) => [n.id, n.role, n.sharedBy.personName]), [[notebookId, 'viewer', 'Invented owner']]);
    const mail = await mailTo(h, bea.email, 'Invented owner shared "Invented two-loop check" with you');
    assert.match(mail.textBody, /as a viewer/);
    assert.ok(mail.textBody.includes(`/notebooks/${notebookId}`));
    const notes = await h.rungbook.services.dataSource.getRepository(Notification).findBy({ userId: bea.id, notebookId });
    assert.deepEqual(notes.map((n) => n.kind), ['shared']);
  });

  test('a title with line breaks stays on one line in the sharing and invitation e-mails', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented broken\nSubject: forged\r\nForged line');
    const flat = 'Invented broken Subject: forged Forged line';
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: bea.email, role: 'viewer' }).expect(200);
    const shared = await mailTo(h, bea.email, `Invented owner shared "${flat}" with you`);
    assert.ok(shared.textBody.includes(`Invented owner shared the Rungbook notebook "${flat}" with you as a viewer.`), shared.textBody);
    const invitee = 'invented-broken-title@test.rungbook.example';
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: invitee, role: 'viewer' }).expect(200);
    const invited = await mailTo(h, invitee, `Invented owner invited you to "${flat}" on Rungbook`);
    for (const mail of [shared, invited]) assert.ok(!/^(Subject|Forged)/m.test(mail.textBody), mail.textBody);
  });

  test('a group grant reaches every member; the stronger of personal and group role wins', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented group notebook');
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ groupId, role: 'commenter' }).expect(200);
    assert.equal(await roleOn(carl.client, notebookId), 'commenter');
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: carl.email, role: 'viewer' }).expect(200);
    assert.equal(await roleOn(carl.client, notebookId), 'commenter', 'group commenter beats personal viewer');
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: carl.email, role: 'editor' }).expect(200);
    assert.equal(await roleOn(carl.client, notebookId), 'editor', 'personal editor beats group commenter');
    const groupMember = await memberIdOf(owner.client, notebookId, groupId);
    await owner.client.delete(`/api/notebooks/${notebookId}/members/${groupMember}`).expect(200);
    assert.equal(await roleOn(carl.client, notebookId), 'editor');
  });

  test('only members of a group may share with it', async () => {
    const notebookId = await newNotebook(bea.client, 'Invented outsider notebook');
    const refused = await bea.client.post(`/api/notebooks/${notebookId}/members`).send({ groupId, role: 'viewer' }).expect(403);
    assert.equal(refused.body.error.code, 'forbidden');
    assert.equal(await h.rungbook.services.dataSource.getRepository(NotebookMember).countBy({ notebookId }), 0);
  });

  test('viewers and commenters read the member list but manage nothing (403); emails, links and invitations stay hidden from them', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented read-only list');
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: bea.email, role: 'commenter' }).expect(200);
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: 'nobody-yet@test.rungbook.example', role: 'viewer' }).expect(200);
    await owner.client.post(`/api/notebooks/${notebookId}/links`).send({ role: 'viewer' }).expect(201);
    const seen = (await bea.client.get(`/api/notebooks/${notebookId}/members`).expect(200)).body;
    assert.equal(seen.role, 'commenter');
    assert.deepEqual(seen.links, []);
    assert.deepEqual(seen.invitations, []);
    assert.ok(seen.members.every((m: { email: string | null }) => m.email === null));
    const ownersView = (await owner.client.get(`/api/notebooks/${notebookId}/members`).expect(200)).body;
    assert.equal(ownersView.links.length, 1);
    assert.equal(ownersView.invitations.length, 1);
    for (const attempt of [
      bea.client.post(`/api/notebooks/${notebookId}/members`).send({ email: dora.email, role: 'viewer' }),
      bea.client.post(`/api/notebooks/${notebookId}/links`).send({ role: 'viewer' }),
      bea.client.delete(`/api/notebooks/${notebookId}/links/${ownersView.links[0].id}`),
      bea.client.delete(`/api/notebooks/${notebookId}/invitations/${ownersView.invitations[0].id}`),
    ]) {
      const reply = await attempt;
      assert.equal(reply.status, 403);
      assert.equal(reply.body.error.code, 'forbidden');
    }
    assert.equal(await roleOn(dora.client, notebookId), null);
    await dora.client.get(`/api/notebooks/${notebookId}/members`).expect(404);
  });

  test('an editor shares up to editor but cannot grant ownership or transfer it', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented editor rules');
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: bea.email, role: 'editor' }).expect(200);
    await bea.client.post(`/api/notebooks/${notebookId}/members`).send({ email: dora.email, role: 'editor' }).expect(200);
    assert.equal(await roleOn(dora.client, notebookId), 'editor');
    const ownerRole = await bea.client.post(`/api/notebooks/${notebookId}/members`).send({ email: carl.email, role: 'owner' }).expect(400);
    assert.equal(ownerRole.body.error.code, 'validation_failed');
    const transfer = await bea.client.post(`/api/notebooks/${notebookId}/owner`).send({ userId: bea.id }).expect(403);
    assert.equal(transfer.body.error.code, 'forbidden');
    const stored = await h.rungbook.services.dataSource.getRepository(Notebook).findOneByOrFail({ id: notebookId });
    assert.equal(stored.ownerId, owner.id);
  });

  test('a viewer or commenter editing a cell through the API gets 403 and the cell stays as it was', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented locked cells');
    const cell = (await owner.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'setup', input: SETUP_CELL }).expect(201)).body.notebook.cells[0];
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: bea.email, role: 'viewer' }).expect(200);
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: dora.email, role: 'commenter' }).expect(200);
    for (const who of [bea, dora]) {
      const reply = await who.client.patch(`/api/notebooks/${notebookId}/cells/${cell.id}`).send({ revision: cell.revision, input: { ...SETUP_CELL, digits: 30 } }).expect(403);
      assert.equal(reply.body.error.code, 'forbidden');
      await who.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'other', input: SETUP_CELL }).expect(403);
    }
    const after = (await owner.client.get(`/api/notebooks/${notebookId}`).expect(200)).body.notebook.cells;
    assert.equal(after.length, 1);
    assert.equal(after[0].revision, cell.revision);
    assert.deepEqual(after[0].input, cell.input);
  });

  test('a role change takes effect at once: an editor made viewer can no longer edit', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented demotion');
    const cell = (await owner.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'setup', input: SETUP_CELL }).expect(201)).body.notebook.cells[0];
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: bea.email, role: 'editor' }).expect(200);
    const edited = (await bea.client.patch(`/api/notebooks/${notebookId}/cells/${cell.id}`).send({ revision: cell.revision, input: { ...SETUP_CELL, digits: 25 } }).expect(200)).body.notebook.cells[0];
    assert.equal(edited.revision, cell.revision + 1);
    const memberId = await memberIdOf(owner.client, notebookId, bea.id);
    const changed = (await owner.client.patch(`/api/notebooks/${notebookId}/members/${memberId}`).send({ role: 'viewer' }).expect(200)).body;
    assert.equal(changed.members.find((m: { subjectId: string }) => m.subjectId === bea.id).role, 'viewer');
    await bea.client.patch(`/api/notebooks/${notebookId}/cells/${cell.id}`).send({ revision: edited.revision, input: SETUP_CELL }).expect(403);
    await owner.client.delete(`/api/notebooks/${notebookId}/members/${memberId}`).expect(200);
    assert.equal(await roleOn(bea.client, notebookId), null);
  });

  test('each sharing change is logged in the notebook and published with an access change', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented logged sharing');
    const changes: NotebookChange[] = [];
    const accessChanges: AccessChange[] = [];
    const stopChanges = h.rungbook.services.events.onChange((change) => changes.push(change));
    const stopAccess = h.rungbook.services.events.onAccessChange((change) => accessChanges.push(change));
    try {
      await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: bea.email, role: 'viewer' }).expect(200);
      const link = (await owner.client.post(`/api/notebooks/${notebookId}/links`).send({ role: 'viewer' }).expect(201)).body;
      await owner.client.delete(`/api/notebooks/${notebookId}/links/${link.id}`).expect(200);
    } finally {
      stopChanges();
      stopAccess();
    }
    const kinds = ['sharing-changed', 'link-created', 'link-revoked'];
    assert.deepEqual(changes.filter((c) => c.notebookId === notebookId).map((c) => c.kind), kinds);
    assert.deepEqual(accessChanges.filter((c) => 'notebookId' in c && c.notebookId === notebookId).length, 3);
    const logged = await h.rungbook.services.dataSource.getRepository(NotebookEvent).find({ where: { notebookId }, order: { createdAt: 'ASC' } });
    assert.deepEqual(logged.map((e) => e.kind).filter((k) => kinds.includes(k)).sort(), [...kinds].sort());
    assert.ok(logged.every((e) => e.actorId === owner.id));
  });

  test('joining or leaving a group is announced as an access change for that person', async () => {
    const eve = await createPerson(h, { tag: 'eve' });
    const heard: AccessChange[] = [];
    const stop = h.rungbook.services.events.onAccessChange((change) => heard.push(change));
    try {
      await owner.client.post(`/api/groups/${groupId}/members`).send({ email: eve.email, role: 'member' }).expect(201);
      await eve.client.delete(`/api/groups/${groupId}/members/${eve.id}`).expect(200);
    } finally {
      stop();
    }
    assert.deepEqual(heard, [{ userId: eve.id }, { userId: eve.id }]);
  });

  test('removing the grant of the group a notebook is filed under files it nowhere', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented filed notebook', groupId);
    assert.equal(await roleOn(carl.client, notebookId), 'editor', 'filing under a group is an editor grant to it');
    const groupMember = await memberIdOf(owner.client, notebookId, groupId);
    await owner.client.delete(`/api/notebooks/${notebookId}/members/${groupMember}`).expect(200);
    const stored = await h.rungbook.services.dataSource.getRepository(Notebook).findOneByOrFail({ id: notebookId });
    assert.equal(stored.groupId, null);
    assert.equal(await roleOn(carl.client, notebookId), null);
  });

  test('anyone may give up their own personal grant', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented leaving');
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: dora.email, role: 'viewer' }).expect(200);
    const memberId = await memberIdOf(dora.client, notebookId, dora.id);
    await dora.client.delete(`/api/notebooks/${notebookId}/members/${memberId}`).expect(204);
    assert.equal(await roleOn(dora.client, notebookId), null);
  });
});

describe('handing a notebook to another owner', () => {
  let h: Harness;
  let owner: TestPerson;
  let editor: TestPerson;
  let stranger: TestPerson;
  let notebookId: string;

  before(async () => {
    h = await startHarness();
    owner = await createPerson(h, { tag: 'first-owner' });
    editor = await createPerson(h, { tag: 'next-owner' });
    stranger = await createPerson(h, { tag: 'stranger' });
    notebookId = await newNotebook(owner.client, 'Invented handover');
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: editor.email, role: 'editor' }).expect(200);
  });
  after(() => h.close());

  test('only someone who already has a role can become owner', async () => {
    const refused = await owner.client.post(`/api/notebooks/${notebookId}/owner`).send({ userId: stranger.id }).expect(400);
    assert.equal(refused.body.error.code, 'validation_failed');
    assert.equal(await roleOn(stranger.client, notebookId), null);
  });

  test('the new owner owns it, their grant is gone, the former owner stays an editor', async () => {
    const view = (await owner.client.post(`/api/notebooks/${notebookId}/owner`).send({ userId: editor.id }).expect(200)).body;
    assert.equal(view.role, 'editor');
    assert.deepEqual(view.members.map((m: { subjectId: string; role: string }) => [m.subjectId, m.role]), [[editor.id, 'owner'], [owner.id, 'editor']]);
    assert.equal(await roleOn(editor.client, notebookId), 'owner');
    assert.equal(await roleOn(owner.client, notebookId), 'editor');
    const grants = await h.rungbook.services.dataSource.getRepository(NotebookMember).findBy({ notebookId });
    assert.deepEqual(grants.map((g) => [g.userId, g.role]), [[owner.id, 'editor']]);
    const stored = await h.rungbook.services.dataSource.getRepository(Notebook).findOneByOrFail({ id: notebookId });
    assert.equal(stored.ownerId, editor.id);
  });

  test('the former owner can no longer transfer or delete it', async () => {
    await owner.client.post(`/api/notebooks/${notebookId}/owner`).send({ userId: owner.id }).expect(403);
    await owner.client.delete(`/api/notebooks/${notebookId}`).expect(403);
    assert.equal(await roleOn(editor.client, notebookId), 'owner');
  });
});
