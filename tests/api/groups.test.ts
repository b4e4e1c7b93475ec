import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { User } from '../../server/db/entities';
import { mailTo, ORIGIN, person, signUpVerified, startHarness, verificationTokenFrom, type Harness } from './harness';
import { createPerson } from './people';

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
    leadId = (await signUpVerified(h, 1, lead)).user.id;
    memberId = (await signUpVerified(h, 2, member)).user.id;
    await signUpVerified(h, 3, outsider);
    await signUpVerified(h, 4, admin);
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

  test('a site admin cannot add anyone to a group they do not lead: not themself, not a second account of their own (403)', async () => {
    const selfAdd = await admin.post(`/api/groups/${groupId}/members`).send({ email: person(4).email.toUpperCase(), role: 'lead' }).expect(403);
    assert.equal(selfAdd.body.error.code, 'forbidden');
    assert.match(selfAdd.body.error.message, /Only a lead of this group can add people/);
    // Person 3 stands for a second account the admin controls: verified, and not in the group.
    const secondAccount = await admin.post(`/api/groups/${groupId}/members`).send({ email: person(3).email, role: 'member' }).expect(403);
    assert.equal(secondAccount.body.error.code, 'forbidden');
    const detail = await lead.get(`/api/groups/${groupId}`).expect(200);
    assert.deepEqual(
      detail.body.group.members.map((m: { email: string }) => m.email).sort(),
      [person(1).email, person(2).email].sort(),
      'only the lead and the member the lead added',
    );
    // Added by a lead as a plain member, the admin still cannot promote themself, nor add anyone as a mere member.
    const adminId = (await lead.post(`/api/groups/${groupId}/members`).send({ email: person(4).email }).expect(201)).body.group.members.find((m: { email: string }) => m.email === person(4).email).userId;
    assert.equal((await admin.patch(`/api/groups/${groupId}/members/${adminId}`).send({ role: 'lead' }).expect(403)).body.error.code, 'forbidden');
    assert.equal((await admin.post(`/api/groups/${groupId}/members`).send({ email: person(3).email }).expect(403)).body.error.code, 'forbidden');
    await admin.delete(`/api/groups/${groupId}/members/${adminId}`).expect(200);
  });

  test('a site admin removes a member of a group they do not belong to', async () => {
    await lead.post(`/api/groups/${groupId}/members`).send({ email: person(3).email }).expect(201);
    const outsiderId = (await lead.get(`/api/groups/${groupId}`).expect(200)).body.group.members.find((m: { email: string }) => m.email === person(3).email).userId;
    const after = await admin.delete(`/api/groups/${groupId}/members/${outsiderId}`).expect(200);
    assert.ok(!after.body.group.members.some((m: { email: string }) => m.email === person(3).email));
  });

  test('the last lead cannot be demoted or removed (409)', async () => {
    const demote = await lead.patch(`/api/groups/${groupId}/members/${leadId}`).send({ role: 'member' }).expect(409);
    assert.equal(demote.body.error.code, 'conflict');
    await lead.delete(`/api/groups/${groupId}/members/${leadId}`).expect(409);
  });

  test('a member may leave; adding an unknown e-mail or a bad role is refused with field messages', async () => {
    const left = await member.delete(`/api/groups/${groupId}/members/${memberId}`).expect(200);
    assert.equal(left.body.group.memberCount, 1);
    const unknown = await lead.post(`/api/groups/${groupId}/members`).send({ email: 'ghost@test.rungbook.example' }).expect(403);
    assert.equal(unknown.body.error.code, 'email_not_verified');
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
    // Four sign-ups, four confirmation links through the capture.
    assert.equal(inbox.body.messages.length, 4);
    assert.ok(inbox.body.messages.every((m: { subject: string }) => m.subject === 'Confirm your Rungbook e-mail address'));
  });
  test('an account whose address is not confirmed cannot be added, and the answer is the one an unknown address gets', async () => {
    const newcomer = h.browser();
    await newcomer.post('/api/auth/sign-up').send(person(5)).expect(202);
    // The account is written after the reply; wait for it so the check below is about an existing account.
    await h.rungbook.services.mailer.idle();
    const unverified = await lead.post(`/api/groups/${groupId}/members`).send({ email: person(5).email }).expect(403);
    const unknown = await lead.post(`/api/groups/${groupId}/members`).send({ email: 'nobody-here@test.rungbook.example' }).expect(403);
    assert.deepEqual(unverified.body, unknown.body, 'an unconfirmed account is indistinguishable from no account');
    assert.equal(unverified.body.error.code, 'email_not_verified');
    // A session from before confirmations were required: its account still cannot start a group.
    const stillUnconfirmed = await createPerson(h, { verified: false });
    const ownGroup = await stillUnconfirmed.client.post('/api/groups').send({ name: 'Invented Unconfirmed Group' }).expect(403);
    assert.equal(ownGroup.body.error.code, 'email_not_verified');
    const link = await mailTo(h, person(5).email, 'Confirm your Rungbook e-mail address');
    await newcomer.post('/api/auth/verify').send({ token: verificationTokenFrom(link.textBody), password: person(5).password }).expect(200);
    const added = await lead.post(`/api/groups/${groupId}/members`).send({ email: person(5).email }).expect(201);
    assert.ok(added.body.group.members.some((m: { email: string }) => m.email === person(5).email));
    assert.equal((await newcomer.get('/api/groups').expect(200)).body.groups.length, 1);
  });
});

describe('adding people to groups is rate-limited per person', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness({ GROUP_ADD_LIMIT_PER_USER: '3' });
  });
  after(() => h.close());

  test('past GROUP_ADD_LIMIT_PER_USER tries an hour a lead gets 429; malformed tries are not counted; another lead is unaffected', async () => {
    const { client: lead } = await signUpVerified(h, 1);
    const { client: otherLead } = await signUpVerified(h, 2);
    const groupId = (await lead.post('/api/groups').send({ name: 'Invented Limited Group' }).expect(201)).body.group.id as string;
    const otherGroupId = (await otherLead.post('/api/groups').send({ name: 'Invented Other Group' }).expect(201)).body.group.id as string;
    for (let i = 0; i < 2; i += 1) await lead.post(`/api/groups/${groupId}/members`).send({ email: 'not-an-address' }).expect(400);
    for (let i = 0; i < 3; i += 1) await lead.post(`/api/groups/${groupId}/members`).send({ email: `probe${i}@test.rungbook.example` }).expect(403);
    const limited = await lead.post(`/api/groups/${groupId}/members`).send({ email: person(2).email }).expect(429);
    assert.equal(limited.body.error.code, 'rate_limited');
    await otherLead.post(`/api/groups/${otherGroupId}/members`).send({ email: person(1).email }).expect(201);
    await h.raw.post(`/api/groups/${groupId}/members`).set('Origin', ORIGIN).send({ email: person(2).email }).expect(401);
  });
});
