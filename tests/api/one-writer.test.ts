import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import type { NotebookDetail, RunView } from '../../shared/notebook/api';
import type { NotebookEventKind } from '../../shared/notebook/sharing';
import { Cell, Notebook, NotebookEvent, NotebookMember, NotebookVersion } from '../../server/db/entities';
import { newId } from '../../server/ids';
import type { NotebookChange } from '../../server/services/notebookEvents';
import { startHarness, type Harness } from './harness';
import { createPerson, settleRun, type TestPerson } from './people';

const setupInput = { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.5', loops: 2, digits: 20 };
const bubbleInput = { kind: 'integral', uses: 'setup', form: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1 };

describe('one writer of cells: every write is checked, logged once and announced', () => {
  let h: Harness;
  let owner: TestPerson;
  let viewer: TestPerson;
  let notebookId: string;
  const published: NotebookChange[] = [];

  const events = () => h.rungbook.services.dataSource.getRepository(NotebookEvent);
  const versions = () => h.rungbook.services.dataSource.getRepository(NotebookVersion);
  const cellRows = () => h.rungbook.services.dataSource.getRepository(Cell);
  const cellsOf = async (): Promise<NotebookDetail['cells']> => ((await owner.client.get(`/api/notebooks/${notebookId}`).expect(200)).body.notebook as NotebookDetail).cells;
  const cellId = async (label: string) => (await cellsOf()).find((c) => c.label === label)!.id;

  /** Do one write and return the log rows and announcements it left (on any notebook). */
  async function logOf(write: () => Promise<unknown>): Promise<{ rows: NotebookEvent[]; announced: NotebookChange[] }> {
    const before = new Set((await events().find()).map((row) => row.id));
    const announcedBefore = published.length;
    await write();
    const rows = (await events().find()).filter((row) => !before.has(row.id));
    return { rows, announced: published.slice(announcedBefore).filter((change) => change.actorId !== null) };
  }

  async function expectOneRow(write: () => Promise<unknown>, kind: NotebookEventKind, expected: { cellId?: string | null; notebookId?: string } = {}) {
    const { rows, announced } = await logOf(write);
    assert.equal(rows.length, 1, `exactly one log row for ${kind}, got ${rows.map((r) => r.kind).join(', ')}`);
    assert.equal(rows[0].kind, kind);
    assert.equal(rows[0].actorId, owner.id);
    assert.equal(rows[0].notebookId, expected.notebookId ?? notebookId);
    if (expected.cellId !== undefined) assert.equal(rows[0].cellId, expected.cellId);
    assert.deepEqual(
      announced.map((c) => [c.kind, c.notebookId, c.cellId, c.text]),
      [[rows[0].kind, rows[0].notebookId, rows[0].cellId, rows[0].text]],
      'the same change is announced once, after the commit',
    );
    return rows[0];
  }

  before(async () => {
    h = await startHarness();
    h.rungbook.services.events.onChange((change) => published.push(change));
    owner = await createPerson(h, { tag: 'owner' });
    viewer = await createPerson(h, { tag: 'viewer' });
    notebookId = ((await owner.client.post('/api/notebooks').send({ title: 'Invented one-writer notebook', summary: '' }).expect(201)).body.notebook as NotebookDetail).id;
    await h.rungbook.services.dataSource.getRepository(NotebookMember).insert({ id: newId(), notebookId, userId: viewer.id, groupId: null, role: 'viewer', grantedById: owner.id });
  });
  after(() => h.close());

  test('add, edit, move, run, save a version, restore, delete, import: one log row each, of the right kind', async () => {
    const setupRow = await expectOneRow(() => owner.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'setup', input: setupInput }).expect(201), 'cell-added');
    const setupId = await cellId('setup');
    assert.equal(setupRow.cellId, setupId);
    await expectOneRow(() => owner.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'bubble', input: bubbleInput }).expect(201), 'cell-added');
    const bubbleId = await cellId('bubble');

    const versionsBefore = await versions().countBy({ notebookId });
    await expectOneRow(() => owner.client.patch(`/api/notebooks/${notebookId}/cells/${setupId}`).send({ input: { ...setupInput, digits: 25 }, revision: 1 }).expect(200), 'cell-edited', { cellId: setupId });
    const auto = await versions().find({ where: { notebookId }, order: { number: 'DESC' }, take: 1 });
    assert.equal(await versions().countBy({ notebookId }), versionsBefore + 1, 'changing a setup keeps an automatic version');
    assert.deepEqual([auto[0].message, auto[0].automatic], ['Before changing "setup"', true]);
    assert.equal(JSON.parse(auto[0].snapshotJson).cells[0].input.digits, 20, 'the version holds the state before the change');

    await expectOneRow(() => owner.client.post(`/api/notebooks/${notebookId}/cells/${bubbleId}/move`).send({ position: 0 }).expect(200), 'cell-moved', { cellId: bubbleId });
    assert.deepEqual((await cellsOf()).map((c) => c.label), ['bubble', 'setup']);

    let run: RunView | undefined;
    await expectOneRow(async () => (run = (await owner.client.post(`/api/notebooks/${notebookId}/cells/${bubbleId}/run`).expect(202)).body.run), 'cell-run', { cellId: bubbleId });
    assert.equal((await settleRun(owner.client, run!)).status, 'done');
    const holding = await cellRows().findOneByOrFail({ id: bubbleId });
    assert.equal(holding.lastRunId, run!.id, 'the run is recorded on the cell');

    const saved = await expectOneRow(() => owner.client.post(`/api/notebooks/${notebookId}/versions`).send({ message: 'Invented checkpoint' }).expect(201), 'version-saved', { cellId: null });
    assert.match(saved.text, /Invented checkpoint/);
    const savedVersion = (await versions().findOneByOrFail({ notebookId, message: 'Invented checkpoint' })).id;

    const beforeDelete = await versions().countBy({ notebookId });
    await expectOneRow(() => owner.client.delete(`/api/notebooks/${notebookId}/cells/${bubbleId}`).expect(200), 'cell-deleted', { cellId: bubbleId });
    assert.equal(await versions().countBy({ notebookId }), beforeDelete + 1, 'a version is kept before deleting a cell');
    assert.equal(await cellRows().countBy({ id: bubbleId }), 0);

    const beforeRestore = await versions().countBy({ notebookId });
    await expectOneRow(() => owner.client.post(`/api/notebooks/${notebookId}/versions/${savedVersion}/restore`).expect(200), 'restored');
    assert.equal(await versions().countBy({ notebookId }), beforeRestore + 2, 'the states before and after the restore are both kept');
    assert.deepEqual((await cellsOf()).map((c) => c.label), ['bubble', 'setup']);

    const exported = await owner.client.get(`/api/notebooks/${notebookId}/export.json`).expect(200);
    let importedId = '';
    const imported = await logOf(async () => {
      importedId = (await owner.client.post('/api/notebooks/import').send(JSON.parse(exported.text)).expect(201)).body.notebook.id;
    });
    assert.deepEqual(imported.rows.map((r) => [r.kind, r.notebookId, r.actorId]), [['imported', importedId, owner.id]]);
    assert.equal(await cellRows().countBy({ notebookId: importedId }), 2);
  });

  test('a viewer\'s edit, move, delete, run, save and restore are 403 and change nothing, not even the log', async () => {
    const cells = await cellsOf();
    const setup = cells.find((c) => c.label === 'setup')!;
    const version = await versions().findOneByOrFail({ notebookId, message: 'Invented checkpoint' });
    const cellsBefore = await cellRows().find({ where: { notebookId }, order: { position: 'ASC' } });
    const versionCount = await versions().countBy({ notebookId });
    const { rows, announced } = await logOf(async () => {
      const attempts: [string, () => PromiseLike<{ status: number; body: { error: { message: string } } }>][] = [
        ['add', () => viewer.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'extra', input: { kind: 'note', text: 'x' } })],
        ['edit', () => viewer.client.patch(`/api/notebooks/${notebookId}/cells/${setup.id}`).send({ input: { ...setupInput, digits: 30 }, revision: setup.revision })],
        ['move', () => viewer.client.post(`/api/notebooks/${notebookId}/cells/${setup.id}/move`).send({ position: 0 })],
        ['delete', () => viewer.client.delete(`/api/notebooks/${notebookId}/cells/${setup.id}`)],
        ['run', () => viewer.client.post(`/api/notebooks/${notebookId}/cells/${cells[0].id}/run`)],
        ['run all', () => viewer.client.post(`/api/notebooks/${notebookId}/run-all`)],
        ['save', () => viewer.client.post(`/api/notebooks/${notebookId}/versions`).send({ message: 'not allowed' })],
        ['restore', () => viewer.client.post(`/api/notebooks/${notebookId}/versions/${version.id}/restore`)],
        ['rename', () => viewer.client.patch(`/api/notebooks/${notebookId}`).send({ title: 'Renamed by a viewer' })],
      ];
      for (const [name, attempt] of attempts) {
        const reply = await attempt();
        assert.equal(reply.status, 403, name);
        assert.match(reply.body.error.message, /As a viewer you cannot/, name);
      }
    });
    assert.deepEqual(rows, []);
    assert.deepEqual(announced, []);
    assert.deepEqual(await cellRows().find({ where: { notebookId }, order: { position: 'ASC' } }), cellsBefore);
    assert.equal(await versions().countBy({ notebookId }), versionCount);
    // reading is the viewer's right: the versions, one version, the export
    await viewer.client.get(`/api/notebooks/${notebookId}/versions`).expect(200);
    await viewer.client.get(`/api/notebooks/${notebookId}/versions/${version.id}`).expect(200);
    await viewer.client.get(`/api/notebooks/${notebookId}/export.json`).expect(200);
  });

  test('a write that fails inside its transaction leaves neither its automatic version nor a log row', async () => {
    // changing the setup saves a version first; the clashing label then fails the same transaction
    await owner.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'other', input: { kind: 'note', text: 'An invented note.' } }).expect(201);
    const setup = (await cellsOf()).find((c) => c.label === 'setup')!;
    const versionCount = await versions().countBy({ notebookId });
    const { rows, announced } = await logOf(async () => {
      const reply = await owner.client.patch(`/api/notebooks/${notebookId}/cells/${setup.id}`).send({ label: 'other', input: { ...setupInput, digits: 31 }, revision: setup.revision }).expect(409);
      assert.match(reply.body.error.message, /already exists/);
    });
    assert.deepEqual([rows.length, announced.length], [0, 0]);
    assert.equal(await versions().countBy({ notebookId }), versionCount, 'the automatic version went with the failed write');
    assert.equal((await cellRows().findOneByOrFail({ id: setup.id })).revision, setup.revision);

    // a stale revision: 409 as before, nothing kept
    const stale = await owner.client.patch(`/api/notebooks/${notebookId}/cells/${setup.id}`).send({ input: { ...setupInput, digits: 32 }, revision: setup.revision + 5 }).expect(409);
    assert.match(stale.body.error.message, /changed elsewhere/);
    assert.equal(await versions().countBy({ notebookId }), versionCount);
  });

  test('viewing and cancelling runs follow the notebook role', async () => {
    const cells = await cellsOf();
    const bubble = cells.find((c) => c.label === 'bubble')!;
    const runId = bubble.lastRun!.id;
    await viewer.client.get(`/api/runs/${runId}`).expect(200);
    const refused = await viewer.client.post(`/api/runs/${runId}/cancel`).expect(403);
    assert.match(refused.body.error.message, /As a viewer you cannot run cells/);
    const stranger = await createPerson(h, { tag: 'stranger' });
    const hidden = await stranger.client.get(`/api/runs/${runId}`).expect(404);
    // answered exactly like a run id that never existed: nothing hints at the notebook behind it
    const unknown = await stranger.client.get('/api/runs/zzzzzzzzzzzzzzzzzzzz').expect(404);
    assert.equal(hidden.text, unknown.text);
  });
});

describe('forgetting a notebook drops every cached view of it', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness();
  });
  after(() => h.close());

  test('the common summary (title, owner, group) is read again after forget, even when updatedAt did not move', async () => {
    const owner = await createPerson(h);
    const id = ((await owner.client.post('/api/notebooks').send({ title: 'Invented cached title', summary: '' }).expect(201)).body.notebook as NotebookDetail).id;
    assert.equal(((await owner.client.get(`/api/notebooks/${id}`).expect(200)).body.notebook as NotebookDetail).title, 'Invented cached title');
    // a change that leaves updatedAt as it was (two writes within one clock tick look like this)
    const notebooks = h.rungbook.services.dataSource.getRepository(Notebook);
    const { updatedAt } = await notebooks.findOneByOrFail({ id });
    await notebooks.update({ id }, { title: 'Invented new title', updatedAt });
    h.rungbook.services.notebooks.forget(id);
    assert.equal(((await owner.client.get(`/api/notebooks/${id}`).expect(200)).body.notebook as NotebookDetail).title, 'Invented new title');
  });

  test('cell views read while a write commits are not kept after that write\'s forget', async () => {
    const owner = await createPerson(h);
    const id = ((await owner.client.post('/api/notebooks').send({ title: 'Invented race check', summary: '' }).expect(201)).body.notebook as NotebookDetail).id;
    await owner.client.post(`/api/notebooks/${id}/cells`).send({ label: 'note1', input: { kind: 'note', text: 'before' } }).expect(201);
    h.rungbook.services.notebooks.forget(id);
    // The next read of the cells sees them as they were; a write then commits and forgets, before the read's views are stored.
    const repository = h.rungbook.services.dataSource.manager.getRepository(Cell);
    const originalFind = repository.find.bind(repository);
    repository.find = (async (...args: Parameters<typeof repository.find>) => {
      repository.find = originalFind;
      const rows = await originalFind(...args);
      await repository.update({ notebookId: id }, { label: 'note2' });
      h.rungbook.services.notebooks.forget(id);
      return rows;
    }) as typeof repository.find;
    const during = (await owner.client.get(`/api/notebooks/${id}`).expect(200)).body.notebook as NotebookDetail;
    assert.deepEqual(during.cells.map((cell) => cell.label), ['note1'], 'the read that raced the write saw the cells before it');
    const after = (await owner.client.get(`/api/notebooks/${id}`).expect(200)).body.notebook as NotebookDetail;
    assert.deepEqual(after.cells.map((cell) => cell.label), ['note2'], 'the next read is not served the stale views');
  });
});
