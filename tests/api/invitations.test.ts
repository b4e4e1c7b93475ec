import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { NotebookInvitation, NotebookMember, Notification } from '../../server/db/entities';
import { INVITATION_LIFETIME_MS } from '../../server/services/sharing';
import { newId } from '../../server/ids';
import { mailTo, ORIGIN, signUpVerified, startHarness, type Harness } from './harness';
import { createPerson, type Client, type TestPerson } from './people';

// Documented behaviour (issue 9, "Invitations by e-mail"): an invitation carries the role; accepting after
// sign-up and address verification grants it; invitation e-mails are limited per sender
// (INVITE_LIMIT_PER_USER, README); an invitation holds for 14 days.

async function newNotebook(client: Client, title: string): Promise<string> {
  return (await client.post('/api/notebooks').send({ title, summary: '', groupId: null }).expect(201)).body.notebook.id as string;
}

const newcomer = (n: number) => ({ name: `Invented Newcomer ${n}`, email: `newcomer${n}@test.rungbook.example`, password: `long-enough-pass-newcomer-${n}` });

describe('invitations by e-mail', () => {
  let h: Harness;
  let owner: TestPerson;

  before(async () => {
    h = await startHarness();
    owner = await createPerson(h, { tag: 'inviter' });
  });
  after(() => h.close());

  test('an address without an account is invited by mail; after sign-up and confirmation the notebook is listed with the invited role', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented invited notebook');
    const invitee = newcomer(1);
    const view = (await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: invitee.email, role: 'commenter' }).expect(200)).body;
    assert.deepEqual(view.invitations.map((i: { email: string; role: string }) => [i.email, i.role]), [[invitee.email, 'commenter']]);
    const invitation = view.invitations[0];
    assert.equal(Date.parse(invitation.expiresAt) - Date.parse(invitation.createdAt), INVITATION_LIFETIME_MS);
    assert.equal(INVITATION_LIFETIME_MS, 14 * 24 * 3600 * 1000);

    const mail = await mailTo(h, invitee.email, 'Invented inviter invited you to "Invented invited notebook" on Rungbook');
    assert.ok(mail.textBody.includes(`${ORIGIN}/sign-up?email=${encodeURIComponent(invitee.email)}&invited=1`), mail.textBody);
    assert.match(mail.textBody, /as a commenter/);

    const { client, user } = await signUpVerified(h, invitee);
    const listed = (await client.get('/api/notebooks').expect(200)).body.notebooks;
    assert.deepEqual(listed.map((n: { id: string; role: string }) => [n.id, n.role]), [[notebookId, 'commenter']]);

    const stored = await h.rungbook.services.dataSource.getRepository(NotebookInvitation).findOneByOrFail({ id: invitation.id });
    assert.ok(stored.acceptedAt);
    assert.equal(stored.acceptedById, user.id);
    const after = (await owner.client.get(`/api/notebooks/${notebookId}/members`).expect(200)).body;
    assert.deepEqual(after.invitations, []);
    assert.deepEqual(after.members.map((m: { subjectId: string; role: string }) => [m.subjectId, m.role]), [[owner.id, 'owner'], [user.id, 'commenter']]);
    const notes = await h.rungbook.services.dataSource.getRepository(Notification).findBy({ userId: user.id });
    assert.deepEqual(notes.map((n) => [n.kind, n.notebookId]), [['invitation', notebookId]]);
  });

  test('an existing, confirmed account gets the grant at once and a mail, no invitation', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented direct share');
    const member = await createPerson(h, { tag: 'existing' });
    const view = (await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: member.email, role: 'editor' }).expect(200)).body;
    assert.deepEqual(view.invitations, []);
    assert.equal((await member.client.get(`/api/notebooks/${notebookId}`).expect(200)).body.notebook.role, 'editor');
    const mail = await mailTo(h, member.email, 'Invented inviter shared "Invented direct share" with you');
    assert.match(mail.textBody, /as an editor/);
  });

  test('a cancelled or expired invitation grants nothing', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented withdrawn');
    const cancelled = newcomer(2);
    const expired = newcomer(3);
    const view = (await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: cancelled.email, role: 'viewer' }).expect(200)).body;
    await owner.client.delete(`/api/notebooks/${notebookId}/invitations/${view.invitations[0].id}`).expect(200);
    await h.rungbook.services.dataSource.getRepository(NotebookInvitation).insert({
      id: newId(), notebookId, emailKey: expired.email, email: expired.email, role: 'editor', invitedById: owner.id, expiresAt: new Date(Date.now() - 1000), acceptedAt: null, acceptedById: null,
    });
    for (const account of [cancelled, expired]) {
      const { client } = await signUpVerified(h, account);
      assert.deepEqual((await client.get('/api/notebooks').expect(200)).body.notebooks, []);
      await client.get(`/api/notebooks/${notebookId}`).expect(404);
    }
    assert.equal(await h.rungbook.services.dataSource.getRepository(NotebookMember).countBy({ notebookId }), 0);
  });

  test('someone outside the notebook cannot cancel its invitations (404)', async () => {
    const notebookId = await newNotebook(owner.client, 'Invented guarded invitation');
    const view = (await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: newcomer(4).email, role: 'viewer' }).expect(200)).body;
    const stranger = await createPerson(h, { tag: 'stranger' });
    await stranger.client.delete(`/api/notebooks/${notebookId}/invitations/${view.invitations[0].id}`).expect(404);
    assert.equal((await owner.client.get(`/api/notebooks/${notebookId}/members`).expect(200)).body.invitations.length, 1);
  });
});

describe('invitation and sharing e-mails are limited per sender', () => {
  const LIMIT = 2;
  let h: Harness;
  let sender: TestPerson;
  let other: TestPerson;

  before(async () => {
    h = await startHarness({ INVITE_LIMIT_PER_USER: String(LIMIT) });
    sender = await createPerson(h, { tag: 'busy-sender' });
    other = await createPerson(h, { tag: 'other-sender' });
  });
  after(() => h.close());

  test(`beyond ${LIMIT} per hour: 429 naming the limit, and neither grant nor invitation is made`, async () => {
    const notebookId = await newNotebook(sender.client, 'Invented busy notebook');
    await sender.client.post(`/api/notebooks/${notebookId}/members`).send({ email: newcomer(10).email, role: 'viewer' }).expect(200);
    await sender.client.post(`/api/notebooks/${notebookId}/members`).send({ email: newcomer(11).email, role: 'viewer' }).expect(200);
    const account = await createPerson(h, { tag: 'would-be-member' });
    const refusedGrant = await sender.client.post(`/api/notebooks/${notebookId}/members`).send({ email: account.email, role: 'viewer' }).expect(429);
    assert.equal(refusedGrant.body.error.code, 'rate_limited');
    assert.match(refusedGrant.body.error.message, new RegExp(`at most ${LIMIT} `));
    await account.client.get(`/api/notebooks/${notebookId}`).expect(404);
    const refusedInvite = await sender.client.post(`/api/notebooks/${notebookId}/members`).send({ email: newcomer(12).email, role: 'viewer' }).expect(429);
    assert.equal(refusedInvite.body.error.code, 'rate_limited');
    const view = (await sender.client.get(`/api/notebooks/${notebookId}/members`).expect(200)).body;
    assert.deepEqual(view.invitations.map((i: { email: string }) => i.email).sort(), [newcomer(10).email, newcomer(11).email]);
    assert.equal(view.members.length, 1, 'only the owner');
  });

  test('the limit counts per sender: someone else may still share', async () => {
    const notebookId = await newNotebook(other.client, 'Invented calm notebook');
    await other.client.post(`/api/notebooks/${notebookId}/members`).send({ email: newcomer(13).email, role: 'viewer' }).expect(200);
  });
});

// Documented behaviour (README, sharing panel): an invitation acts for the person who sent it; on acceptance it
// grants at most the sender's role at that moment, and nothing once the sender no longer manages sharing
// (editor or owner). The panel shows such a pending invitation as void.
describe('an invitation grants only what its sender may still hand out', () => {
  let h: Harness;
  let owner: TestPerson;
  let notebookId: string;

  const membersPath = () => `/api/notebooks/${notebookId}/members`;
  async function editorInviting(tag: string, invitee: ReturnType<typeof newcomer>, role: 'viewer' | 'commenter' | 'editor') {
    const sender = await createPerson(h, { tag });
    await owner.client.post(membersPath()).send({ email: sender.email, role: 'editor' }).expect(200);
    const view = (await sender.client.post(membersPath()).send({ email: invitee.email, role }).expect(200)).body;
    const memberId = (view.members as { id: string; subjectId: string }[]).find((m) => m.subjectId === sender.id)!.id;
    const invitationId = (view.invitations as { id: string; email: string }[]).find((i) => i.email === invitee.email)!.id;
    return { sender, memberId, invitationId };
  }
  const listedInvitation = async (id: string) =>
    ((await owner.client.get(membersPath()).expect(200)).body.invitations as { id: string; voidReason: string | null }[]).find((i) => i.id === id)!;

  before(async () => {
    h = await startHarness();
    owner = await createPerson(h, { tag: 'notebook-owner' });
    notebookId = await newNotebook(owner.client, 'Invented delegated invitations');
  });
  after(() => h.close());

  test('a sender who is still an editor: the invitation grants the invited role (control)', async () => {
    const invitee = newcomer(20);
    const { invitationId } = await editorInviting('steady-editor', invitee, 'editor');
    assert.equal((await listedInvitation(invitationId)).voidReason, null);
    const { client } = await signUpVerified(h, invitee);
    assert.equal((await client.get(`/api/notebooks/${notebookId}`).expect(200)).body.notebook.role, 'editor');
  });

  test('a sender removed from the notebook: the invitation is listed as void, grants nothing, and is used up', async () => {
    const invitee = newcomer(21);
    const { memberId, invitationId } = await editorInviting('removed-editor', invitee, 'editor');
    await owner.client.delete(`${membersPath()}/${memberId}`).expect(200);
    assert.equal((await listedInvitation(invitationId)).voidReason, 'its sender no longer manages sharing');
    const { client, user } = await signUpVerified(h, invitee);
    await client.get(`/api/notebooks/${notebookId}`).expect(404);
    assert.deepEqual((await client.get('/api/notebooks').expect(200)).body.notebooks, []);
    assert.equal(await h.rungbook.services.dataSource.getRepository(NotebookMember).countBy({ notebookId, userId: user.id }), 0);
    const stored = await h.rungbook.services.dataSource.getRepository(NotebookInvitation).findOneByOrFail({ id: invitationId });
    assert.ok(stored.acceptedAt, 'no longer pending');
    assert.equal((await owner.client.get(membersPath()).expect(200)).body.invitations.some((i: { id: string }) => i.id === invitationId), false);
    assert.equal(await h.rungbook.services.dataSource.getRepository(Notification).countBy({ userId: user.id, kind: 'invitation' }), 0);
  });

  test('a sender lowered to viewer (or commenter) before acceptance: the invitation grants nothing', async () => {
    for (const [n, lowered] of [[22, 'viewer'], [23, 'commenter']] as const) {
      const invitee = newcomer(n);
      const { memberId, invitationId } = await editorInviting(`lowered-to-${lowered}`, invitee, 'editor');
      await owner.client.patch(`${membersPath()}/${memberId}`).send({ role: lowered }).expect(200);
      assert.equal((await listedInvitation(invitationId)).voidReason, 'its sender no longer manages sharing');
      const { client } = await signUpVerified(h, invitee);
      await client.get(`/api/notebooks/${notebookId}`).expect(404);
    }
  });

  test('the invited role is capped at the sender\'s role when accepted', async () => {
    // Through the API an editor can invite at most as an editor, so an over-strong invitation is written here
    // directly: an owner-strength role is never granted by an invitation from an editor.
    const invitee = newcomer(24);
    const { sender } = await editorInviting('capping-editor', newcomer(25), 'viewer');
    await h.rungbook.services.dataSource.getRepository(NotebookInvitation).insert({
      id: newId(), notebookId, emailKey: invitee.email, email: invitee.email, role: 'owner' as 'editor', invitedById: sender.id,
      expiresAt: new Date(Date.now() + INVITATION_LIFETIME_MS), acceptedAt: null, acceptedById: null,
    });
    const { client } = await signUpVerified(h, invitee);
    assert.equal((await client.get(`/api/notebooks/${notebookId}`).expect(200)).body.notebook.role, 'editor');
  });
});
