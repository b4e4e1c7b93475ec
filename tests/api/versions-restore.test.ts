import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import type { CellView, NotebookDetail, RunView, VersionComparison } from '../../shared/notebook/api';
import { JobRun } from '../../server/db/entities';
import { signUpVerified, startHarness, type Harness } from './harness';

type Client = ReturnType<Harness['browser']>;

async function settle(client: Client, run: RunView): Promise<RunView> {
  let current = run;
  for (let i = 0; i < 400 && (current.status === 'queued' || current.status === 'running'); i += 1) {
    await new Promise((resolve) => setTimeout(resolve, 50));
    current = (await client.get(`/api/runs/${run.id}`).expect(200)).body.run;
  }
  return current;
}

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
