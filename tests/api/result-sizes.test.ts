import assert from 'node:assert/strict';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { after, before, describe, test } from 'node:test';
import { createDataSource, openDatabase } from '../../server/db/data-source';
import { Cell, JobRun } from '../../server/db/entities';
import { migrations } from '../../server/db/migrations';
import { newId } from '../../server/ids';
import { runSql } from '../../server/db/sql';
import type { NotebookDetail, RunView } from '../../shared/notebook/api';
import { cellInput } from '../../shared/notebook/cells';
import { jobForCell, type SetupInput } from '../../shared/notebook/jobs';
import { jobHash } from '../../server/services/runs';
import { signUpVerified, startHarness, type Harness } from './harness';
import { createPerson, settleRun as settle } from './people';

type Client = ReturnType<Harness['browser']>;

const SIX = ['nuInv', 'nu', 'eta', 'gamma', 'omega', 'Delta_phi2'];
const ALL_TWELVE = ['nuInv', 'omega', 'eta', 'Delta_phi', 'Delta_phi2', 'Delta_phi3', 'Delta_phi4', 'nu', 'gamma', 'alpha', 'beta', 'delta'];
const setupCell = { label: 'setup', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.5', loops: 2, digits: 30 } };
const bubble = (label: string) => ({ label, input: { kind: 'integral', uses: 'setup', form: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1 } });

describe('stored results: shared by cache hits, bounded per result and per notebook', () => {
  let h: Harness;
  let owner: Client;
  let userId: string;

  before(async () => {
    h = await startHarness();
    owner = h.browser();
    userId = (await signUpVerified(h, 1, owner)).user.id;
  });
  after(() => h.close());

  const notebookWith = async (title: string, cells: { label: string; input: unknown }[]): Promise<NotebookDetail> => {
    let notebook = (await owner.post('/api/notebooks').send({ title, summary: '' }).expect(201)).body.notebook as NotebookDetail;
    for (const cell of cells) notebook = (await owner.post(`/api/notebooks/${notebook.id}/cells`).send(cell).expect(201)).body.notebook;
    return notebook;
  };
  const cellId = (notebook: NotebookDetail, label: string) => notebook.cells.find((c) => c.label === label)!.id;

  test('cells answered from the cache point at the computed run: the result is stored once and shown everywhere', async () => {
    const notebook = await notebookWith('Invented shared bubbles', [setupCell, bubble('b1'), bubble('b2'), bubble('b3')]);
    const computed = await settle(owner, (await owner.post(`/api/notebooks/${notebook.id}/cells/${cellId(notebook, 'b1')}/run`).expect(202)).body.run);
    assert.equal(computed.status, 'done', JSON.stringify(computed.error));
    // 2/Γ(3/2) = 4/√π = 2.2567583341910251477… (DLMF 5.4.6: Γ(3/2) = √π/2)
    assert.equal((computed.result as { coeffs: string[] }).coeffs[0].slice(0, 20), '2.256758334191025147');
    const hits: RunView[] = [];
    for (const label of ['b2', 'b3']) hits.push((await owner.post(`/api/notebooks/${notebook.id}/cells/${cellId(notebook, label)}/run`).expect(202)).body.run);
    for (const hit of hits) assert.deepEqual([hit.cached, hit.status, hit.result], [true, 'done', computed.result]);

    const rows = await h.rungbook.services.dataSource.getRepository(JobRun).findBy({ cellId: cellId(notebook, 'b2') });
    assert.deepEqual(rows.map((r) => [r.resultJson, r.resultRunId]), [[null, computed.id]], 'a pointer, not a copy');
    const stored = await runSql<{ n: string | number; bytes: string | number }[]>(
      h.rungbook.services.dataSource,
      `SELECT COUNT(*) AS n, SUM(length("resultJson")) AS bytes FROM "job_runs" WHERE "cellId" IN (?, ?, ?)`,
      ['b1', 'b2', 'b3'].map((label) => cellId(notebook, label)),
    );
    assert.equal(Number(stored[0].n), 3);
    assert.equal(Number(stored[0].bytes), JSON.stringify(computed.result).length, 'one copy of the result in job_runs');

    // every reader follows the pointer: the run, the notebook, a saved version
    assert.deepEqual((await owner.get(`/api/runs/${hits[0].id}`).expect(200)).body.run.result, computed.result);
    const opened = (await owner.get(`/api/notebooks/${notebook.id}`).expect(200)).body.notebook as NotebookDetail;
    for (const label of ['b1', 'b2', 'b3']) assert.deepEqual(opened.cells.find((c) => c.label === label)!.lastRun?.result, computed.result, label);
    const version = (await owner.post(`/api/notebooks/${notebook.id}/versions`).send({ message: 'three bubbles' }).expect(201)).body.version;
    const saved = (await owner.get(`/api/notebooks/${notebook.id}/versions/${version.id}`).expect(200)).body.version as { cells: { label: string; output: unknown }[] };
    for (const label of ['b1', 'b2', 'b3']) assert.deepEqual(saved.cells.find((c) => c.label === label)!.output, computed.result, label);
  });

  test('repeating a cached /api/calc adds no rows', async () => {
    const job = { job: 'special', fn: 'gamma', x: '2.5', digits: 25 };
    const first = (await owner.post('/api/calc').send({ job }).expect(200)).body.run as RunView;
    assert.equal(first.status, 'done');
    const count = () => h.rungbook.services.dataSource.getRepository(JobRun).countBy({ requestedBy: userId });
    const hit = (await owner.post('/api/calc').send({ job }).expect(200)).body.run as RunView;
    assert.deepEqual([hit.cached, hit.result], [true, first.result]);
    const rows = await count();
    for (let i = 0; i < 5; i += 1) assert.equal((await owner.post('/api/calc').send({ job }).expect(200)).body.run.id, hit.id);
    assert.equal(await count(), rows);
  });

  test('a scan whose result would be over the size limit is refused up front, naming points, quantities and digits', async () => {
    // measured with `npm run calc`: 1000 points × 12 quantities × 200 digits is 5.2 MB of JSON, over the 4 MB limit
    const job = { job: 'scan', model: { preset: 'on', N: 1 }, d: '3', s: { from: '1.55', to: '1.95', points: 1000 }, quantities: ALL_TWELVE, loops: 2, digits: 200 };
    const reply = await owner.post('/api/calc').send({ job }).expect(422);
    assert.equal(reply.body.error.code, 'job_too_large');
    assert.match(reply.body.error.message, /1000 points × 12 quantities × 200 digits.*reduce points, quantities or digits/);
  });

  test('a cell run is refused when the notebook\'s results would exceed 16 MB together; deleting a large cell makes room', async () => {
    const setup = { label: 'setup', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', loops: 2, digits: 200 } };
    const scan = (label: string) => ({ label, input: { kind: 'scan', uses: 'setup', from: '1.55', to: '1.95', points: 1000, quantities: SIX } });
    const notebook = await notebookWith('Invented big scans', [setup, ...['s1', 's2', 's3', 's4', 's5'].map(scan)]);
    // four finished results of 3.5 MB each, written directly (the engine is not what is tested here)
    const { dataSource, notebooks } = h.rungbook.services;
    const filler = JSON.stringify({ points: 'x'.repeat(3_500_000) });
    for (const label of ['s1', 's2', 's3', 's4']) {
      const id = newId();
      const now = new Date();
      await dataSource.getRepository(JobRun).insert({ id, inputHash: newId(), engineVersion: 'test', jobJson: '{}', status: 'done', progress: 1, cached: false, cellId: cellId(notebook, label), requestedBy: userId, resultJson: filler, durationMs: 1, startedAt: now, finishedAt: now });
      await dataSource.getRepository(Cell).update({ id: cellId(notebook, label) }, { lastRunId: id });
    }
    notebooks.forget(notebook.id);
    // 4 × 3.5 MB + the new scan (measured 2.8 MB by `npm run calc`) is over 16 MB
    const refused = await owner.post(`/api/notebooks/${notebook.id}/cells/${cellId(notebook, 's5')}/run`).expect(422);
    assert.equal(refused.body.error.code, 'job_too_large');
    const total = Number(/would total ([\d.]+) MB \(limit 16 MB\); shrink or delete scan cells/.exec(refused.body.error.message)?.[1]);
    assert.ok(total > 16 && total >= (4 * filler.length + 2_826_754) / 1e6, `total ${total} MB`);
    await owner.delete(`/api/notebooks/${notebook.id}/cells/${cellId(notebook, 's1')}`).expect(200);
    const accepted = (await owner.post(`/api/notebooks/${notebook.id}/cells/${cellId(notebook, 's5')}/run`).expect(202)).body.run as RunView;
    // a queued scan counts by its estimate: a second copy of it no longer fits next to the three large results
    const again = await owner.post(`/api/notebooks/${notebook.id}/cells`).send(scan('s6')).expect(201);
    const s6 = (again.body.notebook as NotebookDetail).cells.find((c) => c.label === 's6')!.id;
    assert.equal((await owner.post(`/api/notebooks/${notebook.id}/cells/${s6}/run`).expect(422)).body.error.code, 'job_too_large');
    await owner.post(`/api/runs/${accepted.id}/cancel`).expect(200);
  });

  test('a stored result over the per-result limit (kept from before the limit) is not served to a cell: 422', async () => {
    const notebook = await notebookWith('Invented oversized old result', [setupCell, bubble('big')]);
    const job = jobForCell(bubble('big').input as never, new Map([['setup', setupCell.input as SetupInput]]))!;
    const now = new Date();
    // 4.5 MB, over the 4 MB per result (RESULT_LIMITS.maxResultBytes)
    await h.rungbook.services.dataSource.getRepository(JobRun).insert({ id: newId(), inputHash: jobHash(job), engineVersion: 'test', jobJson: JSON.stringify(job), status: 'done', progress: 1, cached: false, cellId: null, requestedBy: userId, resultJson: JSON.stringify({ coeffs: ['x'.repeat(4_500_000)] }), durationMs: 1, startedAt: now, finishedAt: now });
    const refused = await owner.post(`/api/notebooks/${notebook.id}/cells/${cellId(notebook, 'big')}/run`).expect(422);
    assert.equal(refused.body.error.code, 'job_too_large');
    assert.match(refused.body.error.message, /^Cell "big": its result takes 4\.5 MB, over the limit of 4(\.0)? MB per result/);
  });

  test('a notebook with a run in flight is not cached as settled, even when the run shows as a broken reference', async () => {
    const notebook = await notebookWith('Invented orphaned run', [setupCell, { label: 'fp', input: { kind: 'fixedpoints', uses: 'setup' } }]);
    const { dataSource } = h.rungbook.services;
    const runId = newId();
    const now = new Date();
    // a run still going, written directly (the engine is not what is tested here)
    await dataSource.getRepository(JobRun).insert({ id: runId, inputHash: newId(), engineVersion: 'test', jobJson: '{}', status: 'running', progress: 0.5, cached: false, cellId: cellId(notebook, 'fp'), requestedBy: userId, durationMs: null, startedAt: now, finishedAt: null });
    await dataSource.getRepository(Cell).update({ id: cellId(notebook, 'fp') }, { lastRunId: runId });
    h.rungbook.services.notebooks.forget(notebook.id);
    const withoutSetup = (await owner.delete(`/api/notebooks/${notebook.id}/cells/${cellId(notebook, 'setup')}`).expect(200)).body.notebook as NotebookDetail;
    const orphan = withoutSetup.cells.find((c) => c.label === 'fp')!;
    assert.equal(orphan.lastRun?.status, 'running');
    assert.notEqual(orphan.state, 'running', 'its state comes from the missing reference');
    // the run finishes (written directly, so no cache is told): the next read must see it
    await dataSource.getRepository(JobRun).update({ id: runId }, { status: 'done', progress: 1, resultJson: '{"fixedPoints":[]}', finishedAt: new Date() });
    const reread = (await owner.get(`/api/notebooks/${notebook.id}`).expect(200)).body.notebook as NotebookDetail;
    assert.equal(reread.cells.find((c) => c.label === 'fp')!.lastRun?.status, 'done');
  });

  test('run-all reads and parses the notebook once, not once per cell', async () => {
    const cells = [setupCell, ...Array.from({ length: 20 }, (_, i) => ({ label: `fp${i}`, input: { kind: 'fixedpoints', uses: 'setup' } }))];
    const notebook = await notebookWith('Invented many dependents', cells);
    const original = cellInput.parse;
    let parses = 0;
    (cellInput as { parse: typeof original }).parse = ((...args: Parameters<typeof original>) => {
      parses += 1;
      return original.apply(cellInput, args);
    }) as typeof original;
    let reply;
    try {
      h.rungbook.services.notebooks.forget(notebook.id);
      reply = await owner.post(`/api/notebooks/${notebook.id}/run-all`).expect(202);
    } finally {
      (cellInput as { parse: typeof original }).parse = original;
    }
    assert.equal(reply.body.runs.length + reply.body.waiting.length, 20, 'every dependent was considered');
    assert.ok(parses <= cells.length, `${parses} parses of ${cells.length} cells`);
    for (const run of reply.body.runs as RunView[]) if (run.status === 'queued' || run.status === 'running') await owner.post(`/api/runs/${run.id}/cancel`).expect(200);
  });
});

describe('document pool: a full queue answers 429', () => {
  let h: Harness;

  before(async () => {
    // no waiting room: a document that finds no free thread is refused at once
    h = await startHarness({ DOCUMENT_QUEUE_LIMIT: '0' });
  });
  after(() => h.close());

  const formula = '$\\frac{\\Gamma(a)}{\\Gamma(b)} + x_{1}^{2}$ ';
  const text = formula.repeat(Math.floor(20_000 / formula.length));
  const formulaNotebook = async (client: Client) => {
    const notebook = (await client.post('/api/notebooks').send({ title: 'Invented formula-heavy notebook', summary: '' }).expect(201)).body.notebook as NotebookDetail;
    for (let i = 0; i < 40; i += 1) await client.post(`/api/notebooks/${notebook.id}/cells`).send({ label: `n${i}`, input: { kind: 'note', text } }).expect(201);
    return notebook;
  };

  test('LaTeX exports beyond the pool\'s threads and queue get queue_full (429); the server still answers', async () => {
    // three people, two exports each: within each person's limit of two, beyond the pool's two threads
    const people = await Promise.all([1, 2, 3].map(() => createPerson(h)));
    const notebooks = await Promise.all(people.map((p) => formulaNotebook(p.client)));
    const replies = await Promise.all(people.flatMap((p, i) => [0, 1].map(() => p.client.get(`/api/notebooks/${notebooks[i].id}/export.tex`))));
    const statuses = replies.map((r) => r.status);
    assert.ok(statuses.every((s) => s === 200 || s === 429), statuses.join(','));
    const busy = replies.filter((r) => r.status === 429);
    assert.ok(busy.length >= 1, `some refused: ${statuses.join(',')}`);
    assert.ok(statuses.includes(200), `some served: ${statuses.join(',')}`);
    assert.deepEqual(busy[0].body.error, { code: 'queue_full', message: 'The server is busy preparing other exports; try again in a moment.' });
    await h.raw.get('/api/health').expect(200);
    await people[0].client.get(`/api/notebooks/${notebooks[0].id}/export.tex`).expect(200);
  });

  test('one person gets at most two exports in preparation at once; the rest 429 with the reason', async () => {
    const person = await createPerson(h);
    const notebook = await formulaNotebook(person.client);
    const replies = await Promise.all(Array.from({ length: 4 }, () => person.client.get(`/api/notebooks/${notebook.id}/export.tex`)));
    const mine = replies.filter((r) => r.status === 429 && /You already have 2 exports or comparisons in preparation/.test(r.body.error.message));
    assert.ok(mine.length >= 1, replies.map((r) => r.status).join(','));
    assert.equal(mine[0].body.error.code, 'queue_full');
  });
});

describe('the migration to shared results', () => {
  test('copies held by earlier cache hits become pointers to the computing run; a copy without one is kept', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-migrate-'));
    const file = path.join(dir, 'old.sqlite');
    try {
      const old = createDataSource(file);
      old.setOptions({ migrations: migrations.slice(0, 3) });
      await old.initialize();
      await old.runMigrations();
      const insert = (id: string, hash: string, cached: number, createdAt: string) =>
        old.query(
          `INSERT INTO job_runs (id, inputHash, engineVersion, jobJson, status, progress, cached, resultJson, createdAt) VALUES (?, ?, 'test', '{}', 'done', 1, ?, '{"value":"1.5"}', ?)`,
          [id, hash, cached, createdAt],
        );
      await insert('computed-old', 'h1', 0, '2026-01-01 00:00:00');
      await insert('computed-new', 'h1', 0, '2026-01-02 00:00:00');
      await insert('hit', 'h1', 1, '2026-01-03 00:00:00');
      await insert('orphan-hit', 'h2', 1, '2026-01-03 00:00:00');
      await old.destroy();
      const current = await openDatabase(file);
      try {
        const runs = new Map((await current.getRepository(JobRun).find()).map((run) => [run.id, run]));
        assert.deepEqual([runs.get('hit')!.resultJson, runs.get('hit')!.resultRunId], [null, 'computed-new'], 'points at the newest computing run');
        assert.deepEqual([runs.get('orphan-hit')!.resultJson, runs.get('orphan-hit')!.resultRunId], ['{"value":"1.5"}', null], 'no computing run left: the copy stays');
        assert.equal(runs.get('computed-old')!.resultJson, '{"value":"1.5"}');
      } finally {
        await current.destroy();
      }
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
