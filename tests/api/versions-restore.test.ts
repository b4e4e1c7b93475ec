import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import type { CellView, NotebookDetail, RunView, VersionComparison } from '../../shared/notebook/api';
import { JobRun, NotebookVersion } from '../../server/db/entities';
import { newId } from '../../server/ids';
import { jobHash } from '../../server/services/runs';
import { MAX_VERSIONS_PER_NOTEBOOK } from '../../server/services/versions';
// The documented default of VERSION_SAVE_LIMIT_PER_USER (README configuration table).
const VERSION_SAVES_PER_USER_PER_HOUR = 60;
import { RESULT_LIMITS } from '../../shared/jobs/contract';
import { jobForCell, type SetupInput } from '../../shared/notebook/jobs';
import { signUpVerified, startHarness, type Harness } from './harness';
import { createPerson, settleRun as settle } from './people';

type Client = ReturnType<Harness['browser']>;

const setupCell = { label: 'setup', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.5', loops: 2, digits: 30 } };
const bubbleInput = { kind: 'integral', uses: 'setup', form: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1 };

describe('restoring a version keeps the results whose inputs are unchanged', () => {
  let h: Harness;
  let owner: Client;
  let notebook: NotebookDetail;
  const cell = (label: string): CellView => notebook.cells.find((c) => c.label === label)!;
  const engineRuns = () => h.rungbook.services.dataSource.getRepository(JobRun).countBy({ cached: false });

  before(async () => {
    h = await startHarness();
    owner = h.browser();
    await signUpVerified(h, 1, owner);
    notebook = (await owner.post('/api/notebooks').send({ title: 'Invented restore check', summary: '' }).expect(201)).body.notebook;
    await owner.post(`/api/notebooks/${notebook.id}/cells`).send(setupCell).expect(201);
    await owner.post(`/api/notebooks/${notebook.id}/cells`).send({ label: 'note', input: { kind: 'note', text: 'An invented note.' } }).expect(201);
    notebook = (await owner.post(`/api/notebooks/${notebook.id}/cells`).send({ label: 'bubble', input: bubbleInput }).expect(201)).body.notebook;
  });
  after(() => h.close());

  test('run, save, change, restore: the restored cell is up to date with the old result and no engine run happens', async () => {
    const started = (await owner.post(`/api/notebooks/${notebook.id}/cells/${cell('bubble').id}/run`).expect(202)).body.run as RunView;
    const done = await settle(owner, started);
    assert.equal(done.status, 'done');
    const saved = (await owner.post(`/api/notebooks/${notebook.id}/versions`).send({ message: 'order 1, run' }).expect(201)).body.version;

    notebook = (await owner.patch(`/api/notebooks/${notebook.id}/cells/${cell('bubble').id}`).send({ input: { ...bubbleInput, order: 2 }, revision: cell('bubble').revision }).expect(200)).body.notebook;
    assert.equal(cell('bubble').state, 'out-of-date', 'the edit makes the old result stale');
    const runsBefore = await engineRuns();

    notebook = (await owner.post(`/api/notebooks/${notebook.id}/versions/${saved.id}/restore`).expect(200)).body.notebook;
    const restored = cell('bubble');
    assert.deepEqual(restored.input, bubbleInput);
    assert.equal(restored.state, 'up-to-date');
    assert.equal(restored.lastRun?.status, 'done');
    assert.deepEqual(restored.lastRun?.result, done.result, 'the result the cell had when the version was saved');
    assert.equal(restored.lastRun?.cached, true, 'served from the result cache');
    assert.equal(cell('setup').state, 'text');
    assert.equal(cell('note').state, 'text');
    assert.equal(await engineRuns(), runsBefore, 'no new engine run');
    // and a reload agrees (the state is stored, not only in the reply)
    const reloaded = (await owner.get(`/api/notebooks/${notebook.id}`).expect(200)).body.notebook as NotebookDetail;
    assert.equal(reloaded.cells.find((c) => c.label === 'bubble')?.state, 'up-to-date');
  });

  test('a restored cell whose job never ran stays never-run', async () => {
    notebook = (await owner.patch(`/api/notebooks/${notebook.id}/cells/${cell('bubble').id}`).send({ input: { ...bubbleInput, order: 3 }, revision: cell('bubble').revision }).expect(200)).body.notebook;
    const saved = (await owner.post(`/api/notebooks/${notebook.id}/versions`).send({ message: 'order 3, not run' }).expect(201)).body.version;
    notebook = (await owner.post(`/api/notebooks/${notebook.id}/versions/${saved.id}/restore`).expect(200)).body.notebook;
    assert.equal(cell('bubble').state, 'never-run');
  });

  test('a small comparison shows line diffs, not a summary', async () => {
    const versions = (await owner.get(`/api/notebooks/${notebook.id}/versions`).expect(200)).body.versions as { id: string; message: string }[];
    const run = versions.find((v) => v.message === 'order 1, run')!;
    const notRun = versions.find((v) => v.message === 'order 3, not run')!;
    const comparison = (await owner.get(`/api/notebooks/${notebook.id}/versions/compare?from=${run.id}&to=${notRun.id}`).expect(200)).body.comparison as VersionComparison;
    const bubble = comparison.cells.find((c) => c.label === 'bubble')!;
    assert.equal(bubble.change, 'changed');
    assert.equal(bubble.inputSummarised, false);
    assert.ok(bubble.input.some((p) => p.removed && /"order": 1/.test(p.value)));
    assert.ok(bubble.input.some((p) => p.added && /"order": 3/.test(p.value)));
    assert.deepEqual(bubble.inputValues.listed, [{ path: 'order', before: '1', after: '3' }]);
    // both snapshots hold the cell's last result (the edit to order 3 was never run)
    assert.equal(bubble.outputValues.changed, 0);
    assert.equal(bubble.outputValues.sizeBefore, bubble.outputValues.sizeAfter);
    assert.ok(!bubble.output.some((p) => p.added || p.removed));
    assert.equal(comparison.cells.find((c) => c.label === 'setup')?.change, 'unchanged');
  });
});

const SIX = ['nuInv', 'nu', 'eta', 'gamma', 'omega', 'Delta_phi2'];
const scanInput = { kind: 'scan', uses: 'setup', from: '1.55', to: '1.95', points: 1000, quantities: SIX };

describe('restore keeps the notebook within its result budget; versions are bounded', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness();
  });
  after(() => h.close());

  const newNotebook = async (client: Client, title: string, cells: { label: string; input: unknown }[]) => {
    let notebook = (await client.post('/api/notebooks').send({ title, summary: '' }).expect(201)).body.notebook as NotebookDetail;
    for (const cell of cells) notebook = (await client.post(`/api/notebooks/${notebook.id}/cells`).send(cell).expect(201)).body.notebook;
    return notebook;
  };

  test('restoring many cells that share one large result brings back only as many as the notebook budget holds', async () => {
    const owner = await createPerson(h);
    const labels = ['s1', 's2', 's3', 's4', 's5', 's6'];
    const notebook = await newNotebook(owner.client, 'Invented six equal scans', [setupCell, ...labels.map((label) => ({ label, input: scanInput }))]);
    // one computed result of 3.5 MB for the scans' job, written directly (the engine is not what is tested here)
    const job = jobForCell(scanInput as never, new Map([['setup', setupCell.input as SetupInput]]))!;
    const resultJson = JSON.stringify({ points: 'x'.repeat(3_500_000) });
    const now = new Date();
    await h.rungbook.services.dataSource.getRepository(JobRun).insert({ id: newId(), inputHash: jobHash(job), engineVersion: 'test', jobJson: JSON.stringify(job), status: 'done', progress: 1, cached: false, cellId: null, requestedBy: owner.id, resultJson, durationMs: 1, startedAt: now, finishedAt: now });
    const saved = (await owner.client.post(`/api/notebooks/${notebook.id}/versions`).send({ message: 'six scans' }).expect(201)).body.version;

    const restored = (await owner.client.post(`/api/notebooks/${notebook.id}/versions/${saved.id}/restore`).expect(200)).body.notebook as NotebookDetail;
    // 16 MB / 3.5 MB: four results fit (14 MB), a fifth would make 17.5 MB
    const fitting = Math.floor(RESULT_LIMITS.maxNotebookResultBytes / resultJson.length);
    assert.equal(fitting, 4);
    const states = labels.map((label) => restored.cells.find((c) => c.label === label)!.state);
    assert.deepEqual(states, [...Array(fitting).fill('up-to-date'), ...Array(labels.length - fitting).fill('never-run')]);
    const reply = await owner.client.get(`/api/notebooks/${notebook.id}`).expect(200);
    assert.ok(reply.text.length <= RESULT_LIMITS.maxNotebookResultBytes + 100_000, `notebook reply of ${reply.text.length} characters`);
    const [newest] = (await owner.client.get(`/api/notebooks/${notebook.id}/versions`).expect(200)).body.versions as { message: string; automatic: boolean }[];
    assert.equal(newest.automatic, true);
    assert.equal(newest.message, `Restored version ${saved.number}: six scans (2 cells left to run again, over the notebook's 16 MB of results: s5, s6)`);
  });

  test('a version reads back as saved: summary fields, title, summary and cells', async () => {
    const owner = await createPerson(h);
    const notebook = await newNotebook(owner.client, 'Invented "quoted" title', [setupCell, { label: 'note', input: { kind: 'note', text: 'Ünïcode \\ and "quotes"' } }]);
    const saved = (await owner.client.post(`/api/notebooks/${notebook.id}/versions`).send({ message: 'as it is' }).expect(201)).body.version;
    const reply = await owner.client.get(`/api/notebooks/${notebook.id}/versions/${saved.id}`).expect(200).expect('Content-Type', /application\/json/);
    assert.deepEqual(reply.body.version, {
      ...saved,
      title: 'Invented "quoted" title',
      summary: '',
      cells: notebook.cells.map((c) => ({ label: c.label, kind: c.kind, input: c.input, output: null })),
    });
  });

  test(`a notebook keeps at most ${MAX_VERSIONS_PER_NOTEBOOK} versions: the oldest automatic ones make room; saves by hand beyond that are refused`, async () => {
    const owner = await createPerson(h);
    const notebook = await newNotebook(owner.client, 'Invented many versions', [setupCell, { label: 'note', input: { kind: 'note', text: 'x' } }]);
    const repo = h.rungbook.services.dataSource.getRepository(NotebookVersion);
    // written directly: numbers 1..200, the first three automatic
    for (let number = 1; number <= MAX_VERSIONS_PER_NOTEBOOK; number += 1) {
      await repo.insert({ id: newId(), notebookId: notebook.id, number, message: `v${number}`, automatic: number <= 3, authorId: owner.id, authorName: 'Invented', snapshotJson: '{"title":"t","summary":"","cells":[]}' });
    }
    await owner.client.post(`/api/notebooks/${notebook.id}/versions`).send({ message: 'by hand' }).expect(201);
    const numbers = async () => (await repo.find({ select: { number: true }, where: { notebookId: notebook.id }, order: { number: 'ASC' } })).map((v) => v.number);
    let kept = await numbers();
    assert.equal(kept.length, MAX_VERSIONS_PER_NOTEBOOK);
    assert.deepEqual(kept.slice(0, 2), [2, 3], 'the oldest automatic version (1) made room');
    assert.equal(kept.at(-1), MAX_VERSIONS_PER_NOTEBOOK + 1);

    // only versions saved by hand left: a save by hand is refused, nothing is deleted
    await repo.delete({ notebookId: notebook.id, automatic: true });
    await repo.insert({ id: newId(), notebookId: notebook.id, number: 500, message: 'filler', automatic: false, authorId: owner.id, authorName: 'Invented', snapshotJson: '{"title":"t","summary":"","cells":[]}' });
    await repo.insert({ id: newId(), notebookId: notebook.id, number: 501, message: 'filler', automatic: false, authorId: owner.id, authorName: 'Invented', snapshotJson: '{"title":"t","summary":"","cells":[]}' });
    kept = await numbers();
    assert.equal(kept.length, MAX_VERSIONS_PER_NOTEBOOK);
    const refused = await owner.client.post(`/api/notebooks/${notebook.id}/versions`).send({ message: 'one more' }).expect(409);
    assert.equal(refused.body.error.code, 'conflict');
    assert.match(refused.body.error.message, /at most 200 versions/);
    assert.deepEqual(await numbers(), kept);
    // an automatic version (before deleting a cell) is still written, and is the first to go
    await owner.client.delete(`/api/notebooks/${notebook.id}/cells/${notebook.cells.find((c) => c.label === 'note')!.id}`).expect(200);
    assert.equal((await numbers()).length, MAX_VERSIONS_PER_NOTEBOOK + 1);
    await owner.client.delete(`/api/notebooks/${notebook.id}/cells/${notebook.cells.find((c) => c.label === 'setup')!.id}`).expect(200);
    assert.equal((await numbers()).length, MAX_VERSIONS_PER_NOTEBOOK + 1, 'the earlier automatic version made room');
  });

  test(`one person saves at most ${VERSION_SAVES_PER_USER_PER_HOUR} versions per hour; someone else is not held back`, async () => {
    const owner = await createPerson(h);
    const other = await createPerson(h);
    const mine = await newNotebook(owner.client, 'Invented busy saver', []);
    const theirs = await newNotebook(other.client, 'Invented calm saver', []);
    for (let i = 0; i < VERSION_SAVES_PER_USER_PER_HOUR; i += 1) await owner.client.post(`/api/notebooks/${mine.id}/versions`).send({ message: `save ${i}` }).expect(201);
    const limited = await owner.client.post(`/api/notebooks/${mine.id}/versions`).send({ message: 'one too many' }).expect(429);
    assert.equal(limited.body.error.code, 'rate_limited');
    await other.client.post(`/api/notebooks/${theirs.id}/versions`).send({ message: 'mine' }).expect(201);
  });
});

describe('the structural comparison is bounded', () => {
  test('a walk over more values than the cap stops, says it is incomplete, and lists only the first changes', async () => {
    const { COMPARISON_LIMITS, valueDifferences } = await import('../../server/services/versions');
    const size = COMPARISON_LIMITS.maxNodesPerPart * 2;
    const before = Array.from({ length: size }, (_, i) => i);
    const after = before.map((v) => v + 1);
    const budget = { nodes: COMPARISON_LIMITS.maxNodesPerComparison };
    const result = await valueDifferences(before, after, budget);
    assert.equal(result.complete, false);
    // the array node itself takes one visit, every element one more
    assert.equal(result.changed, COMPARISON_LIMITS.maxNodesPerPart - 1);
    assert.equal(result.listed.length, COMPARISON_LIMITS.maxListedChanges);
    assert.equal(result.more, result.changed - COMPARISON_LIMITS.maxListedChanges);
    assert.deepEqual(result.listed[0], { path: '[0]', before: '0', after: '1' });
    assert.equal(budget.nodes, COMPARISON_LIMITS.maxNodesPerComparison - COMPARISON_LIMITS.maxNodesPerPart);
    assert.equal(result.sizeBefore, JSON.stringify(before).length);
  });

  test('keys named like built-ins are compared as plain keys', async () => {
    const { valueDifferences } = await import('../../server/services/versions');
    const before = JSON.parse('{"__proto__": {"a": 1}, "constructor": "x"}');
    const after = JSON.parse('{"__proto__": {"a": 2}, "constructor": "x"}');
    const result = await valueDifferences(before, after, { nodes: 100 });
    assert.deepEqual(result.listed, [{ path: '__proto__.a', before: '1', after: '2' }]);
  });
});

describe('restoring a version keeps the cells it shares with the notebook: their ids, threads and revisions', () => {
  let h: Harness;
  let owner: Client;
  let notebook: NotebookDetail;
  const cell = (label: string): CellView => notebook.cells.find((c) => c.label === label)!;
  const noteInput = { kind: 'note', text: 'An invented note.' };

  before(async () => {
    h = await startHarness();
    owner = (await createPerson(h)).client;
    notebook = (await owner.post('/api/notebooks').send({ title: 'Invented restore threads', summary: '' }).expect(201)).body.notebook;
    await owner.post(`/api/notebooks/${notebook.id}/cells`).send(setupCell).expect(201);
    await owner.post(`/api/notebooks/${notebook.id}/cells`).send({ label: 'note', input: noteInput }).expect(201);
    notebook = (await owner.post(`/api/notebooks/${notebook.id}/cells`).send({ label: 'bubble', input: bubbleInput }).expect(201)).body.notebook;
  });
  after(() => h.close());

  test('threads stay on their cells; only a cell the restore changes reads "changed since"; an open editor of it gets 409, not 404', async () => {
    const saved = (await owner.post(`/api/notebooks/${notebook.id}/versions`).send({ message: 'order 1' }).expect(201)).body.version;
    const before = { setup: cell('setup'), note: cell('note'), bubble: cell('bubble') };
    for (const label of ['setup', 'bubble'] as const) {
      await owner.post(`/api/notebooks/${notebook.id}/comments`).send({ body: `A remark on ${label}.`, cellId: before[label].id }).expect(201);
    }
    // after the save: bubble changes, and a cell is added that the version does not have
    notebook = (await owner.patch(`/api/notebooks/${notebook.id}/cells/${before.bubble.id}`).send({ input: { ...bubbleInput, order: 2 }, revision: before.bubble.revision }).expect(200)).body.notebook;
    const editedBubble = cell('bubble');
    notebook = (await owner.post(`/api/notebooks/${notebook.id}/cells`).send({ label: 'later', input: { kind: 'note', text: 'Written after the save.' } }).expect(201)).body.notebook;
    await owner.delete(`/api/notebooks/${notebook.id}/cells/${before.note.id}`).expect(200);

    notebook = (await owner.post(`/api/notebooks/${notebook.id}/versions/${saved.id}/restore`).expect(200)).body.notebook;
    assert.deepEqual(notebook.cells.map((c) => c.label), ['setup', 'note', 'bubble'], 'the version\'s cells in its order');
    assert.equal(cell('setup').id, before.setup.id, 'an unchanged cell keeps its id');
    assert.equal(cell('setup').revision, before.setup.revision, 'and its revision');
    assert.equal(cell('bubble').id, before.bubble.id, 'a changed cell keeps its id too');
    assert.equal(cell('bubble').revision, editedBubble.revision + 1, 'one revision on for the restored input');
    assert.deepEqual(cell('bubble').input, bubbleInput);
    assert.notEqual(cell('note').id, before.note.id, 'a cell deleted since comes back as a new cell');
    assert.equal(cell('note').revision, 1);

    const comments = (await owner.get(`/api/notebooks/${notebook.id}/comments`).expect(200)).body.comments as { cellId: string; cellChangedSince: boolean }[];
    const ids = new Set(notebook.cells.map((c) => c.id));
    assert.equal(comments.length, 2);
    for (const comment of comments) assert.ok(ids.has(comment.cellId), 'every thread still names a cell of the notebook');
    const changedSince = Object.fromEntries(comments.map((c) => [c.cellId === before.setup.id ? 'setup' : 'bubble', c.cellChangedSince]));
    assert.deepEqual(changedSince, { setup: false, bubble: true });

    // an editor who still has the edited bubble open saves on its old revision: a conflict, the cell still exists
    const stale = await owner.patch(`/api/notebooks/${notebook.id}/cells/${before.bubble.id}`).send({ input: { ...bubbleInput, order: 3 }, revision: editedBubble.revision }).expect(409);
    assert.equal(stale.body.error.code, 'conflict');
    // one on an unchanged cell is not in anyone's way
    await owner.patch(`/api/notebooks/${notebook.id}/cells/${before.setup.id}`).send({ input: { ...setupCell.input, digits: 25 }, revision: before.setup.revision }).expect(200);
  });
});
