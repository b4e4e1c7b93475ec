import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { NotebookMember } from '../../server/db/entities';
import { newId } from '../../server/ids';
import type { ActivityReply, CommentView, NotebookEventView } from '../../shared/notebook/sharing';
import { startHarness, type Harness } from './harness';
import { createPerson, notebookWithRun, type TestPerson } from './people';

const handleOf = (who: TestPerson) => who.email.split('@')[0].toLowerCase();

describe('activity: per person and per notebook', () => {
  let h: Harness;
  let owner: TestPerson, editor: TestPerson, commenter: TestPerson, viewer: TestPerson, outsider: TestPerson;
  let notebookId: string;
  const title = 'Invented activity notebook';

  const grant = (userId: string, role: 'viewer' | 'commenter' | 'editor') =>
    h.rungbook.services.dataSource.getRepository(NotebookMember).insert({ id: newId(), notebookId, userId, groupId: null, role, grantedById: owner.id });
  const activity = async (who: TestPerson): Promise<ActivityReply> => (await who.client.get('/api/activity').expect(200)).body;
  const comment = async (who: TestPerson, body: string): Promise<CommentView> => (await who.client.post(`/api/notebooks/${notebookId}/comments`).send({ body }).expect(201)).body.comment;
  /** Mark everything read once the changes published so far have reached followers. */
  const readAll = async (who: TestPerson) => {
    await h.rungbook.services.activity.idle();
    await who.client.post('/api/activity/read').send({}).expect(200);
  };
  const changesFor = async (who: TestPerson) => {
    await h.rungbook.services.activity.idle();
    return (await activity(who)).items.filter((n) => n.kind === 'notebook-change');
  };

  before(async () => {
    h = await startHarness();
    [owner, editor, commenter, viewer, outsider] = await Promise.all(['owner', 'editor', 'commenter', 'viewer', 'outsider'].map((tag) => createPerson(h, { tag })));
    notebookId = (await owner.client.post('/api/notebooks').send({ title, summary: '' }).expect(201)).body.notebook.id;
    await grant(editor.id, 'editor');
    await grant(commenter.id, 'commenter');
    await grant(viewer.id, 'viewer');
  });
  after(() => h.close());

  test('unread count, newest first, mark one read and then all', async () => {
    const first = await comment(commenter, `@${handleOf(editor)} first point`);
    const firstEntry = (await activity(editor)).items.find((n) => n.kind === 'mention' && n.commentId === first.id)!;
    await editor.client.post('/api/activity/read').send({ ids: [firstEntry.id] }).expect(200);
    // a read mention is not merged into: the next one starts an entry of its own
    const second = await comment(commenter, `@${handleOf(editor)} second point`);
    const before = await activity(editor);
    const mentions = before.items.filter((n) => n.kind === 'mention');
    assert.deepEqual(mentions.map((n) => n.commentId), [second.id, first.id]);
    assert.deepEqual(mentions.map((n) => n.read), [false, true]);
    assert.equal(before.unread, before.items.filter((n) => !n.read).length);
    assert.ok(before.unread >= 1);
    const reply = await editor.client.post('/api/activity/read').send({ ids: [mentions[0].id] }).expect(200);
    assert.equal(reply.body.unread, before.unread - 1);
    const middle = await activity(editor);
    assert.equal(middle.items.find((n) => n.id === mentions[0].id)!.read, true);
    await editor.client.post('/api/activity/read').send({}).expect(200);
    const after = await activity(editor);
    assert.equal(after.unread, 0);
    assert.ok(after.items.every((n) => n.read));
    // Someone else's ids are not theirs to mark.
    const ownerBefore = (await activity(owner)).unread;
    await editor.client.post('/api/activity/read').send({ ids: (await activity(owner)).items.map((n) => n.id) }).expect(200);
    assert.equal((await activity(owner)).unread, ownerBefore);
  });

  test('followers hear of changes by others once until they read it; the actor does not; the owner follows implicitly', async () => {
    await viewer.client.post(`/api/notebooks/${notebookId}/follow`).expect(200, { following: true });
    await readAll(viewer);
    await readAll(owner);
    const already = (await changesFor(editor)).length;
    await comment(editor, 'first change by the editor');
    await comment(editor, 'second change by the editor');
    const viewerChanges = (await changesFor(viewer)).filter((n) => !n.read);
    assert.equal(viewerChanges.length, 1, 'coalesced into one unread entry');
    assert.equal(viewerChanges[0].notebookId, notebookId);
    assert.equal(viewerChanges[0].text, `2 changes in "${title}" since you last looked; latest: Invented editor commented on the notebook`);
    assert.equal((await changesFor(owner)).filter((n) => !n.read).length, 1);
    assert.equal((await changesFor(editor)).length, already, 'no entry for one\'s own changes');
    await readAll(viewer);
    await comment(editor, 'third change by the editor');
    const afterRead = await changesFor(viewer);
    assert.equal(afterRead.length, 2);
    assert.equal(afterRead.filter((n) => !n.read).map((n) => n.text).join(), `Invented editor commented on the notebook in "${title}"`);
  });

  test('a coalesced entry names the latest change, counts them, and takes the latest change\'s time', async () => {
    await readAll(viewer);
    const root = await comment(editor, 'one');
    await comment(commenter, 'two');
    await editor.client.patch(`/api/comments/${root.id}`).send({ body: 'one, edited' }).expect(200);
    const unread = (await changesFor(viewer)).filter((n) => !n.read);
    assert.deepEqual(unread.map((n) => [n.text, n.actorName]), [[`3 changes in "${title}" since you last looked; latest: Invented editor edited a comment on the notebook`, 'Invented editor']]);
    const newestLogEntry = ((await viewer.client.get(`/api/notebooks/${notebookId}/activity`).expect(200)).body.events as NotebookEventView[])[0];
    assert.equal(newestLogEntry.kind, 'comment-edited');
    assert.ok(Date.parse(unread[0].createdAt) >= Date.parse(newestLogEntry.createdAt), 'the entry is as recent as the latest change');
  });

  test('a run finishing tells no follower (nobody made that change); starting it told the others', async () => {
    const groupId = (await owner.client.post('/api/groups').send({ name: 'Invented Activity Group', description: '' }).expect(201)).body.group.id as string;
    let stopListening = () => {};
    const finished = new Promise<void>((resolve) => {
      stopListening = h.rungbook.services.events.onChange((change) => {
        if (change.kind === 'cell-run' && change.actorId === null) resolve();
      });
    });
    const ran = await notebookWithRun(owner.client, groupId);
    await finished;
    stopListening();
    await h.rungbook.services.activity.idle();
    const ownersEntries = (await activity(owner)).items.filter((n) => n.notebookId === ran.notebookId);
    assert.deepEqual(ownersEntries.map((n) => n.text), [], 'the owner started the run: nothing to tell them');
    const all = (await activity(owner)).items.concat((await activity(editor)).items, (await activity(viewer)).items);
    assert.ok(!all.some((n) => n.text.includes('a run finished') || n.text.startsWith('Someone')), JSON.stringify(all.map((n) => n.text)));
  });

  test('commenting follows the notebook; unfollowing stops the entries', async () => {
    await commenter.client.get(`/api/notebooks/${notebookId}/follow`).expect(200, { following: true });
    await readAll(commenter);
    await comment(editor, 'the commenter follows since commenting');
    assert.equal((await changesFor(commenter)).filter((n) => !n.read).length, 1);
    await commenter.client.delete(`/api/notebooks/${notebookId}/follow`).expect(200, { following: false });
    await readAll(commenter);
    await comment(editor, 'after unfollowing');
    assert.equal((await changesFor(commenter)).filter((n) => !n.read).length, 0);
    await owner.client.delete(`/api/notebooks/${notebookId}/follow`).expect(200, { following: true });
    await outsider.client.post(`/api/notebooks/${notebookId}/follow`).expect(404);
  });

  test('entries of a notebook the person can no longer open are not shown', async () => {
    const lateViewer = await createPerson(h, { tag: 'late' });
    await grant(lateViewer.id, 'commenter');
    await comment(commenter, `@${handleOf(lateViewer)} have a look`);
    const before = await activity(lateViewer);
    assert.equal(before.items.filter((n) => n.notebookId === notebookId).length, 1);
    assert.equal(before.unread, 1);
    await h.rungbook.services.dataSource.getRepository(NotebookMember).delete({ notebookId, userId: lateViewer.id });
    const after = await activity(lateViewer);
    assert.deepEqual([after.items.length, after.unread], [0, 0]);
  });

  test('the notebook\'s log, newest first, filtered by kind and by person; viewers read it, strangers get 404', async () => {
    const root = await comment(commenter, 'thread to resolve');
    await commenter.client.patch(`/api/comments/${root.id}`).send({ resolved: true }).expect(200);
    await editor.client.patch(`/api/comments/${root.id}`).send({ resolved: false }).expect(200);
    await owner.client.patch(`/api/comments/${root.id}`).send({ resolved: true }).expect(200);
    const resolved = (await viewer.client.get(`/api/notebooks/${notebookId}/activity`).query({ kind: 'comment-resolved' }).expect(200)).body.events as NotebookEventView[];
    assert.deepEqual(resolved.map((e) => [e.kind, e.actorId]), [['comment-resolved', owner.id], ['comment-resolved', commenter.id]]);
    const all = (await viewer.client.get(`/api/notebooks/${notebookId}/activity`).expect(200)).body.events as NotebookEventView[];
    assert.deepEqual(all.slice(0, 3).map((e) => e.kind), ['comment-resolved', 'comment-reopened', 'comment-resolved']);
    const byEditor = (await viewer.client.get(`/api/notebooks/${notebookId}/activity`).query({ actorId: editor.id }).expect(200)).body.events as NotebookEventView[];
    assert.ok(byEditor.length > 0 && byEditor.every((e) => e.actorId === editor.id));
    assert.equal(byEditor.length, all.filter((e) => e.actorId === editor.id).length);
    await viewer.client.get(`/api/notebooks/${notebookId}/activity`).query({ kind: 'no-such-kind' }).expect(400);
    await outsider.client.get(`/api/notebooks/${notebookId}/activity`).expect(404);
  });
});
