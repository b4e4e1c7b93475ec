import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import type { NotebookDetail, RunAllReply, RunView } from '../../shared/notebook/api';
import { startHarness, type Harness } from './harness';
import { createPerson } from './people';

type Client = ReturnType<Harness['browser']>;

async function signedIn(h: Harness, n: number): Promise<Client> {
  return (await createPerson(h, { tag: `queue${n}` })).client;
}

const isOpen = (run: RunView) => run.status === 'queued' || run.status === 'running';

async function runOf(client: Client, runId: string): Promise<RunView> {
  return (await client.get(`/api/runs/${runId}`).expect(200)).body.run;
}

async function settle(client: Client, runId: string, timeoutMs = 120_000): Promise<RunView> {
  const deadline = Date.now() + timeoutMs;
  let run = await runOf(client, runId);
  while (isOpen(run) && Date.now() < deadline) {
    await new Promise((resolve) => setTimeout(resolve, 100));
    run = await runOf(client, runId);
  }
  return run;
}

// The cubic model's scans are the engine's slow case: 200 points × 2 quantities at 30 digits take
// about 4–9 s of engine time on the development machine (2 cores; the longer while other tests run),
// well under the cost limit, so a queue of them stays busy for the whole test.
const cubicSetup = { label: 'setup', input: { kind: 'setup', model: { preset: 'cubic', N: 3 }, d: '1', loops: 2, digits: 30 } };
const slowScan = (n: number) => ({
  label: `scan${n}`,
  input: { kind: 'scan', uses: 'setup', from: '0.55', to: `0.9${n}`, points: 200, quantities: ['nuInv', 'omega'] },
});
// One Γ-function value: milliseconds of engine time.
const smallSetup = { label: 'setup', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.5', loops: 2, digits: 30 } };
const smallBubble = { label: 'bubble', input: { kind: 'integral', uses: 'setup', form: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1 } };

async function notebookWith(client: Client, title: string, cells: object[]): Promise<NotebookDetail> {
  let notebook: NotebookDetail = (await client.post('/api/notebooks').send({ title }).expect(201)).body.notebook;
  for (const cell of cells) notebook = (await client.post(`/api/notebooks/${notebook.id}/cells`).send(cell).expect(201)).body.notebook;
  return notebook;
}

const cellId = (notebook: NotebookDetail, label: string) => notebook.cells.find((cell) => cell.label === label)!.id;

async function cancelOpen(client: Client, runs: RunView[]) {
  for (const run of runs) if (isOpen(await runOf(client, run.id))) await client.post(`/api/runs/${run.id}/cancel`).expect(200);
}

describe('fair job queue (one worker, three queued jobs per person)', () => {
  let h: Harness;
  let alice: Client;
  let bob: Client;
  let aliceBook: NotebookDetail;
  let aliceRuns: RunView[] = [];

  before(async () => {
    h = await startHarness({ JOB_THREADS: '1', JOB_QUEUE_PER_USER: '3', JOB_RUNNING_PER_USER: '1', JOB_TIME_LIMIT_MS: '60000' });
    alice = await signedIn(h, 1);
    bob = await signedIn(h, 2);
    aliceBook = await notebookWith(alice, 'Invented cubic scans', [cubicSetup, ...[1, 2, 3, 4, 5, 6].map(slowScan)]);
  });
  after(async () => {
    await cancelOpen(alice, aliceRuns).catch(() => undefined);
    await h.close();
  });

  test('run-all queues what the limit allows (one running + three waiting) and reports the other cells as waiting', async () => {
    const reply: RunAllReply = (await alice.post(`/api/notebooks/${aliceBook.id}/run-all`).expect(202)).body;
    aliceRuns = reply.runs;
    // 6 stale scans, 1 worker, 3 queued per person: scan1 takes the worker, scan2–4 queue, scan5–6 wait.
    assert.equal(reply.runs.length, 4);
    assert.deepEqual(reply.waiting, ['scan5', 'scan6']);
    const last = await runOf(alice, reply.runs[3].id);
    assert.equal(last.status, 'queued');
    assert.equal(last.queue!.ahead, 2, 'scan4 waits behind scan2 and scan3');
    assert.equal(last.queue!.waitLimitMs, 600_000, 'the default queue-wait limit (JOB_QUEUE_WAIT_LIMIT_MS)');
    assert.ok(Math.abs(Date.parse(last.queue!.since) - Date.now()) < 60_000);
    const notebook: NotebookDetail = (await alice.get(`/api/notebooks/${aliceBook.id}`).expect(200)).body.notebook;
    assert.equal(notebook.cells.find((cell) => cell.label === 'scan4')!.lastRun!.queue!.ahead, 2, 'the cell view carries the queue standing too');
    assert.equal(notebook.cells.find((cell) => cell.label === 'scan5')!.state, 'never-run');
  });

  test('a fourth waiting job is refused with 429 queue_full, from a cell and from /api/calc', async () => {
    const refused = await alice.post(`/api/notebooks/${aliceBook.id}/cells/${cellId(aliceBook, 'scan5')}/run`).expect(429);
    assert.equal(refused.body.error.code, 'queue_full');
    assert.match(refused.body.error.message, /3 jobs waiting.*limit is 3/);
    const calc = await alice.post('/api/calc').send({ job: { job: 'special', fn: 'gamma', x: '2.5', digits: 20 } }).expect(429);
    assert.equal(calc.body.error.code, 'queue_full');
  });

  test('another person\'s small job waits only for the running job, not for the full queue, and finishes first', async () => {
    const book = await notebookWith(bob, 'Invented bubble check', [smallSetup, smallBubble]);
    const queued: RunView = (await bob.post(`/api/notebooks/${book.id}/cells/${cellId(book, 'bubble')}/run`).expect(202)).body.run;
    assert.equal(queued.status, 'queued', 'alice\'s first scan has the one worker');
    assert.equal(queued.queue!.ahead, 0, 'next in line, ahead of alice\'s three waiting scans');
    const done = await settle(bob, queued.id);
    assert.equal(done.status, 'done', JSON.stringify(done.error));
    // 2/Γ(3/2) = 4/√π = 2.2567583341910251477… (DLMF 5.4.6: Γ(3/2) = √π/2): the job really ran.
    assert.equal((done.result as { coeffs: string[] }).coeffs[0].slice(0, 18), '2.2567583341910251');
    const scan2 = await runOf(alice, aliceRuns[1].id);
    assert.ok(
      scan2.status === 'queued' || Date.parse(scan2.startedAt!) >= Date.parse(done.startedAt!),
      `alice's second scan must not start before bob's job (scan2 ${scan2.status} at ${scan2.startedAt}, bob's at ${done.startedAt})`,
    );
    const scan1 = await runOf(alice, aliceRuns[0].id);
    assert.equal(scan1.status, 'done');
    assert.ok(Date.parse(done.startedAt!) - Date.parse(scan1.finishedAt!) < 2000, 'bob waited for the one running scan and no more');
  });

  test('cancelling a queued job takes it out of the queue and frees its place', async () => {
    const scan3 = await runOf(alice, aliceRuns[2].id);
    assert.equal(scan3.status, 'queued');
    const cancelled: RunView = (await alice.post(`/api/runs/${scan3.id}/cancel`).expect(200)).body.run;
    assert.equal(cancelled.status, 'cancelled');
    assert.equal(cancelled.error!.code, 'cancelled');
    assert.equal(cancelled.queue, null);
    const again: RunView = (await alice.post(`/api/notebooks/${aliceBook.id}/cells/${cellId(aliceBook, 'scan5')}/run`).expect(202)).body.run;
    aliceRuns.push(again);
    assert.equal(again.status, 'queued');
    // scan2 has the worker now; with scan3 gone, scan4 is next and the new scan5 behind it.
    const scan4 = await runOf(alice, aliceRuns[3].id);
    if (scan4.status === 'queued') assert.equal(scan4.queue!.ahead, 0, 'scan4 moved up one place');
    assert.equal(again.queue!.ahead, scan4.status === 'queued' ? 1 : 0);
  });
});

describe('queue-wait limit', () => {
  let h: Harness;
  let alice: Client;
  let bob: Client;
  const open: RunView[] = [];

  before(async () => {
    h = await startHarness({ JOB_THREADS: '1', JOB_QUEUE_WAIT_LIMIT_MS: '1500', JOB_TIME_LIMIT_MS: '60000' });
    alice = await signedIn(h, 3);
    bob = await signedIn(h, 4);
  });
  after(async () => {
    await cancelOpen(alice, open).catch(() => undefined);
    await h.close();
  });

  test('a job that waits longer than JOB_QUEUE_WAIT_LIMIT_MS fails with error code queue-wait', async () => {
    const slow = await notebookWith(alice, 'Invented slow scan', [cubicSetup, slowScan(1)]);
    open.push((await alice.post(`/api/notebooks/${slow.id}/cells/${cellId(slow, 'scan1')}/run`).expect(202)).body.run);
    const small = await notebookWith(bob, 'Invented small check', [smallSetup, smallBubble]);
    const queued: RunView = (await bob.post(`/api/notebooks/${small.id}/cells/${cellId(small, 'bubble')}/run`).expect(202)).body.run;
    assert.equal(queued.status, 'queued');
    assert.equal(queued.queue!.waitLimitMs, 1500);
    const given = await settle(bob, queued.id, 20_000);
    assert.equal(given.status, 'failed');
    assert.equal(given.error!.code, 'queue-wait');
    assert.match(given.error!.message, /queue/);
    assert.equal(given.startedAt, null, 'it never reached a worker');
    const notebook: NotebookDetail = (await bob.get(`/api/notebooks/${small.id}`).expect(200)).body.notebook;
    assert.equal(notebook.cells.find((cell) => cell.label === 'bubble')!.state, 'failed');
  });
});
