import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { User } from '../../server/db/entities';
import { person, startHarness, type Harness } from './harness';

describe('research groups and roles, enforced on the server', () => {
  let h: Harness;
  let lead: ReturnType<Harness['browser']>;
  let member: ReturnType<Harness['browser']>;
  let outsider: ReturnType<Harness['browser']>;
  let admin: ReturnType<Harness['browser']>;
  let groupId: string;
  let memberId: string;
  let leadId: string;

  before(async () => {
    h = await startHarness();
    [lead, member, outsider, admin] = [h.browser(), h.browser(), h.browser(), h.browser()];
    leadId = (await lead.post('/api/auth/sign-up').send(person(1)).expect(201)).body.user.id;
    memberId = (await member.post('/api/auth/sign-up').send(person(2)).expect(201)).body.user.id;
    await outsider.post('/api/auth/sign-up').send(person(3)).expect(201);
    await admin.post('/api/auth/sign-up').send(person(4)).expect(201);
    await h.rungbook.services.dataSource.getRepository(User).update({ emailKey: person(4).email }, { siteRole: 'admin' });
  });
  after(() => h.close());

  test('whoever starts a group is its lead', async () => {
    const reply = await lead.post('/api/groups').send({ name: 'Invented Flow Group', description: 'invented' }).expect(201);
    groupId = reply.body.group.id;
    assert.equal(reply.body.group.myRole, 'lead');
    assert.deepEqual(reply.body.group.members.map((m: { userId: string }) => m.userId), [leadId]);
  });

  test('a lead adds a member by e-mail (any case); the member then sees the group', async () => {
    const reply = await lead.post(`/api/groups/${groupId}/members`).send({ email: person(2).email.toUpperCase() }).expect(201);
    assert.equal(reply.body.group.memberCount, 2);
    const list = await member.get('/api/groups').expect(200);
    assert.deepEqual(list.body.groups.map((g: { id: string; myRole: string; memberCount: number }) => [g.id, g.myRole, g.memberCount]), [[groupId, 'member', 2]]);
  });

  test('a member may not change membership (403); an outsider cannot even see the group (404)', async () => {
    const denied = await member.post(`/api/groups/${groupId}/members`).send({ email: person(3).email }).expect(403);
    assert.equal(denied.body.error.code, 'forbidden');
    await member.patch(`/api/groups/${groupId}/members/${leadId}`).send({ role: 'member' }).expect(403);
    await outsider.get(`/api/groups/${groupId}`).expect(404);
    assert.deepEqual((await outsider.get('/api/groups').expect(200)).body.groups, []);
  });

  test('signed-out callers get 401 on every group route', async () => {
    await h.raw.get('/api/groups').expect(401);
    await h.raw.get(`/api/groups/${groupId}`).expect(401);
  });

  test('a site admin sees and manages any group', async () => {
    const list = await admin.get('/api/groups').expect(200);
    assert.deepEqual(list.body.groups.map((g: { id: string; myRole: null }) => [g.id, g.myRole]), [[groupId, null]]);
    const promoted = await admin.patch(`/api/groups/${groupId}/members/${memberId}`).send({ role: 'lead' }).expect(200);
    assert.equal(promoted.body.group.members.filter((m: { role: string }) => m.role === 'lead').length, 2);
    await admin.patch(`/api/groups/${groupId}/members/${memberId}`).send({ role: 'member' }).expect(200);
  });

  test('the last lead cannot be demoted or removed (409)', async () => {
    const demote = await lead.patch(`/api/groups/${groupId}/members/${leadId}`).send({ role: 'member' }).expect(409);
    assert.equal(demote.body.error.code, 'conflict');
    await lead.delete(`/api/groups/${groupId}/members/${leadId}`).expect(409);
  });

  test('a member may leave; adding an unknown e-mail or a bad role is refused with field messages', async () => {
    const left = await member.delete(`/api/groups/${groupId}/members/${memberId}`).expect(200);
    assert.equal(left.body.group.memberCount, 1);
    const unknown = await lead.post(`/api/groups/${groupId}/members`).send({ email: 'ghost@test.rungbook.example' }).expect(404);
    assert.ok(unknown.body.error.fields.email);
    const badRole = await lead.post(`/api/groups/${groupId}/members`).send({ email: person(2).email, role: 'owner' }).expect(400);
    assert.ok(badRole.body.error.fields.role);
    const badId = await lead.get('/api/groups/NOT-AN-ID').expect(400);
    assert.equal(badId.body.error.code, 'validation_failed');
  });

  test('captured mail is for site admins only', async () => {
    await h.raw.get('/api/admin/mail').expect(401);
    await lead.get('/api/admin/mail').expect(403);
    const inbox = await admin.get('/api/admin/mail').expect(200);
    // Four sign-ups, four welcome messages through the capture.
    assert.equal(inbox.body.messages.length, 4);
    assert.ok(inbox.body.messages.every((m: { subject: string }) => m.subject === 'Welcome to Rungbook'));
  });
});
