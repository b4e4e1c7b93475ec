import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import type { NotebookDetail, RunView } from '../../shared/notebook/api';
import { signUpVerified, startHarness, type Harness } from './harness';
import { settleRun as settle } from './people';

type Client = ReturnType<Harness['browser']>;

const setupCell = { label: 'setup', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.5', loops: 2, digits: 30 } };
const bubbleCell = { label: 'bubble', input: { kind: 'integral', uses: 'setup', form: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1 } };

describe('notebooks, cells, runs, versions and exports', () => {
  let h: Harness;
  let owner: Client;
  let outsider: Client;
  let notebook: NotebookDetail;

  before(async () => {
    h = await startHarness();
    owner = h.browser();
    outsider = h.browser();
    await signUpVerified(h, 1, owner);
    await signUpVerified(h, 2, outsider);
  });
  after(() => h.close());

  test('create a notebook; it is listed for its owner only', async () => {
    notebook = (await owner.post('/api/notebooks').send({ title: 'Invented O(1) check', summary: 'invented scenario' }).expect(201)).body.notebook;
    assert.equal(notebook.cells.length, 0);
    const listed = (await owner.get('/api/notebooks?q=O(1)').expect(200)).body.notebooks;
    assert.equal(listed.length, 1);
    const opened = (await owner.get(`/api/notebooks/${notebook.id}`).expect(200)).body.notebook;
    assert.equal(opened.updatedAt, listed[0].updatedAt, 'list and detail read the same time stamp');
    assert.ok(Math.abs(Date.parse(opened.updatedAt) - Date.now()) < 60_000, 'time stamps are UTC, not shifted by a zone');
    assert.equal((await owner.get('/api/notebooks?q=nothing-like-this').expect(200)).body.notebooks.length, 0);
    assert.deepEqual((await outsider.get('/api/notebooks').expect(200)).body.notebooks, []);
    await outsider.get(`/api/notebooks/${notebook.id}`).expect(404);
    await h.raw.get('/api/notebooks').expect(401);
  });

  test('invalid cell input is refused at the edge with field messages', async () => {
    const reply = await owner.post(`/api/notebooks/${notebook.id}/cells`).send({ label: 'Bad Label', input: { kind: 'setup', model: { preset: 'on', N: 1 }, loops: 4, digits: 2 } }).expect(400);
    assert.ok(reply.body.error.fields.label);
    assert.ok(reply.body.error.fields['input.loops'] || reply.body.error.fields.input);
    await owner.post(`/api/notebooks/${notebook.id}/cells`).send({ label: 'x', input: { kind: 'teleport' } }).expect(400);
  });

  test('a loop-integral cell runs on a worker and reproduces the G(s/2,s/2) pole 2/(ε Γ(s))', async () => {
    await owner.post(`/api/notebooks/${notebook.id}/cells`).send(setupCell).expect(201);
    notebook = (await owner.post(`/api/notebooks/${notebook.id}/cells`).send(bubbleCell).expect(201)).body.notebook;
    const bubble = notebook.cells.find((c) => c.label === 'bubble')!;
    assert.equal(bubble.state, 'never-run');
    const run = await settle(owner, (await owner.post(`/api/notebooks/${notebook.id}/cells/${bubble.id}/run`).expect(202)).body.run);
    assert.equal(run.status, 'done', JSON.stringify(run.error));
    const result = run.result as { lowest: number; coeffs: string[] };
    assert.equal(result.lowest, -1);
    // 2/Γ(3/2) = 4/√π = 2.2567583341910251477923178062431… (DLMF 5.4.6: Γ(3/2) = √π/2).
    assert.equal(result.coeffs[0].slice(0, 20), '2.256758334191025147');
    notebook = (await owner.get(`/api/notebooks/${notebook.id}`).expect(200)).body.notebook;
    assert.equal(notebook.cells.find((c) => c.label === 'bubble')!.state, 'up-to-date');
    assert.deepEqual(notebook.cells.find((c) => c.label === 'setup')!.dependents, ['bubble']);
  });

  test('editing the setup marks its dependents out of date; run-all brings them up to date; identical jobs come from the cache', async () => {
    const setup = notebook.cells.find((c) => c.label === 'setup')!;
    notebook = (await owner.patch(`/api/notebooks/${notebook.id}/cells/${setup.id}`).send({ revision: setup.revision, input: { ...setupCell.input, s: '1.75' } }).expect(200)).body.notebook;
    const bubble = notebook.cells.find((c) => c.label === 'bubble')!;
    assert.equal(bubble.state, 'out-of-date');
    const runs: RunView[] = (await owner.post(`/api/notebooks/${notebook.id}/run-all`).expect(202)).body.runs;
    assert.equal(runs.length, 1);
    assert.equal((await settle(owner, runs[0])).status, 'done');
    notebook = (await owner.get(`/api/notebooks/${notebook.id}`).expect(200)).body.notebook;
    assert.equal(notebook.cells.find((c) => c.label === 'bubble')!.state, 'up-to-date');
    // Back to s = 3/2: the bubble is out of date again, and its job was computed before.
    const changed = notebook.cells.find((c) => c.label === 'setup')!;
    notebook = (await owner.patch(`/api/notebooks/${notebook.id}/cells/${setup.id}`).send({ revision: changed.revision, input: setupCell.input }).expect(200)).body.notebook;
    assert.equal(notebook.cells.find((c) => c.label === 'bubble')!.state, 'out-of-date');
    const rerun: RunView = (await owner.post(`/api/notebooks/${notebook.id}/cells/${bubble.id}/run`).expect(202)).body.run;
    assert.deepEqual([rerun.cached, rerun.status], [true, 'done']);
    notebook = (await owner.get(`/api/notebooks/${notebook.id}`).expect(200)).body.notebook;
  });

  test('a save made on an old revision gets 409 and changes nothing', async () => {
    const setup = notebook.cells.find((c) => c.label === 'setup')!;
    const stale = setup.revision - 1;
    const reply = await owner.patch(`/api/notebooks/${notebook.id}/cells/${setup.id}`).send({ revision: stale, input: { ...setupCell.input, s: '1.9' } }).expect(409);
    assert.equal(reply.body.error.code, 'conflict');
    const after = (await owner.get(`/api/notebooks/${notebook.id}`).expect(200)).body.notebook as NotebookDetail;
    assert.equal((after.cells.find((c) => c.label === 'setup')!.input as { s: string }).s, '1.5');
  });

  test('versions: save, list, compare cell by cell, restore (recorded as a new version)', async () => {
    const first = (await owner.post(`/api/notebooks/${notebook.id}/versions`).send({ message: 'bubble at s = 3/2' }).expect(201)).body.version;
    const setup = notebook.cells.find((c) => c.label === 'setup')!;
    const current = ((await owner.get(`/api/notebooks/${notebook.id}`)).body.notebook as NotebookDetail).cells.find((c) => c.label === 'setup')!;
    await owner.patch(`/api/notebooks/${notebook.id}/cells/${setup.id}`).send({ revision: current.revision, input: { ...setupCell.input, s: '1.25' } }).expect(200);
    const second = (await owner.post(`/api/notebooks/${notebook.id}/versions`).send({ message: 's = 5/4' }).expect(201)).body.version;
    // Changing the model & parameters cell saved an automatic version in between.
    assert.equal(second.number, first.number + 2);
    const between = (await owner.get(`/api/notebooks/${notebook.id}/versions`).expect(200)).body.versions.find((v: { number: number }) => v.number === first.number + 1);
    assert.deepEqual([between.automatic, between.message], [true, 'Before changing "setup"']);
    const comparison = (await owner.get(`/api/notebooks/${notebook.id}/versions/compare?from=${first.id}&to=${second.id}`).expect(200)).body.comparison;
    const setupChange = comparison.cells.find((c: { label: string }) => c.label === 'setup');
    assert.equal(setupChange.change, 'changed');
    assert.ok(setupChange.input.some((p: { removed?: boolean; value: string }) => p.removed && p.value.includes('"1.5"')));
    assert.ok(setupChange.input.some((p: { added?: boolean; value: string }) => p.added && p.value.includes('"1.25"')));
    const old = (await owner.get(`/api/notebooks/${notebook.id}/versions/${first.id}`).expect(200)).body.version;
    assert.equal(old.cells.find((c: { label: string }) => c.label === 'setup').input.s, '1.5');
    const restored = (await owner.post(`/api/notebooks/${notebook.id}/versions/${first.id}/restore`).expect(200)).body.notebook as NotebookDetail;
    assert.equal((restored.cells.find((c) => c.label === 'setup')!.input as { s: string }).s, '1.5');
    const list = (await owner.get(`/api/notebooks/${notebook.id}/versions`).expect(200)).body.versions;
    assert.deepEqual(list.slice(0, 2).map((v: { automatic: boolean; message: string }) => [v.automatic, v.message.split(':')[0]]), [
      [true, `Restored version ${first.number}`],
      [true, `Before restoring version ${first.number}`],
    ]);
    assert.equal(list.filter((v: { automatic: boolean }) => !v.automatic).length, 2, 'the two saved by hand');
    notebook = restored;
  });

  test('JSON export re-imports to an identical notebook; LaTeX export is a document', async () => {
    const exported = await owner.get(`/api/notebooks/${notebook.id}/export.json`).expect(200).expect('Content-Type', /json/);
    const document = JSON.parse(exported.text);
    assert.equal(document.format, 'rungbook-notebook');
    const imported = (await owner.post('/api/notebooks/import').send(document).expect(201)).body.notebook as NotebookDetail;
    assert.deepEqual(imported.cells.map((c) => [c.label, c.input]), notebook.cells.map((c) => [c.label, c.input]));
    const reexported = JSON.parse((await owner.get(`/api/notebooks/${imported.id}/export.json`).expect(200)).text);
    assert.deepEqual(reexported.cells.map((c: { label: string; input: unknown }) => [c.label, c.input]), document.cells.map((c: { label: string; input: unknown }) => [c.label, c.input]));
    const bad = await owner.post('/api/notebooks/import').send({ ...document, formatVersion: 99 }).expect(400);
    assert.match(bad.body.error.message, /Unsupported notebook file version/);
    const tex = await owner.get(`/api/notebooks/${notebook.id}/export.tex`).expect(200);
    assert.match(tex.text, /^\\documentclass(\[[^\]]*\])?\{article\}/);
    assert.match(tex.text, /\\end\{document\}\s*$/);
    assert.match(String(tex.headers['content-disposition']), /attachment; filename="?Invented-O-1-check\.tex"?/);
    // Rounded to 6 significant digits on request: no number keeps a 7th digit (the full export has longer ones).
    const longNumber = /\d\.\d{7,}|\d{8,}/;
    const rounded = await owner.get(`/api/notebooks/${notebook.id}/export.tex?digits=6&exact=false`).expect(200);
    assert.doesNotMatch(rounded.text.replace(/\\(?:begin|end)\{[^}]*\}/g, ''), longNumber);
    if (longNumber.test(tex.text)) assert.notEqual(rounded.text, tex.text);
    const tooFew = await owner.get(`/api/notebooks/${notebook.id}/export.tex?digits=2`).expect(400);
    assert.match(Object.values(tooFew.body.error.fields ?? {}).join(' ') + tooFew.body.error.message, /At least 3 digits/);
  });

  test('outsiders can neither read, edit nor run the notebook', async () => {
    const cell = notebook.cells[0];
    await outsider.patch(`/api/notebooks/${notebook.id}/cells/${cell.id}`).send({ revision: cell.revision, label: 'mine' }).expect(404);
    await outsider.post(`/api/notebooks/${notebook.id}/run-all`).expect(404);
    await outsider.get(`/api/notebooks/${notebook.id}/export.json`).expect(404);
  });
});

describe('POST /api/calc and runs', () => {
  let h: Harness;
  let client: Client;
  before(async () => {
    h = await startHarness({ JOB_TIME_LIMIT_MS: '20000' });
    client = h.browser();
    await signUpVerified(h, 3, client);
  });
  after(() => h.close());

  test('takes the same job objects as the calc CLI and caches identical ones', async () => {
    const job = { job: 'special', fn: 'gamma', x: '0.25', digits: 40 };
    const first = (await client.post('/api/calc').send({ job }).expect(200)).body.run;
    assert.equal(first.status, 'done');
    assert.equal(first.cached, false);
    // Γ(1/4) = 3.6256099082219083119306851558676720029951… (OEIS A068466).
    assert.equal(first.result.value, '3.625609908221908311930685155867672002995');
    const second = (await client.post('/api/calc').send({ job: { digits: 40, x: '0.25', fn: 'gamma', job: 'special' } }).expect(200)).body.run;
    assert.equal(second.cached, true);
    assert.deepEqual(second.result, first.result);
  });

  test('an invalid job fails with the engine error and nothing crashes', async () => {
    const run = (await client.post('/api/calc').send({ job: { job: 'special', fn: 'gamma', x: '-2', digits: 30 } }).expect(200)).body.run;
    assert.equal(run.status, 'failed');
    assert.equal(run.error.code, 'pole');
    const missing = await client.post('/api/calc').send({}).expect(400);
    assert.ok(missing.body.error.fields.job);
  });

  test('the OpenAPI document lists the routes with their request schemas', async () => {
    const doc = (await h.raw.get('/api/openapi.json').expect(200)).body;
    assert.equal(doc.openapi, '3.1.0');
    assert.ok(doc.paths['/api/notebooks/{notebookId}/cells'].post.requestBody);
    assert.ok(doc.paths['/api/auth/sign-up'].post.requestBody.content['application/json'].schema.properties.password);
  });
});

describe('run limits', () => {
  let h: Harness;
  let client: Client;
  before(async () => {
    h = await startHarness({ JOB_TIME_LIMIT_MS: '300' });
    client = h.browser();
    await signUpVerified(h, 4, client);
  });
  after(() => h.close());

  test('a job over the time limit is stopped and marked failed with the reason; the replaced worker runs the next job', async () => {
    // A 200-point two-loop scan of the cubic model takes seconds of engine time on this machine class.
    const slowScan = { job: 'scan', model: { preset: 'cubic', N: 3 }, d: '3', s: { from: '1.55', to: '2', points: 200 }, digits: 40, quantities: ['nuInv', 'omega', 'eta'] };
    const slow = (await client.post('/api/calc').send({ job: slowScan }).expect(200)).body.run;
    assert.equal(slow.status, 'failed');
    assert.equal(slow.error.code, 'time-limit');
    assert.match(slow.error.message, /time limit/);
    // The limit counts engine time only, so a small job on the freshly booted replacement worker finishes.
    const next = (await client.post('/api/calc').send({ job: { job: 'special', fn: 'zeta', x: '3', digits: 10 } }).expect(200)).body.run;
    assert.equal(next.status, 'done', JSON.stringify(next.error));
    // ζ(3) = 1.202056903159594285… (OEIS A002117).
    assert.equal(next.result.value, '1.202056903');
  });
});

describe('cancelling a run', () => {
  test('a running job can be cancelled by the person who started it, and only by them', async () => {
    const h = await startHarness();
    try {
      const owner = h.browser();
      const other = h.browser();
      const me = (await signUpVerified(h, 5, owner)).user;
      await signUpVerified(h, 6, other);
      const run = await h.rungbook.services.runs.submit({ job: { job: 'special', fn: 'gamma', x: '0.7', digits: 1000 }, userId: me.id });
      await other.post(`/api/runs/${run.id}/cancel`).expect(404);
      const cancelled = (await owner.post(`/api/runs/${run.id}/cancel`).expect(200)).body.run;
      assert.equal(cancelled.status, 'cancelled');
      assert.equal(cancelled.error.code, 'cancelled');
    } finally {
      await h.close();
    }
  });
});

describe('cell input checks at save time, moving cells, run ownership', () => {
  let h: Harness;
  let owner: Client;
  let stranger: Client;
  let notebookId: string;
  before(async () => {
    h = await startHarness();
    owner = h.browser();
    stranger = h.browser();
    await signUpVerified(h, 7, owner);
    await signUpVerified(h, 8, stranger);
    notebookId = (await owner.post('/api/notebooks').send({ title: 'Invented limits check' }).expect(201)).body.notebook.id;
  });
  after(() => h.close());

  const setupWith = (overrides: Record<string, unknown>) => ({ label: 'p', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 20, ...overrides } });

  test('setups the engine would refuse are refused when saved, with the field named', async () => {
    const tooMany = await owner.post(`/api/notebooks/${notebookId}/cells`).send(setupWith({ model: { preset: 'custom', fields: 7, potential: 'u*phi1^4' } })).expect(400);
    assert.match(Object.values(tooMany.body.error.fields).join(' '), /At most 6 field components/);
    const badS = await owner.post(`/api/notebooks/${notebookId}/cells`).send(setupWith({ s: '2.5' })).expect(400);
    assert.match(badS.body.error.fields['input.s'], /\(0, 2\]/);
    const badD = await owner.post(`/api/notebooks/${notebookId}/cells`).send(setupWith({ d: '-1' })).expect(400);
    assert.ok(badD.body.error.fields['input.d']);
    const cubicTerm = await owner.post(`/api/notebooks/${notebookId}/cells`).send(setupWith({ model: { preset: 'custom', fields: 2, potential: 'g*phi1^3*phi2' } }));
    assert.equal(cubicTerm.status, 201, 'phi1^3*phi2 is quartic');
    const notQuartic = await owner.post(`/api/notebooks/${notebookId}/cells`).send({ ...setupWith({ model: { preset: 'custom', fields: 1, potential: 'g*phi1^3' } }), label: 'q' }).expect(400);
    assert.ok(notQuartic.body.error.fields['input.model.potential']);
  });

  test('cells move to a new position and the order is kept', async () => {
    let nb = (await owner.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'n1', input: { kind: 'note', text: 'first' } }).expect(201)).body.notebook;
    nb = (await owner.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'n2', input: { kind: 'note', text: 'second' } }).expect(201)).body.notebook;
    const n2 = nb.cells.find((c: { label: string }) => c.label === 'n2');
    nb = (await owner.post(`/api/notebooks/${notebookId}/cells/${n2.id}/move`).send({ position: 0 }).expect(200)).body.notebook;
    assert.deepEqual(nb.cells.map((c: { label: string }) => c.label), ['n2', 'p', 'n1']);
    assert.deepEqual(nb.cells.map((c: { position: number }) => c.position), [0, 1, 2]);
  });

  test('only whoever started a run (or an editor of its notebook) may cancel it', async () => {
    const me = (await owner.get('/api/me').expect(200)).body.user;
    const run = await h.rungbook.services.runs.submit({ job: { job: 'special', fn: 'gamma', x: '0.9', digits: 1000 }, userId: me.id });
    await stranger.post(`/api/runs/${run.id}/cancel`).expect(404);
    await owner.post(`/api/runs/${run.id}/cancel`).expect(200);
  });

  test('POST /api/calc validates the job against the engine contract before any worker sees it', async () => {
    const reply = await owner.post('/api/calc').send({ job: { job: 'special', fn: 'gamma', x: 'one half', digits: 30 } }).expect(400);
    assert.equal(reply.body.error.code, 'validation_failed');
    const doc = (await h.raw.get('/api/openapi.json').expect(200)).body;
    assert.ok(JSON.stringify(doc.paths['/api/calc'].post.requestBody).includes('laurent'), 'the calc body schema lists the job kinds');
  });
});
