import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { sha256Hex, newLinkToken } from '../../server/auth/linkTokens';
import { Comment, NotebookMember, ShareLink, User } from '../../server/db/entities';
import { newId } from '../../server/ids';
import { mentionHandles, mentionedHandles } from '../../server/services/comments';
import {
  COMMENT_EDIT_WINDOW_MS,
  COMMENT_MAX_CHARS,
  COMMENTS_PER_PERSON_PER_HOUR,
  MAX_COMMENT_CHARS_PER_NOTEBOOK,
  MAX_COMMENTS_PER_NOTEBOOK,
  MAX_MENTIONS_PER_COMMENT,
  type CommentView,
  type MentionCandidate,
  type NotificationView,
} from '../../shared/notebook/sharing';
import { mailTo, ORIGIN, startHarness, type Harness } from './harness';
import { createPerson, type Client, type TestPerson } from './people';

async function grant(h: Harness, notebookId: string, userId: string, role: 'viewer' | 'commenter' | 'editor', grantedById: string) {
  await h.rungbook.services.dataSource.getRepository(NotebookMember).insert({ id: newId(), notebookId, userId, groupId: null, role, grantedById });
}

async function shareLink(h: Harness, notebookId: string, role: 'viewer' | 'commenter', createdById: string): Promise<string> {
  const token = newLinkToken();
  await h.rungbook.services.dataSource.getRepository(ShareLink).insert({ id: newId(), notebookId, tokenHash: sha256Hex(token), role, createdById, expiresAt: null, revokedAt: null });
  return token;
}

async function newNotebook(client: Client, title: string): Promise<{ notebookId: string; cellId: string }> {
  const notebookId = (await client.post('/api/notebooks').send({ title, summary: '' }).expect(201)).body.notebook.id as string;
  const cells = (await client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'note1', input: { kind: 'note', text: 'Invented derivation note' } }).expect(201)).body.notebook.cells;
  return { notebookId, cellId: cells[0].id as string };
}

const comments = async (client: Client, notebookId: string): Promise<CommentView[]> => (await client.get(`/api/notebooks/${notebookId}/comments`).expect(200)).body.comments;
const activityOf = async (who: TestPerson): Promise<NotificationView[]> => (await who.client.get('/api/activity').expect(200)).body.items;
/** The documented handle: the part of the address before @ (no two test people share it). */
const handleOf = (who: TestPerson) => who.email.split('@')[0].toLowerCase();

describe('comment threads, mentions and link holders', () => {
  let h: Harness;
  let owner: TestPerson, editor: TestPerson, commenter: TestPerson, viewer: TestPerson, outsider: TestPerson;
  let notebookId: string;
  let cellId: string;
  const title = 'Invented two-loop check';

  before(async () => {
    h = await startHarness();
    [owner, editor, commenter, viewer, outsider] = await Promise.all(['owner', 'editor', 'commenter', 'viewer', 'outsider'].map((tag) => createPerson(h, { tag })));
    ({ notebookId, cellId } = await newNotebook(owner.client, title));
    await grant(h, notebookId, editor.id, 'editor', owner.id);
    await grant(h, notebookId, commenter.id, 'commenter', owner.id);
    await grant(h, notebookId, viewer.id, 'viewer', owner.id);
  });
  after(() => h.close());

  test('threads on a cell and on the notebook as a whole, anchored to the cell\'s label and revision', async () => {
    const onCell = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'Check the ε pole here', cellId }).expect(201)).body.comment as CommentView;
    const onNotebook = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'Overall: looks right' }).expect(201)).body.comment as CommentView;
    assert.deepEqual([onCell.cellId, onCell.cellLabel, onCell.cellRevision, onCell.cellChangedSince], [cellId, 'note1', 1, false]);
    assert.deepEqual([onNotebook.cellId, onNotebook.cellLabel, onNotebook.cellRevision], [null, null, null]);
    assert.equal(onCell.authorId, commenter.id);
    const listed = await comments(viewer.client, notebookId);
    assert.deepEqual(listed.map((c) => c.id), [onCell.id, onNotebook.id]);
    // A viewer reads but may neither edit nor delete.
    assert.ok(listed.every((c) => !c.canEdit && !c.canDelete));
  });

  test('the longest allowed comment is kept whole; one character more is refused and nothing is stored', async () => {
    const longest = `${'ε'.repeat(COMMENT_MAX_CHARS - 1)}!`;
    const kept = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: longest }).expect(201)).body.comment as CommentView;
    assert.equal(kept.body, longest);
    const before = (await comments(owner.client, notebookId)).length;
    const tooLong = await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: `${longest}x` }).expect(400);
    assert.equal(tooLong.body.error.code, 'validation_failed');
    assert.equal((await comments(owner.client, notebookId)).length, before);
    await owner.client.delete(`/api/comments/${kept.id}`).expect(204);
  });

  test('a cell of another notebook is refused (404) and nothing is stored', async () => {
    const other = await newNotebook(outsider.client, 'Invented other notebook');
    const before = await h.rungbook.services.dataSource.getRepository(Comment).count();
    await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'misplaced', cellId: other.cellId }).expect(404);
    assert.equal(await h.rungbook.services.dataSource.getRepository(Comment).count(), before);
  });

  test('a reply joins its thread, takes the root\'s cell and tells the earlier participants', async () => {
    const root = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'Is the sign right?', cellId }).expect(201)).body.comment as CommentView;
    const reply = (await editor.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'Yes, see eq. 3', parentId: root.id }).expect(201)).body.comment as CommentView;
    assert.equal(reply.parentId, root.id);
    assert.equal(reply.cellId, cellId);
    const listed = await comments(owner.client, notebookId);
    assert.equal(listed.findIndex((c) => c.id === reply.id), listed.findIndex((c) => c.id === root.id) + 1);
    const replies = (await activityOf(commenter)).filter((n) => n.kind === 'reply' && n.commentId === reply.id);
    assert.equal(replies.length, 1);
    assert.equal((await activityOf(editor)).filter((n) => n.kind === 'reply').length, 0, 'the author is not told about their own reply');
    // A reply to a reply is refused: threads are one level deep.
    await owner.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'nested', parentId: reply.id }).expect(404);
  });

  test('own comments can be edited within the window, not after it, and not by others', async () => {
    const mine = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'typo in eq 2' }).expect(201)).body.comment as CommentView;
    assert.equal(mine.canEdit, true);
    const edited = (await commenter.client.patch(`/api/comments/${mine.id}`).send({ body: 'typo in eq. 2' }).expect(200)).body.comment as CommentView;
    assert.equal(edited.body, 'typo in eq. 2');
    assert.notEqual(edited.editedAt, null);
    await owner.client.patch(`/api/comments/${mine.id}`).send({ body: 'owner rewrites' }).expect(403);
    await h.rungbook.services.dataSource.getRepository(Comment).update({ id: mine.id }, { createdAt: new Date(Date.now() - COMMENT_EDIT_WINDOW_MS - 60_000) });
    const late = await commenter.client.patch(`/api/comments/${mine.id}`).send({ body: 'too late' }).expect(403);
    assert.match(late.body.error.message, /15 minutes.*passed/);
    const stored = (await comments(commenter.client, notebookId)).find((c) => c.id === mine.id)!;
    assert.equal(stored.body, 'typo in eq. 2');
    assert.equal(stored.canEdit, false);
  });

  test('delete own; the owner deletes anyone\'s; an editor cannot delete another\'s', async () => {
    const post = async (who: TestPerson, body: string) => (await who.client.post(`/api/notebooks/${notebookId}/comments`).send({ body }).expect(201)).body.comment as CommentView;
    const own = await post(commenter, 'to be withdrawn');
    const others = await post(commenter, 'the owner removes this');
    const kept = await post(commenter, 'an editor cannot remove this');
    await commenter.client.delete(`/api/comments/${own.id}`).expect(204);
    await owner.client.delete(`/api/comments/${others.id}`).expect(204);
    await editor.client.delete(`/api/comments/${kept.id}`).expect(403);
    const ids = (await comments(owner.client, notebookId)).map((c) => c.id);
    assert.ok(!ids.includes(own.id) && !ids.includes(others.id));
    assert.ok(ids.includes(kept.id));
  });

  test('a deleted comment with replies stays as an empty placeholder', async () => {
    const root = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'root to delete' }).expect(201)).body.comment as CommentView;
    await editor.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'a reply', parentId: root.id }).expect(201);
    await commenter.client.delete(`/api/comments/${root.id}`).expect(204);
    const placeholder = (await comments(owner.client, notebookId)).find((c) => c.id === root.id)!;
    assert.deepEqual([placeholder.deleted, placeholder.body, placeholder.canEdit, placeholder.canDelete], [true, '', false, false]);
  });

  test('resolve and reopen a thread (commenter and up); a reply cannot be resolved on its own', async () => {
    const root = (await owner.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'Settle the scheme', cellId }).expect(201)).body.comment as CommentView;
    const reply = (await editor.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'MS-bar', parentId: root.id }).expect(201)).body.comment as CommentView;
    await viewer.client.patch(`/api/comments/${root.id}`).send({ resolved: true }).expect(403);
    const resolved = (await commenter.client.patch(`/api/comments/${root.id}`).send({ resolved: true }).expect(200)).body.comment as CommentView;
    assert.notEqual(resolved.resolvedAt, null);
    assert.equal(resolved.resolvedByName, `Invented commenter`);
    const reopened = (await editor.client.patch(`/api/comments/${root.id}`).send({ resolved: false }).expect(200)).body.comment as CommentView;
    assert.deepEqual([reopened.resolvedAt, reopened.resolvedByName], [null, null]);
    await editor.client.patch(`/api/comments/${reply.id}`).send({ resolved: true }).expect(400);
  });

  test('a comment says when its cell has changed since it was written', async () => {
    const before = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'on revision 1', cellId }).expect(201)).body.comment as CommentView;
    const detail = (await owner.client.get(`/api/notebooks/${notebookId}`).expect(200)).body.notebook;
    const revision = detail.cells.find((c: { id: string }) => c.id === cellId).revision as number;
    await owner.client.patch(`/api/notebooks/${notebookId}/cells/${cellId}`).send({ revision, input: { kind: 'note', text: 'Invented derivation note, corrected' } }).expect(200);
    const after = (await comments(commenter.client, notebookId)).find((c) => c.id === before.id)!;
    assert.equal(after.cellRevision, before.cellRevision);
    assert.equal(after.cellChangedSince, true);
    const fresh = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'on the new revision', cellId }).expect(201)).body.comment as CommentView;
    assert.deepEqual([fresh.cellRevision, fresh.cellChangedSince], [revision + 1, false]);
  });

  test('a viewer cannot comment (403) and nothing is stored', async () => {
    const before = await h.rungbook.services.dataSource.getRepository(Comment).count();
    await viewer.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'I want to say something' }).expect(403);
    await outsider.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'hello?' }).expect(404);
    assert.equal(await h.rungbook.services.dataSource.getRepository(Comment).count(), before);
  });

  test('HTML in a body comes back as the very same text: stored as written, escaping is the renderer\'s job', async () => {
    const body = '<script>alert(1)</script> <img src=x onerror="alert(2)"> & $\\epsilon < 1$';
    const posted = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body }).expect(201)).body.comment as CommentView;
    assert.equal(posted.body, body);
    assert.equal((await comments(viewer.client, notebookId)).find((c) => c.id === posted.id)!.body, body);
  });

  test('mention candidates are the people with access, by handle, without addresses', async () => {
    const people = (await commenter.client.get(`/api/notebooks/${notebookId}/mention-candidates`).expect(200)).body.people as MentionCandidate[];
    assert.deepEqual(people.map((p) => p.id).sort(), [owner.id, editor.id, viewer.id].sort());
    assert.equal(people.find((p) => p.id === owner.id)!.handle, handleOf(owner));
    assert.ok(!JSON.stringify(people).includes('@'), 'no e-mail address in the reply');
    const filtered = (await commenter.client.get(`/api/notebooks/${notebookId}/mention-candidates`).query({ q: handleOf(editor) }).expect(200)).body.people as MentionCandidate[];
    assert.deepEqual(filtered.map((p) => p.id), [editor.id]);
    await viewer.client.get(`/api/notebooks/${notebookId}/mention-candidates`).expect(403);
    await outsider.client.get(`/api/notebooks/${notebookId}/mention-candidates`).expect(404);
  });

  test('a mention of a person with access: an activity entry and an e-mail with the notebook\'s link', async () => {
    const posted = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: `@${handleOf(owner)} please check the counterterm`, cellId }).expect(201)).body.comment as CommentView;
    assert.deepEqual(posted.mentions, [owner.id]);
    const entry = (await activityOf(owner)).find((n) => n.kind === 'mention' && n.commentId === posted.id);
    assert.ok(entry);
    assert.deepEqual([entry.notebookId, entry.notebookTitle, entry.cellId, entry.read], [notebookId, title, cellId, false]);
    const mail = await mailTo(h, owner.email, `Invented commenter mentioned you in ${title}`);
    assert.ok(mail.textBody.includes(`${ORIGIN}/notebooks/${notebookId}`));
  });

  test('names and titles in a mention e-mail stay on one line, whatever line breaks they hold', async () => {
    const brokenTitle = 'Invented title\nSubject: forged\r\n\nForged paragraph';
    const flatTitle = 'Invented title Subject: forged Forged paragraph';
    const broken = await newNotebook(owner.client, brokenTitle);
    await grant(h, broken.notebookId, commenter.id, 'commenter', owner.id);
    const rename = async (name: string) => {
      await h.rungbook.services.dataSource.getRepository(User).update({ id: commenter.id }, { name });
      h.rungbook.services.sessions.forgetCached(commenter.id);
    };
    await rename('Invented\ncommenter');
    try {
      await commenter.client.post(`/api/notebooks/${broken.notebookId}/comments`).send({ body: `@${handleOf(owner)} see the title` }).expect(201);
      const mail = await mailTo(h, owner.email, `Invented commenter mentioned you in ${flatTitle}`);
      assert.equal(mail.textBody.split(/\r?\n/)[0], `Invented commenter mentioned you in a comment on "${flatTitle}":`);
      assert.ok(!/^(Subject|Forged)/m.test(mail.textBody), mail.textBody);
    } finally {
      await rename('Invented commenter');
    }
  });

  test('a mention of someone without access does nothing: no e-mail, no entry, the reply of an unknown handle', async () => {
    const strangerReply = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: `@${handleOf(outsider)} have a look` }).expect(201)).body.comment as CommentView;
    const unknownReply = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: '@nosuchhandle1 have a look' }).expect(201)).body.comment as CommentView;
    const shape = (c: CommentView) => ({ ...c, id: '', body: '', createdAt: '' });
    assert.deepEqual(shape(strangerReply), shape(unknownReply));
    assert.deepEqual(strangerReply.mentions, []);
    await h.rungbook.services.mailer.idle();
    assert.deepEqual(await activityOf(outsider), []);
    assert.equal((await h.capturedMail()).filter((m) => m.recipients.includes(outsider.email)).length, 0);
  });

  test('PATCH and DELETE of a comment on a notebook the caller cannot open answer like a missing comment', async () => {
    const posted = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: 'private thought' }).expect(201)).body.comment as CommentView;
    const hidden = await outsider.client.patch(`/api/comments/${posted.id}`).send({ resolved: true }).expect(404);
    const missing = await outsider.client.patch(`/api/comments/${newId()}`).send({ resolved: true }).expect(404);
    assert.deepEqual(hidden.body, missing.body);
    await outsider.client.delete(`/api/comments/${posted.id}`).expect(404);
  });

  test('link holders: a viewer link reads the comments, a commenter link lets a signed-in person comment', async () => {
    const viewerToken = await shareLink(h, notebookId, 'viewer', owner.id);
    const commenterToken = await shareLink(h, notebookId, 'commenter', owner.id);
    const expected = (await comments(owner.client, notebookId)).map((c) => c.id);
    const anonymous = (await h.browser().get(`/api/shared/${viewerToken}/comments`).expect(200)).body.comments as CommentView[];
    assert.deepEqual(anonymous.map((c) => c.id), expected);
    await h.browser().post(`/api/shared/${commenterToken}/comments`).send({ body: 'signed out' }).expect(401);
    await outsider.client.post(`/api/shared/${viewerToken}/comments`).send({ body: 'through a viewer link' }).expect(403);
    const posted = (await outsider.client.post(`/api/shared/${commenterToken}/comments`).send({ body: 'through a commenter link', cellId }).expect(201)).body.comment as CommentView;
    assert.equal(posted.notebookId, notebookId);
    assert.ok((await comments(owner.client, notebookId)).some((c) => c.id === posted.id));
    // Without a role of their own the author cannot change it afterwards (documented on PATCH/DELETE /api/comments/:id).
    assert.deepEqual([posted.canEdit, posted.canDelete], [false, false]);
    const throughLink = (await outsider.client.get(`/api/shared/${commenterToken}/comments`).expect(200)).body.comments as CommentView[];
    assert.deepEqual(throughLink.filter((c) => c.id === posted.id).map((c) => [c.canEdit, c.canDelete]), [[false, false]]);
    await outsider.client.patch(`/api/comments/${posted.id}`).send({ body: 'edited through a link' }).expect(404);
    await outsider.client.delete(`/api/comments/${posted.id}`).expect(404);
    assert.equal((await comments(owner.client, notebookId)).find((c) => c.id === posted.id)!.body, 'through a commenter link');
    await h.browser().get(`/api/shared/${newLinkToken()}/comments`).expect(404);
    // The link reaches only its own notebook's cells.
    const other = await newNotebook(owner.client, 'Invented unrelated notebook');
    await outsider.client.post(`/api/shared/${commenterToken}/comments`).send({ body: 'elsewhere', cellId: other.cellId }).expect(404);
  });
});

describe('mention e-mails are limited per sender', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness({ MENTION_MAIL_LIMIT_PER_USER: '1' });
  });
  after(() => h.close());

  test('beyond the hourly limit the e-mail is skipped but the activity entry is still written', async () => {
    const [author, reader] = await Promise.all([createPerson(h, { tag: 'author' }), createPerson(h, { tag: 'reader' })]);
    const { notebookId } = await newNotebook(author.client, 'Invented limit notebook');
    await grant(h, notebookId, reader.id, 'commenter', author.id);
    for (const n of [1, 2, 3]) await author.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: `@${handleOf(reader)} point ${n}` }).expect(201);
    await mailTo(h, reader.email, `Invented author mentioned you in Invented limit notebook`);
    await h.rungbook.services.mailer.idle();
    assert.equal((await h.capturedMail()).filter((m) => m.recipients.includes(reader.email)).length, 1);
    const entries = (await activityOf(reader)).filter((n) => n.kind === 'mention');
    assert.deepEqual(entries.map((n) => n.text), ['3 mentions in "Invented limit notebook"; latest: Invented author on the notebook']);
  });
});

/** Comments written straight into the database, to bring a notebook near its limits cheaply. */
async function storeComments(h: Harness, notebookId: string, authorId: string, bodies: string[]) {
  const rows = bodies.map((body) => ({ id: newId(), notebookId, cellId: null, cellLabel: null, cellRevision: null, parentId: null, authorId, body, mentionsJson: '[]', createdAt: new Date() }));
  for (let i = 0; i < rows.length; i += 100) await h.rungbook.services.dataSource.getRepository(Comment).insert(rows.slice(i, i + 100));
}

describe('comment limits: per person, per notebook, per comment', () => {
  let h: Harness;
  let owner: TestPerson, commenter: TestPerson;
  const countIn = (notebookId: string) => h.rungbook.services.dataSource.getRepository(Comment).countBy({ notebookId });
  const post = (who: TestPerson, notebookId: string, body: string) => who.client.post(`/api/notebooks/${notebookId}/comments`).send({ body });
  const mentionMailsTo = async (who: TestPerson, subject: string) => {
    await h.rungbook.services.mailer.idle();
    return (await h.capturedMail()).filter((m) => m.recipients.includes(who.email) && m.subject === subject).length;
  };
  const unreadMentions = async (who: TestPerson, notebookId: string) => (await activityOf(who)).filter((n) => n.kind === 'mention' && n.notebookId === notebookId && !n.read);

  before(async () => {
    h = await startHarness();
    [owner, commenter] = await Promise.all(['owner', 'commenter'].map((tag) => createPerson(h, { tag })));
  });
  after(() => h.close());

  async function sharedNotebookWithCell(title: string): Promise<{ notebookId: string; cellId: string }> {
    const created = await newNotebook(owner.client, title);
    await grant(h, created.notebookId, commenter.id, 'commenter', owner.id);
    return created;
  }
  const sharedNotebook = async (title: string) => (await sharedNotebookWithCell(title)).notebookId;

  test('the documented limits', () => {
    // README "Comments": 120 new comments per person per hour; 2000 comments and 2 000 000 characters per notebook; 20 mentions per comment.
    assert.deepEqual(
      [COMMENTS_PER_PERSON_PER_HOUR, MAX_COMMENTS_PER_NOTEBOOK, MAX_COMMENT_CHARS_PER_NOTEBOOK, MAX_MENTIONS_PER_COMMENT],
      [120, 2000, 2_000_000, 20],
    );
  });

  test('a comment naming more than the allowed number of distinct handles is refused (400) and nothing is stored', async () => {
    const notebookId = await sharedNotebook('Invented crowded notebook');
    const handles = (n: number) => Array.from({ length: n }, (_, i) => `@someone${i}`).join(' ');
    const refused = await post(commenter, notebookId, `${handles(21)} see this`).expect(400);
    assert.equal(refused.body.error.code, 'validation_failed');
    assert.match(refused.body.error.fields.body, /at most 20 people/);
    assert.equal(await countIn(notebookId), 0);
    // The same handle twice is one mention.
    await post(commenter, notebookId, `${handles(20)} @someone0 see this`).expect(201);
    const mine = (await post(commenter, notebookId, 'short').expect(201)).body.comment as CommentView;
    await commenter.client.patch(`/api/comments/${mine.id}`).send({ body: handles(21) }).expect(400);
    assert.equal((await comments(owner.client, notebookId)).find((c) => c.id === mine.id)!.body, 'short');
  });

  test('a person is told once per comment: removing and re-adding a mention by editing tells nobody again', async () => {
    const title = 'Invented once-per-comment notebook';
    const notebookId = await sharedNotebook(title);
    const subject = `Invented commenter mentioned you in ${title}`;
    const posted = (await post(commenter, notebookId, `@${handleOf(owner)} check eq. 4`).expect(201)).body.comment as CommentView;
    await mailTo(h, owner.email, subject);
    for (let round = 0; round < 3; round += 1) {
      await commenter.client.patch(`/api/comments/${posted.id}`).send({ body: 'check eq. 4' }).expect(200);
      await commenter.client.patch(`/api/comments/${posted.id}`).send({ body: `@${handleOf(owner)} check eq. 4 (round ${round})` }).expect(200);
    }
    assert.equal(await mentionMailsTo(owner, subject), 1);
    const entries = await unreadMentions(owner, notebookId);
    assert.deepEqual(entries.map((n) => [n.text, n.commentId]), [[`Invented commenter mentioned you in "${title}"`, posted.id]]);
    // Even after the entry was read, an edit does not tell again.
    await owner.client.post('/api/activity/read').send({}).expect(200);
    await commenter.client.patch(`/api/comments/${posted.id}`).send({ body: 'check eq. 4' }).expect(200);
    await commenter.client.patch(`/api/comments/${posted.id}`).send({ body: `@${handleOf(owner)} check eq. 4 again` }).expect(200);
    assert.equal((await unreadMentions(owner, notebookId)).length, 0);
    assert.equal(await mentionMailsTo(owner, subject), 1);
  });

  test('once per comment also when a later mention has taken over the unread entry', async () => {
    const title = 'Invented two-comment notebook';
    const notebookId = await sharedNotebook(title);
    const subject = `Invented commenter mentioned you in ${title}`;
    const first = (await post(commenter, notebookId, `@${handleOf(owner)} first`).expect(201)).body.comment as CommentView;
    await post(commenter, notebookId, `@${handleOf(owner)} second`).expect(201);
    await commenter.client.patch(`/api/comments/${first.id}`).send({ body: 'first' }).expect(200);
    await commenter.client.patch(`/api/comments/${first.id}`).send({ body: `@${handleOf(owner)} first, again` }).expect(200);
    assert.deepEqual((await unreadMentions(owner, notebookId)).map((n) => n.text), [`2 mentions in "${title}"; latest: Invented commenter on the notebook`]);
    assert.equal(await mentionMailsTo(owner, subject), 2);
  });

  test('an edit tells a person the comment had not mentioned before', async () => {
    const title = 'Invented added-mention notebook';
    const notebookId = await sharedNotebook(title);
    const posted = (await post(owner, notebookId, 'a remark').expect(201)).body.comment as CommentView;
    await owner.client.patch(`/api/comments/${posted.id}`).send({ body: `a remark for @${handleOf(commenter)}` }).expect(200);
    await mailTo(h, commenter.email, `Invented owner mentioned you in ${title}`);
    assert.deepEqual((await unreadMentions(commenter, notebookId)).map((n) => n.commentId), [posted.id]);
  });

  test('unread mentions of one person in one notebook make one entry naming the count and the latest', async () => {
    const title = 'Invented coalescing notebook';
    const { notebookId, cellId } = await sharedNotebookWithCell(title);
    const other = await sharedNotebook('Invented second coalescing notebook');
    await post(commenter, notebookId, `@${handleOf(owner)} first`).expect(201);
    await post(commenter, other, `@${handleOf(owner)} elsewhere`).expect(201);
    const second = (await commenter.client.post(`/api/notebooks/${notebookId}/comments`).send({ body: `@${handleOf(owner)} second`, cellId }).expect(201)).body.comment as CommentView;
    const afterSecond = await unreadMentions(owner, notebookId);
    assert.deepEqual(afterSecond.map((n) => [n.text, n.commentId, n.cellId]), [[`2 mentions in "${title}"; latest: Invented commenter on cell "note1"`, second.id, cellId]]);
    const third = (await post(commenter, notebookId, `@${handleOf(owner)} third`).expect(201)).body.comment as CommentView;
    const entries = await unreadMentions(owner, notebookId);
    assert.equal(entries.length, 1);
    assert.equal(entries[0].id, afterSecond[0].id, 'the same entry, rewritten');
    assert.equal(entries[0].text, `3 mentions in "${title}"; latest: Invented commenter on the notebook`);
    assert.deepEqual([entries[0].commentId, entries[0].cellId, entries[0].actorName], [third.id, null, 'Invented commenter']);
    assert.equal((await unreadMentions(owner, other)).length, 1, 'another notebook keeps its own entry');
    // Each mention still sends its e-mail (within the sender's hourly limit).
    assert.equal(await mentionMailsTo(owner, `Invented commenter mentioned you in ${title}`), 3);
    // Once read, the next mention starts a new entry.
    await owner.client.post('/api/activity/read').send({}).expect(200);
    const fourth = (await post(commenter, notebookId, `@${handleOf(owner)} fourth`).expect(201)).body.comment as CommentView;
    assert.deepEqual((await unreadMentions(owner, notebookId)).map((n) => [n.text, n.commentId]), [[`Invented commenter mentioned you in "${title}"`, fourth.id]]);
  });

  test('a notebook holds a bounded number of comments: one more is 409 and nothing is stored', async () => {
    const notebookId = await sharedNotebook('Invented full notebook');
    await storeComments(h, notebookId, owner.id, Array.from({ length: MAX_COMMENTS_PER_NOTEBOOK - 1 }, () => 'x'));
    await post(commenter, notebookId, 'the last one that fits').expect(201);
    const refused = await post(commenter, notebookId, 'one too many').expect(409);
    assert.equal(refused.body.error.code, 'conflict');
    assert.match(refused.body.error.message, /holds the most comments it can.*delete resolved threads/);
    assert.equal(await countIn(notebookId), 2000);
    assert.equal((await comments(owner.client, notebookId)).length, 2000);
  });

  test('a notebook holds a bounded number of characters of comments, for new and lengthened comments', async () => {
    const notebookId = await sharedNotebook('Invented wordy notebook');
    const room = 10;
    const full = Array.from({ length: 400 }, () => 'y'.repeat(COMMENT_MAX_CHARS));
    full[0] = 'y'.repeat(COMMENT_MAX_CHARS - room);
    await storeComments(h, notebookId, owner.id, full);
    const fits = (await post(commenter, notebookId, 'z'.repeat(room)).expect(201)).body.comment as CommentView;
    await post(commenter, notebookId, 'z').expect(409);
    await commenter.client.patch(`/api/comments/${fits.id}`).send({ body: 'z'.repeat(room + 1) }).expect(409);
    await commenter.client.patch(`/api/comments/${fits.id}`).send({ body: 'z'.repeat(room - 1) }).expect(200);
    const held = (await comments(owner.client, notebookId)).reduce((sum, c) => sum + c.body.length, 0);
    assert.equal(held, 2_000_000 - 1);
    // Deleting makes room again.
    await commenter.client.delete(`/api/comments/${fits.id}`).expect(204);
    await post(commenter, notebookId, 'z'.repeat(room)).expect(201);
  });

  test('one person writes a bounded number of comments per hour: one more is 429 naming the limit and nothing is stored', async () => {
    const busy = await createPerson(h, { tag: 'busy' });
    const notebookId = await sharedNotebook('Invented busy notebook');
    await grant(h, notebookId, busy.id, 'commenter', owner.id);
    for (let n = 0; n < 120; n += 1) await post(busy, notebookId, `point ${n}`).expect(201);
    const refused = await post(busy, notebookId, 'point 120').expect(429);
    assert.equal(refused.body.error.code, 'rate_limited');
    assert.match(refused.body.error.message, /at most 120 comments per hour/);
    assert.equal(await countIn(notebookId), 120);
    // Someone else is not held back.
    await post(commenter, notebookId, 'still welcome').expect(201);
  });
});

describe('mention handles', () => {
  test('the part before @; people sharing it are numbered in address order, never colliding with a real handle', () => {
    const handles = mentionHandles([
      { id: 'b', email: 'Ann@zeta.example' },
      { id: 'a', email: 'ann@alpha.example' },
      { id: 'c', email: 'ann2@beta.example' },
      { id: 'd', email: 'bo+notes@beta.example' },
    ]);
    assert.deepEqual(Object.fromEntries(handles), { a: 'ann', b: 'ann3', c: 'ann2', d: 'bonotes' });
  });

  test('@ inside an address is not a mention; trailing punctuation is not part of the handle', () => {
    assert.deepEqual([...mentionedHandles('mail ann@x.example, ask @Bo. and @cy-2!')], ['bo', 'cy-2']);
  });
});
