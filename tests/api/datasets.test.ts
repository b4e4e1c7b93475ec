// Datasets through the API: uploads and pasted tables, their limits, roles, versions, the exchange file,
// the CSV download and comparison cells that read them. All tables here are invented test data.
import assert from 'node:assert/strict';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { after, before, describe, test } from 'node:test';
import { Dataset, NotebookVersion } from '../../server/db/entities';
import { newId } from '../../server/ids';
import { MAX_VERSIONS_PER_NOTEBOOK } from '../../server/services/versions';
import { CompareResult } from '../../shared/jobs/contract';
import type { CellView, NotebookDetail, RunAllReply, RunView, VersionSummary } from '../../shared/notebook/api';
import { DATASET_LIMITS, type DatasetView, type DatasetWithPoints } from '../../shared/notebook/datasets';
import { FORM_OVERHEAD_BYTES, type UploadGate } from '../../server/http/upload';
import { ORIGIN, startHarness, type Harness } from './harness';
import { insertInventedDataset, pointsOfLength } from './inventedDatasets';
import { collaborationFixture, createPerson, INVENTED_TABLE, settleRun, type Client, type TestPerson } from './people';

/** A description as the mapping form sends it: x = s, y = Δφ² with a symmetric error column. */
const description = (label: string, extra: Record<string, unknown> = {}) => ({
  label,
  name: `Invented ${label}`,
  source: 'invented for tests',
  shape: 'points',
  xAxis: { kind: 's' },
  yAxis: { kind: 'Delta_phi2' },
  mapping: { x: 0, y: 1, yError: { kind: 'symmetric', column: 2 } },
  ...extra,
});

function upload(client: Client, notebookId: string, desc: object, content: string | Buffer, name = 'table.csv') {
  return client
    .post(`/api/notebooks/${notebookId}/datasets`)
    .field('description', JSON.stringify(desc))
    .attach('file', Buffer.isBuffer(content) ? content : Buffer.from(content), name);
}

/** The columns of a delimited text, data rows sorted by x (the first column) numerically; the header row dropped. */
function columnsOf(text: string, delimiter: string): string[][] {
  const rows = text.trim().split('\n').slice(1).map((line) => line.split(delimiter));
  rows.sort((a, b) => Number(a[0]) - Number(b[0]));
  return rows[0].map((_cell, column) => rows.map((row) => row[column]));
}

const BOUNDARY = 'invented-boundary-7c1f';

/** The multipart form an upload sends (fields "description" and "file"), written out by hand. */
function multipartBody(desc: object, content: string): Buffer {
  return Buffer.from(
    `--${BOUNDARY}\r\nContent-Disposition: form-data; name="description"\r\n\r\n${JSON.stringify(desc)}\r\n` +
      `--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="table.csv"\r\nContent-Type: text/csv\r\n\r\n${content}\r\n--${BOUNDARY}--\r\n`,
  );
}

/** The session cookie of a fresh sign-in, for requests made without supertest. */
async function sessionCookie(h: Harness, who: TestPerson): Promise<string> {
  const reply = await h.raw.post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: who.email, password: who.password }).expect(200);
  return (reply.headers['set-cookie'] as unknown as string[]).map((cookie) => cookie.split(';')[0]).join('; ');
}

/**
 * An upload whose headers are sent at once and whose body is held back until `finish()` (or never): a
 * reply that comes while the body is held back was decided without reading it.
 */
function heldUpload(port: number, cookie: string, notebookId: string, body: Buffer, declaredLength = body.length) {
  const request = http.request({
    host: '127.0.0.1',
    port,
    method: 'POST',
    path: `/api/notebooks/${notebookId}/datasets`,
    headers: { Origin: ORIGIN, Cookie: cookie, 'Content-Type': `multipart/form-data; boundary=${BOUNDARY}`, 'Content-Length': declaredLength },
  });
  const reply = new Promise<{ status: number; body: { error?: { code: string; message: string }; dataset?: DatasetView } }>((resolve, reject) => {
    request.on('response', (res) => {
      let text = '';
      res.setEncoding('utf8');
      res.on('data', (chunk: string) => (text += chunk));
      res.on('end', () => resolve({ status: res.statusCode!, body: text ? JSON.parse(text) : {} }));
    });
    request.on('error', reject);
  });
  request.flushHeaders();
  return { reply, finish: () => request.end(body), abort: () => request.destroy() };
}

/** Wait (a bounded number of turns) until `condition` holds; the check is of state, not of time. */
async function until(condition: () => boolean, what: string): Promise<void> {
  for (let turn = 0; turn < 1000 && !condition(); turn += 1) await new Promise((resolve) => setTimeout(resolve, 10));
  assert.ok(condition(), what);
}

function listen(h: Harness): Promise<http.Server> {
  return new Promise((resolve) => {
    const server = http.createServer(h.rungbook.app).listen(0, '127.0.0.1', () => resolve(server));
  });
}

describe('datasets', () => {
  let h: Harness;
  let owner: TestPerson;
  let editor: TestPerson;
  let commenter: TestPerson;
  let viewer: TestPerson;
  let stranger: TestPerson;
  let notebookId: string;
  let viewerToken: string;

  const datasetRows = () => h.rungbook.services.dataSource.getRepository(Dataset).count();
  const detail = async (id = notebookId): Promise<NotebookDetail> => (await owner.client.get(`/api/notebooks/${id}`).expect(200)).body.notebook;
  const newNotebook = async (title = 'Invented dataset notebook'): Promise<string> =>
    (await owner.client.post('/api/notebooks').send({ title, summary: '' }).expect(201)).body.notebook.id;

  before(async () => {
    h = await startHarness({ DATASET_UPLOAD_LIMIT_PER_USER: '100000', SIGNIN_LIMIT_PER_IP: '100000' });
    owner = await createPerson(h, { tag: 'owner' });
    editor = await createPerson(h, { tag: 'editor' });
    commenter = await createPerson(h, { tag: 'commenter' });
    viewer = await createPerson(h, { tag: 'viewer' });
    stranger = await createPerson(h, { tag: 'stranger' });
    notebookId = await newNotebook();
    const cellId = (await owner.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'note', input: { kind: 'note', text: 'Invented' } }).expect(201)).body.notebook.cells[0].id;
    const grants = await collaborationFixture(h, { notebookId, cellId, ownerId: owner.id }, [
      { userId: editor.id, role: 'editor' },
      { userId: commenter.id, role: 'commenter' },
      { userId: viewer.id, role: 'viewer' },
    ]);
    viewerToken = grants.viewerToken;
  });
  after(() => h.close());

  test('an uploaded CSV is stored with the file\'s columns (sorted by x) and shows in the notebook', async () => {
    // rows deliberately out of order: the stored points are sorted by x
    const csv = 's,Delta_phi2,err\n1.7,1.46,0.03\n1.5,1.41,0.02\n1.8,1.50,0.03\n1.6,1.43,0.02\n';
    const reply = await upload(owner.client, notebookId, description('lattice'), csv, 'lattice.csv').expect(201);
    const view = reply.body.dataset as DatasetView;
    assert.equal(view.label, 'lattice');
    assert.equal(view.rowCount, 4);
    assert.deepEqual(view.xRange, ['1.5', '1.8']);
    assert.equal(view.fileName, 'lattice.csv');
    const [x, y, err] = columnsOf(csv, ',');
    const stored = (await viewer.client.get(`/api/notebooks/${notebookId}/datasets/${view.id}`).expect(200)).body.dataset as DatasetWithPoints;
    // the independent value: the file's own columns, sorted here by x
    assert.deepEqual(stored.points.x, x);
    assert.deepEqual(stored.points.y, y);
    assert.deepEqual(stored.points.yErrLow, err);
    assert.equal(stored.contentHash, view.contentHash);
    assert.deepEqual((await detail()).datasets.map((d) => d.label), ['lattice']);
    const list = (await viewer.client.get(`/api/notebooks/${notebookId}/datasets`).expect(200)).body.datasets as DatasetView[];
    assert.deepEqual(list.map((d) => d.id), [view.id]);
  });

  test('a TSV file and a pasted table are stored alike', async () => {
    const tsv = 's\tnu\n1.55\t0.91\n1.65\t0.95\n1.75\t0.99\n';
    const fromTsv = (await upload(owner.client, notebookId, description('tsv', { yAxis: { kind: 'nu' }, mapping: { x: 0, y: 1 } }), tsv, 'nu.tsv').expect(201)).body.dataset as DatasetView;
    const stored = (await owner.client.get(`/api/notebooks/${notebookId}/datasets/${fromTsv.id}`).expect(200)).body.dataset as DatasetWithPoints;
    const [x, y] = columnsOf(tsv, '\t');
    assert.deepEqual([stored.points.x, stored.points.y], [x, y]);
    assert.equal(stored.points.yErrLow, undefined);

    const pasted = (await editor.client.post(`/api/notebooks/${notebookId}/datasets/pasted`).send({ ...description('pasted'), text: INVENTED_TABLE }).expect(201)).body.dataset as DatasetView;
    const points = ((await owner.client.get(`/api/notebooks/${notebookId}/datasets/${pasted.id}`).expect(200)).body.dataset as DatasetWithPoints).points;
    const [px, py, perr] = columnsOf(INVENTED_TABLE, ',');
    assert.deepEqual([points.x, points.y, points.yErrLow, points.yErrHigh], [px, py, perr, perr]);
    assert.equal(pasted.createdByName, (await editor.client.get('/api/me').expect(200)).body.user.name);
  });

  test('roles: editors add, commenters and viewers are refused (403), people without a role learn nothing (404)', async () => {
    await upload(editor.client, notebookId, description('by_editor'), INVENTED_TABLE).expect(201);
    for (const refused of [commenter, viewer]) {
      assert.equal((await upload(refused.client, notebookId, description('refused'), INVENTED_TABLE).expect(403)).body.error.code, 'forbidden');
      await refused.client.post(`/api/notebooks/${notebookId}/datasets/pasted`).send({ ...description('refused'), text: INVENTED_TABLE }).expect(403);
    }
    await upload(stranger.client, notebookId, description('refused'), INVENTED_TABLE).expect(404);
    await h.browser().post(`/api/notebooks/${notebookId}/datasets/pasted`).send({ ...description('refused'), text: INVENTED_TABLE }).expect(401);
    const [lattice] = (await detail()).datasets;
    await stranger.client.get(`/api/notebooks/${notebookId}/datasets/${lattice.id}`).expect(404);
    await commenter.client.delete(`/api/notebooks/${notebookId}/datasets/${lattice.id}`).expect(403);
    // a share link reads the notebook's datasets without signing in; another notebook's dataset is not reachable through it
    const shared = (await h.browser().get(`/api/shared/${viewerToken}/datasets/${lattice.id}`).expect(200)).body.dataset as DatasetWithPoints;
    assert.equal(shared.label, lattice.label);
    assert.deepEqual((await h.browser().get(`/api/shared/${viewerToken}`).expect(200)).body.notebook.datasets.map((d: DatasetView) => d.id).sort(), (await detail()).datasets.map((d) => d.id).sort());
    const elsewhere = await newNotebook('Invented other notebook');
    const otherId = (await upload(owner.client, elsewhere, description('other'), INVENTED_TABLE).expect(201)).body.dataset.id;
    await h.browser().get(`/api/shared/${viewerToken}/datasets/${otherId}`).expect(404);
    await owner.client.get(`/api/notebooks/${notebookId}/datasets/${otherId}`).expect(404);
    await h.browser().get(`/api/shared/not-a-token/datasets/${lattice.id}`).expect(404);
  });

  test('a file of 10 MB + 1 byte is refused with 413 naming the limit; nothing is stored', async () => {
    const before = await datasetRows();
    const reply = await upload(owner.client, notebookId, description('too_big'), Buffer.alloc(DATASET_LIMITS.maxFileBytes + 1, '1'), 'big.csv').expect(413);
    assert.equal(reply.body.error.code, 'payload_too_large');
    assert.match(reply.body.error.message, /10 MB/);
    assert.equal(await datasetRows(), before);
  });

  test('a bad row is reported with its line number; the table is refused whole and nothing is stored', async () => {
    const before = await datasetRows();
    // line 1 header, line 4 holds a word where a number belongs
    const csv = 's,Delta_phi2,err\n1.5,1.41,0.02\n1.6,1.43,0.02\n1.7,abc,0.03\n1.8,1.50,0.03\n';
    const reply = await upload(owner.client, notebookId, description('bad'), csv).expect(400);
    assert.equal(reply.body.error.code, 'invalid_table');
    assert.ok(reply.body.error.problems.some((p: { line: number }) => p.line === 4), JSON.stringify(reply.body.error));
    assert.ok(reply.body.error.problemCount >= 1);
    assert.equal(await datasetRows(), before);
    const pasted = await owner.client.post(`/api/notebooks/${notebookId}/datasets/pasted`).send({ ...description('bad'), text: csv }).expect(400);
    assert.equal(pasted.body.error.code, 'invalid_table');
    assert.equal(await datasetRows(), before);
    assert.ok(!(await detail()).datasets.some((d) => d.label === 'bad'));
  });

  test('a binary file renamed .csv and an empty file are refused; nothing is stored', async () => {
    const before = await datasetRows();
    const binary = Buffer.from(Array.from({ length: 4096 }, (_v, i) => (i * 37) % 256));
    assert.equal((await upload(owner.client, notebookId, description('binary'), binary, 'photo.csv').expect(400)).body.error.code, 'invalid_table');
    assert.equal((await upload(owner.client, notebookId, description('empty'), Buffer.alloc(0), 'empty.csv').expect(400)).body.error.code, 'invalid_table');
    assert.equal(await datasetRows(), before);
  });

  test(`${DATASET_LIMITS.maxRows.toLocaleString('en')} rows are accepted, one more is refused`, async () => {
    const target = await newNotebook('Invented large tables');
    const table = (rows: number) => `s,y\n${Array.from({ length: rows }, (_v, i) => `${(1 + i / 1_000_000).toFixed(6)},${i % 97}`).join('\n')}\n`;
    const largest = (await upload(owner.client, target, description('largest', { yAxis: { kind: 'other', label: 'y' }, mapping: { x: 0, y: 1 } }), table(DATASET_LIMITS.maxRows)).expect(201)).body.dataset as DatasetView;
    assert.equal(largest.rowCount, DATASET_LIMITS.maxRows);
    const before = await datasetRows();
    const over = await upload(owner.client, target, description('over', { yAxis: { kind: 'other', label: 'y' }, mapping: { x: 0, y: 1 } }), table(DATASET_LIMITS.maxRows + 1)).expect(400);
    assert.equal(over.body.error.code, 'invalid_table');
    assert.equal(await datasetRows(), before);
  });

  test('a label already in the notebook is a 409; a notebook holds at most 20 datasets', async () => {
    const target = await newNotebook('Invented full notebook');
    await upload(owner.client, target, description('twice'), INVENTED_TABLE).expect(201);
    const again = await upload(owner.client, target, description('twice'), INVENTED_TABLE).expect(409);
    assert.equal(again.body.error.fields.label, 'Label already used');
    for (let i = 1; i < DATASET_LIMITS.maxPerNotebook; i += 1) {
      await owner.client.post(`/api/notebooks/${target}/datasets/pasted`).send({ ...description(`d${i}`), text: INVENTED_TABLE }).expect(201);
    }
    assert.equal((await detail(target)).datasets.length, DATASET_LIMITS.maxPerNotebook);
    const full = await owner.client.post(`/api/notebooks/${target}/datasets/pasted`).send({ ...description('one_more'), text: INVENTED_TABLE }).expect(409);
    assert.match(full.body.error.message, /at most 20 datasets/);
  });

  test('download.csv holds the stored columns under the axes\' names; a formula in an axis label cannot run in a spreadsheet', async () => {
    const target = await newNotebook('Invented download');
    const formula = '=cmd|\' /C calc\'!A0';
    const desc = description('download', { xAxis: { kind: 'other', label: formula }, mapping: { x: 0, y: 1, yError: { kind: 'symmetric', column: 2 } } });
    const id = (await upload(owner.client, target, desc, INVENTED_TABLE).expect(201)).body.dataset.id;
    const reply = await owner.client.get(`/api/notebooks/${target}/datasets/${id}/download.csv`).expect(200);
    assert.match(reply.headers['content-type'], /^text\/csv/);
    assert.match(reply.headers['content-disposition'], /download\.csv/);
    const lines = reply.text.split('\r\n').filter(Boolean);
    const header = lines[0].split(',');
    // a spreadsheet reads a cell starting with = + - @ as a formula (OWASP "CSV injection", common practice): it must not start so
    assert.ok(!/^[=+\-@]/.test(header[0]), header[0]);
    assert.ok(header[0].includes('cmd'));
    // Δφ² is the product's name of that axis (AXIS_NAMES); the error column is named after it
    assert.deepEqual(header.slice(1), ['Δφ²', 'Δφ² error']);
    const stored = ((await owner.client.get(`/api/notebooks/${target}/datasets/${id}`).expect(200)).body.dataset as DatasetWithPoints).points;
    assert.deepEqual(lines.slice(1).map((line) => line.split(',')), stored.x.map((x, i) => [x, stored.y[i], stored.yErrLow![i]]));
    const [fx, fy, ferr] = columnsOf(INVENTED_TABLE, ',');
    assert.deepEqual(lines.slice(1).map((line) => line.split(',')), fx.map((x, i) => [x, fy[i], ferr[i]]));
  });

  test('removing a dataset keeps a version before; restoring it brings the dataset back with the same points', async () => {
    const target = await newNotebook('Invented removal');
    const added = (await upload(owner.client, target, description('kept'), INVENTED_TABLE).expect(201)).body.dataset as DatasetView;
    const pointsBefore = (await owner.client.get(`/api/notebooks/${target}/datasets/${added.id}`).expect(200)).body.dataset.points;
    await commenter.client.delete(`/api/notebooks/${target}/datasets/${added.id}`).expect(404);
    const after = (await owner.client.delete(`/api/notebooks/${target}/datasets/${added.id}`).expect(200)).body.notebook as NotebookDetail;
    assert.deepEqual(after.datasets, []);
    await owner.client.delete(`/api/notebooks/${target}/datasets/${added.id}`).expect(404);
    const versions = (await owner.client.get(`/api/notebooks/${target}/versions`).expect(200)).body.versions as VersionSummary[];
    const before = versions.find((v) => v.message === 'Before removing dataset "kept"');
    assert.ok(before, JSON.stringify(versions));
    // the version still shows it, and its points stay readable by id
    const version = (await viewer.client.get(`/api/notebooks/${target}/versions/${before.id}`).expect(404)).body;
    assert.equal(version.error.code, 'not_found'); // the viewer has no role on this notebook
    const versionView = (await owner.client.get(`/api/notebooks/${target}/versions/${before.id}`).expect(200)).body.version;
    assert.deepEqual(versionView.datasets.map((d: DatasetView) => d.id), [added.id]);
    assert.deepEqual((await owner.client.get(`/api/notebooks/${target}/datasets/${added.id}`).expect(200)).body.dataset.points, pointsBefore);
    const restored = (await owner.client.post(`/api/notebooks/${target}/versions/${before.id}/restore`).expect(200)).body.notebook as NotebookDetail;
    assert.deepEqual(restored.datasets.map((d) => d.id), [added.id]);
    assert.deepEqual((await owner.client.get(`/api/notebooks/${target}/datasets/${added.id}`).expect(200)).body.dataset.points, pointsBefore);
    const log = (await owner.client.get(`/api/notebooks/${target}/activity`).expect(200)).body;
    assert.ok(JSON.stringify(log).includes('removed dataset \\"kept\\" (4 points)'), JSON.stringify(log).slice(0, 500));
    assert.ok(JSON.stringify(log).includes('added dataset \\"kept\\" (4 points)'), JSON.stringify(log).slice(0, 500));
  });

  test('export.json carries the datasets; importing it gives a notebook with equal datasets', async () => {
    const target = await newNotebook('Invented exchange');
    const asymmetric = 's,eta,low,high\n1.6,0.031,0.002,0.004\n1.7,0.029,0.002,0.003\n1.8,0.027,0.001,0.003\n';
    await upload(owner.client, target, description('asym', { yAxis: { kind: 'eta' }, mapping: { x: 0, y: 1, yError: { kind: 'asymmetric', lower: 2, upper: 3 } } }), asymmetric).expect(201);
    await owner.client.post(`/api/notebooks/${target}/datasets/pasted`).send({ ...description('sym'), text: INVENTED_TABLE }).expect(201);
    const file = (await owner.client.get(`/api/notebooks/${target}/export.json`).expect(200)).text;
    const document = JSON.parse(file);
    assert.deepEqual(document.datasets.map((d: { label: string }) => d.label), ['asym', 'sym']);
    const [low, high] = columnsOf(asymmetric, ',').slice(2);
    assert.deepEqual([document.datasets[0].points.yErrLow, document.datasets[0].points.yErrHigh], [low, high]);
    const imported = (await owner.client.post('/api/notebooks/import').send(document).expect(201)).body.notebook as NotebookDetail;
    const strip = (d: DatasetView) => ({ ...d, id: undefined, createdAt: undefined });
    assert.deepEqual(imported.datasets.map(strip), (await detail(target)).datasets.map(strip));
    for (const dataset of imported.datasets) {
      const points = (await owner.client.get(`/api/notebooks/${imported.id}/datasets/${dataset.id}`).expect(200)).body.dataset.points;
      assert.deepEqual(points, document.datasets.find((d: { label: string }) => d.label === dataset.label).points);
    }
    // an exchange file whose points are not sorted by x is refused, and no notebook is made
    const before = await datasetRows();
    const unsorted = { ...document, title: 'Invented unsorted import', datasets: [{ ...document.datasets[1], points: { x: ['1.6', '1.5'], y: ['1', '2'] } }] };
    assert.equal((await owner.client.post('/api/notebooks/import').send(unsorted).expect(400)).body.error.code, 'invalid_table');
    assert.equal(await datasetRows(), before);
    assert.ok(!((await owner.client.get('/api/notebooks').expect(200)).body.notebooks as { title: string }[]).some((n) => n.title === 'Invented unsorted import'));
  });

  test('a comparison cell runs with its dataset; replacing the dataset makes it out of date', async () => {
    const target = await newNotebook('Invented comparison');
    await upload(owner.client, target, description('lattice'), INVENTED_TABLE).expect(201);
    const add = (label: string, input: object) => owner.client.post(`/api/notebooks/${target}/cells`).send({ label, input }).expect(201);
    await add('setup', { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 20 });
    await add('scan', { kind: 'scan', uses: 'setup', from: '1.55', to: '1.95', points: 5, quantities: ['Delta_phi2'] });
    const cells = (await add('cmp', { kind: 'comparison', uses: 'scan', dataset: 'lattice', kinks: false })).body.notebook.cells as CellView[];
    const cmp = cells.find((c) => c.label === 'cmp')!;
    assert.equal(cmp.state, 'never-run');
    const run = await settleRun(owner.client, (await owner.client.post(`/api/notebooks/${target}/cells/${cmp.id}/run`).expect(202)).body.run as RunView);
    assert.equal(run.status, 'done', JSON.stringify(run.error));
    const parsed = CompareResult.safeParse(run.result);
    assert.ok(parsed.success, parsed.success ? '' : parsed.error.message);
    // the job saw exactly the dataset's points (the invented table's x column)
    const [x] = columnsOf(INVENTED_TABLE, ',');
    assert.deepEqual(parsed.data!.points.map((p) => p.x), x);
    const stateOf = async () => (await detail(target)).cells.find((c) => c.label === 'cmp')!.state;
    assert.equal(await stateOf(), 'up-to-date');

    const lattice = (await detail(target)).datasets.find((d) => d.label === 'lattice')!;
    await owner.client.delete(`/api/notebooks/${target}/datasets/${lattice.id}`).expect(200);
    assert.equal(await stateOf(), 'broken-reference');
    const changed = INVENTED_TABLE.replace('1.46', '1.47');
    await upload(owner.client, target, description('lattice'), changed).expect(201);
    assert.equal(await stateOf(), 'out-of-date');
    // the same points again under the label: the cell's run matches once more
    const replaced = (await detail(target)).datasets.find((d) => d.label === 'lattice')!;
    await owner.client.delete(`/api/notebooks/${target}/datasets/${replaced.id}`).expect(200);
    await upload(owner.client, target, description('lattice'), INVENTED_TABLE).expect(201);
    assert.equal(await stateOf(), 'up-to-date');
  });

  test('an exchange file larger than the JSON body limit (100 kB) still imports: its datasets travel with it', async () => {
    const target = await newNotebook('Invented large exchange');
    const rows = 10_000;
    const table = `s,nu\n${Array.from({ length: rows }, (_v, i) => `${(1.5 + i / 100_000).toFixed(5)},${(0.9 + i / 1_000_000).toFixed(6)}`).join('\n')}\n`;
    await upload(owner.client, target, description('wide', { yAxis: { kind: 'nu' }, mapping: { x: 0, y: 1 } }), table).expect(201);
    const file = (await owner.client.get(`/api/notebooks/${target}/export.json`).expect(200)).text;
    assert.ok(file.length > 100 * 1024, `${file.length} characters`);
    const imported = (await owner.client.post('/api/notebooks/import').set('Content-Type', 'application/json').send(file).expect(201)).body.notebook as NotebookDetail;
    assert.equal(imported.datasets[0].rowCount, rows);
    // other routes keep the small limit
    const big = await owner.client.post('/api/notebooks').send({ title: 'x'.repeat(200 * 1024), summary: '' }).expect(413);
    assert.equal(big.body.error.code, 'payload_too_large');
  });

  test('a comparison over more points than it takes is refused with the x-range at fault', async () => {
    const target = await newNotebook('Invented wide comparison');
    const rows = DATASET_LIMITS.maxComparedPoints + 1;
    const table = `s,Delta_phi2\n${Array.from({ length: rows }, (_v, i) => `${(1.55 + i / 100_000).toFixed(5)},1.4`).join('\n')}\n`;
    await upload(owner.client, target, description('dense', { mapping: { x: 0, y: 1 } }), table).expect(201);
    const add = (label: string, input: object) => owner.client.post(`/api/notebooks/${target}/cells`).send({ label, input }).expect(201);
    await add('setup', { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 20 });
    await add('scan', { kind: 'scan', uses: 'setup', from: '1.55', to: '1.95', points: 5, quantities: ['Delta_phi2'] });
    const cells = (await add('cmp', { kind: 'comparison', uses: 'scan', dataset: 'dense', kinks: false })).body.notebook.cells as CellView[];
    const refused = await owner.client.post(`/api/notebooks/${target}/cells/${cells.find((c) => c.label === 'cmp')!.id}/run`).expect(400);
    assert.ok(refused.body.error.fields.xFrom, JSON.stringify(refused.body));
    assert.match(refused.body.error.message, /5,001 data points/);
  });

  test('a removed dataset is deleted once no version holds it any more', async () => {
    const target = await newNotebook('Invented pruning');
    const gone = (await upload(owner.client, target, description('gone'), INVENTED_TABLE).expect(201)).body.dataset as DatasetView;
    await owner.client.delete(`/api/notebooks/${target}/datasets/${gone.id}`).expect(200);
    const repo = h.rungbook.services.dataSource.getRepository(Dataset);
    assert.equal(await repo.countBy({ id: gone.id }), 1, 'held by the version kept before removing it');
    // fill the notebook's versions with ones saved by hand: the next save makes room by deleting the only automatic one
    const versionRepo = h.rungbook.services.dataSource.getRepository(NotebookVersion);
    const held = await versionRepo.findOneByOrFail({ notebookId: target, message: 'Before removing dataset "gone"' });
    for (let number = held.number + 1; number <= MAX_VERSIONS_PER_NOTEBOOK; number += 1) {
      await versionRepo.insert({ id: newId(), notebookId: target, number, message: `v${number}`, automatic: false, authorId: owner.id, authorName: 'Invented', snapshotJson: '{"title":"t","summary":"","cells":[]}' });
    }
    await owner.client.post(`/api/notebooks/${target}/versions`).send({ message: 'one more by hand' }).expect(201);
    assert.equal(await versionRepo.countBy({ id: held.id }), 0);
    assert.equal(await repo.countBy({ id: gone.id }), 0);
    await owner.client.get(`/api/notebooks/${target}/datasets/${gone.id}`).expect(404);
  });

  test('a comparison naming a dataset the notebook lacks is refused with the field at fault', async () => {
    const target = await newNotebook('Invented missing dataset');
    const add = (label: string, input: object) => owner.client.post(`/api/notebooks/${target}/cells`).send({ label, input }).expect(201);
    await add('setup', { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 20 });
    await add('scan', { kind: 'scan', uses: 'setup', from: '1.55', to: '1.95', points: 5, quantities: ['Delta_phi2'] });
    const cells = (await add('cmp', { kind: 'comparison', uses: 'scan', dataset: 'absent', kinks: false })).body.notebook.cells as CellView[];
    const cmp = cells.find((c) => c.label === 'cmp')!;
    assert.equal(cmp.state, 'broken-reference');
    const refused = await owner.client.post(`/api/notebooks/${target}/cells/${cmp.id}/run`).expect(400);
    assert.ok(refused.body.error.fields.dataset, JSON.stringify(refused.body));
  });
  test('a share link reads only the notebook\'s current datasets: a removed one (still held by a version) is 404 through it', async () => {
    const dataset = (await owner.client.post(`/api/notebooks/${notebookId}/datasets/pasted`).send({ ...description('short_lived'), text: INVENTED_TABLE }).expect(201)).body.dataset as DatasetView;
    await h.browser().get(`/api/shared/${viewerToken}/datasets/${dataset.id}`).expect(200);
    await owner.client.delete(`/api/notebooks/${notebookId}/datasets/${dataset.id}`).expect(200);
    // the version kept before the removal still holds it, and members may read it there
    await owner.client.get(`/api/notebooks/${notebookId}/datasets/${dataset.id}`).expect(200);
    assert.equal((await h.browser().get(`/api/shared/${viewerToken}/datasets/${dataset.id}`).expect(404)).body.error.code, 'not_found');
  });

  test('large bodies (import, pasted table, calc) are not read for people signed out (401) or requests from another site (403)', async () => {
    // Malformed JSON: had the body been parsed before these checks, the answer would be 400 malformed_json.
    const malformed = `{${' '.repeat(2 * 1024 * 1024)}`;
    const paths = ['/api/notebooks/import', `/api/notebooks/${notebookId}/datasets/pasted`, '/api/calc'];
    for (const path of paths) {
      const signedOut = await h.raw.post(path).set('Origin', ORIGIN).set('Content-Type', 'application/json').send(malformed);
      assert.equal(signedOut.status, 401, path);
      assert.equal(signedOut.body.error.code, 'unauthenticated', path);
      const crossSite = await owner.client.post(path).set('Origin', 'https://elsewhere.example').set('Content-Type', 'application/json').send(malformed);
      assert.equal(crossSite.status, 403, path);
      assert.equal(crossSite.body.error.code, 'cross_site_request', path);
    }
    // signed in, from the app: the body is read and found malformed
    const read = await owner.client.post('/api/notebooks/import').set('Content-Type', 'application/json').send('{"title": ').expect(400);
    assert.equal(read.body.error.code, 'malformed_json');
  });

  test('an imported file is parsed and checked in the document pool; a field at fault is named as before', async () => {
    const { documents } = h.rungbook.services;
    const original = documents.importDocument;
    let pooled = 0;
    documents.importDocument = (text, person) => {
      pooled += 1;
      return original(text, person);
    };
    try {
      const target = await newNotebook('Invented pooled import');
      await owner.client.post(`/api/notebooks/${target}/datasets/pasted`).send({ ...description('lattice'), text: INVENTED_TABLE }).expect(201);
      const file = (await owner.client.get(`/api/notebooks/${target}/export.json`).expect(200)).text;
      const imported = (await owner.client.post('/api/notebooks/import').set('Content-Type', 'application/json').send(file).expect(201)).body.notebook as NotebookDetail;
      assert.deepEqual(imported.datasets.map((d) => d.contentHash), (await detail(target)).datasets.map((d) => d.contentHash));
      const refused = await owner.client.post('/api/notebooks/import').send({ ...JSON.parse(file), title: 7 }).expect(400);
      assert.equal(refused.body.error.code, 'validation_failed');
      assert.ok(refused.body.error.fields.title, JSON.stringify(refused.body));
      assert.equal(pooled, 2);
    } finally {
      documents.importDocument = original;
    }
  });

  test('the LaTeX export sends the document pool the datasets\' row counts, not their points', async () => {
    const target = await newNotebook('Invented LaTeX counts');
    await owner.client.post(`/api/notebooks/${target}/datasets/pasted`).send({ ...description('lattice'), text: INVENTED_TABLE }).expect(201);
    const add = (label: string, input: object) => owner.client.post(`/api/notebooks/${target}/cells`).send({ label, input }).expect(201);
    await add('setup', { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 20 });
    await add('scan', { kind: 'scan', uses: 'setup', from: '1.55', to: '1.95', points: 5, quantities: ['Delta_phi2'] });
    await add('cmp', { kind: 'comparison', uses: 'scan', dataset: 'lattice', kinks: false });
    const { documents } = h.rungbook.services;
    const original = documents.latex;
    const sent: string[] = [];
    documents.latex = (json, person) => {
      sent.push(json);
      return original(json, person);
    };
    try {
      const tex = (await owner.client.get(`/api/notebooks/${target}/export.tex`).expect(200)).text;
      const rows = INVENTED_TABLE.trim().split('\n').length - 1;
      assert.equal(sent.length, 1);
      const [dataset] = JSON.parse(sent[0]).datasets;
      assert.equal(dataset.points, undefined);
      assert.equal(dataset.rowCount, rows);
      assert.match(tex, new RegExp(`${rows} points`));
    } finally {
      documents.latex = original;
    }
  });

  test('run-all reads a dataset two comparison cells share once, in the document pool when it is over 100 kB', async () => {
    const target = await newNotebook('Invented shared dataset');
    const { points, json } = pointsOfLength(130_000);
    assert.ok(points.x.length <= DATASET_LIMITS.maxComparedPoints);
    await insertInventedDataset(h.rungbook.services.dataSource, { notebookId: target, label: 'shared', createdById: owner.id, points, json });
    const add = (label: string, input: object) => owner.client.post(`/api/notebooks/${target}/cells`).send({ label, input }).expect(201);
    await add('setup', { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 20 });
    await add('scan', { kind: 'scan', uses: 'setup', from: '1.55', to: '1.95', points: 5, quantities: ['Delta_phi2'] });
    // a narrow x-range: the jobs carry a few points, the dataset is read whole
    const range = { xFrom: points.x[0], xTo: points.x[40] };
    await add('cmp1', { kind: 'comparison', uses: 'scan', dataset: 'shared', kinks: false, ...range });
    await add('cmp2', { kind: 'comparison', uses: 'scan', dataset: 'shared', kinks: false, ...range });
    const { documents } = h.rungbook.services;
    const original = documents.datasetPointsInRange;
    let reads = 0;
    documents.datasetPointsInRange = (task, person) => {
      reads += 1;
      return original(task, person);
    };
    try {
      const reply = (await owner.client.post(`/api/notebooks/${target}/run-all`).expect(202)).body as RunAllReply;
      assert.deepEqual(reply.waiting, []);
      const started = (await detail(target)).cells.filter((cell) => cell.kind === 'comparison' && cell.lastRun);
      assert.deepEqual(started.map((cell) => cell.label).sort(), ['cmp1', 'cmp2']);
      assert.equal(reads, 1);
    } finally {
      documents.datasetPointsInRange = original;
    }
  });

  test(`a notebook's current datasets hold at most ${DATASET_LIMITS.maxNotebookBytes / 1024 / 1024} MB of points: one more is a 409, and so is an import over it`, async () => {
    const target = await newNotebook('Invented full points');
    const half = pointsOfLength(DATASET_LIMITS.maxNotebookBytes / 2 - 10);
    for (const label of ['first_half', 'second_half']) await insertInventedDataset(h.rungbook.services.dataSource, { notebookId: target, label, createdById: owner.id, ...half });
    const before = await datasetRows();
    // INVENTED_TABLE's points take more than the 20 characters left
    const refused = await owner.client.post(`/api/notebooks/${target}/datasets/pasted`).send({ ...description('one_more'), text: INVENTED_TABLE }).expect(409);
    assert.match(refused.body.error.message, /at most 10 MB of points/);
    assert.equal(await datasetRows(), before);
    // the same in an exchange file: the two halves and the small one do not fit one notebook
    const small = await newNotebook('Invented small');
    await owner.client.post(`/api/notebooks/${small}/datasets/pasted`).send({ ...description('one_more'), text: INVENTED_TABLE }).expect(201);
    const smallFile = JSON.parse((await owner.client.get(`/api/notebooks/${small}/export.json`).expect(200)).text);
    const file = JSON.parse((await owner.client.get(`/api/notebooks/${target}/export.json`).expect(200)).text);
    const over = await owner.client.post('/api/notebooks/import').send({ ...file, title: 'Invented over the cap', datasets: [...file.datasets, ...smallFile.datasets] });
    assert.equal(over.status, 409, JSON.stringify(over.body).slice(0, 500));
    assert.match(over.body.error.message, /at most 10 MB/);
  });

  test(`a notebook stores at most ${DATASET_LIMITS.maxStoredNotebookBytes / 1024 / 1024} MB of points with the removed datasets its versions hold`, async () => {
    const target = await newNotebook('Invented many removed');
    const removed = pointsOfLength(DATASET_LIMITS.maxStoredNotebookBytes / 6 - 5);
    for (let i = 0; i < 6; i += 1) await insertInventedDataset(h.rungbook.services.dataSource, { notebookId: target, label: `old${i}`, createdById: owner.id, ...removed, removed: true });
    const before = await datasetRows();
    const refused = await owner.client.post(`/api/notebooks/${target}/datasets/pasted`).send({ ...description('new'), text: INVENTED_TABLE }).expect(409);
    assert.match(refused.body.error.message, /keeps earlier datasets for its versions/);
    assert.equal(await datasetRows(), before);
  });

  test('/api/calc takes kinks and compare jobs; a bad kinks job fails with the job error', async () => {
    // y = |x − 1/2| sampled on a grid: a kink at x = 1/2 by construction
    const grid = Array.from({ length: 41 }, (_v, i) => i / 40);
    const kinks = { job: 'kinks', points: grid.map((x) => [x.toFixed(3), Math.abs(x - 0.5).toFixed(3)]), resamples: 20 };
    const run = (await owner.client.post('/api/calc').send({ job: kinks }).expect(200)).body.run as RunView;
    assert.equal(run.status, 'done', JSON.stringify(run));
    const found = (run.result as { kinks: { x: string }[] }).kinks;
    assert.ok(found.length >= 1 && Math.abs(Number(found[0].x) - 0.5) < 0.05, JSON.stringify(found));

    const data = { xAxis: 's', x: ['1.6', '1.7', '1.8'], y: ['1.42', '1.45', '1.49'] };
    const compare = { job: 'compare', model: { preset: 'on', N: 1 }, loops: 2, digits: 20, d: '3', s: { from: '1.55', to: '1.95', points: 5 }, quantity: 'Delta_phi2', data };
    const compared = (await owner.client.post('/api/calc').send({ job: compare }).expect(200)).body.run as RunView;
    assert.equal(compared.status, 'done', JSON.stringify(compared));
    assert.ok(CompareResult.safeParse(compared.result).success);

    const bad = (await owner.client.post('/api/calc').send({ job: { job: 'kinks', points: kinks.points.slice(0, 3) } }).expect(200)).body.run as RunView;
    assert.equal(bad.status, 'failed');
    assert.match(JSON.stringify(bad.error), new RegExp(`at least ${DATASET_LIMITS.minKinkPoints} points`));
  });

  test('/api/calc runs a kinks job of 5 000 points of 20-character decimals (over the 100 kB of other JSON bodies)', async () => {
    const long = { job: 'kinks', points: Array.from({ length: DATASET_LIMITS.maxComparedPoints }, (_v, i) => [(1 + i / 1e4).toFixed(18), (2 + Math.abs(i - 2500) / 1e4).toFixed(18)]), resamples: 20, seed: 3 };
    assert.ok(JSON.stringify({ job: long }).length > 200 * 1024);
    const accepted = await owner.client.post('/api/calc').send({ job: long });
    assert.equal(accepted.status, 200, JSON.stringify(accepted.body).slice(0, 300));
    assert.equal(accepted.body.run.status, 'done', JSON.stringify(accepted.body.run).slice(0, 300));
  });
});

describe('configured body limits: IMPORT_BODY_LIMIT, PASTED_BODY_LIMIT, CALC_BODY_LIMIT', () => {
  let h: Harness | undefined;
  after(() => h?.close());

  test('each large-body route refuses a body over its configured limit with 413', async () => {
    h = await startHarness({ IMPORT_BODY_LIMIT: '64kb', PASTED_BODY_LIMIT: '16kb', CALC_BODY_LIMIT: '8kb' });
    const owner = await createPerson(h, { tag: 'owner' });
    const notebookId = (await owner.client.post('/api/notebooks').send({ title: 'Invented limits', summary: '' }).expect(201)).body.notebook.id;
    const over = (kb: number) => `"${'x'.repeat(kb * 1024)}"`;
    const bodies: [string, string][] = [
      ['/api/notebooks/import', over(65)],
      [`/api/notebooks/${notebookId}/datasets/pasted`, over(17)],
      ['/api/calc', over(9)],
    ];
    for (const [path, body] of bodies) {
      const reply = await owner.client.post(path).set('Content-Type', 'application/json').send(body);
      assert.equal(reply.status, 413, path);
      assert.equal(reply.body.error.code, 'payload_too_large', path);
    }
    // under the limit the import is read (and found to be no notebook file)
    const under = await owner.client.post('/api/notebooks/import').set('Content-Type', 'application/json').send(`{"title":${over(40)}}`).expect(400);
    assert.equal(under.body.error.code, 'validation_failed');
  });
});

describe('uploads being read: one per person, UPLOADS_IN_FLIGHT server-wide, refused by declared size before reading', () => {
  let h: Harness | undefined;
  let server: http.Server | undefined;
  after(async () => {
    server?.closeAllConnections();
    server?.close();
    await h?.close();
  });

  test('while one upload is read, the same person and (over the cap) others get 429 queue_full; afterwards both upload; a form declared too large is refused unread', { timeout: 60_000 }, async () => {
    h = await startHarness({ UPLOADS_IN_FLIGHT: '1', SIGNIN_LIMIT_PER_IP: '100000', DATASET_UPLOAD_LIMIT_PER_USER: '100000' });
    server = await listen(h);
    const { port } = server.address() as AddressInfo;
    const uploads = h.rungbook.app.locals.uploads as UploadGate;
    const owner = await createPerson(h, { tag: 'owner' });
    const other = await createPerson(h, { tag: 'other' });
    const notebookId = (await owner.client.post('/api/notebooks').send({ title: 'Invented busy uploads', summary: '' }).expect(201)).body.notebook.id;
    const otherNotebookId = (await other.client.post('/api/notebooks').send({ title: 'Invented other uploads', summary: '' }).expect(201)).body.notebook.id;

    // larger than the declared maximum: refused before a byte of the body is sent
    const tooLarge = heldUpload(port, await sessionCookie(h, owner), notebookId, Buffer.alloc(0), DATASET_LIMITS.maxFileBytes + FORM_OVERHEAD_BYTES + 1);
    const refused = await tooLarge.reply;
    tooLarge.abort();
    assert.equal(refused.status, 413);
    assert.equal(refused.body.error?.code, 'payload_too_large');

    const held = heldUpload(port, await sessionCookie(h, owner), notebookId, multipartBody(description('held'), INVENTED_TABLE));
    await until(() => uploads.inFlight === 1, 'the held upload is being read');
    const same = await upload(owner.client, notebookId, description('second'), INVENTED_TABLE).expect(429);
    assert.equal(same.body.error.code, 'queue_full');
    assert.match(same.body.error.message, /already uploading/);
    const busy = await upload(other.client, otherNotebookId, description('other'), INVENTED_TABLE).expect(429);
    assert.equal(busy.body.error.code, 'queue_full');
    assert.match(busy.body.error.message, /busy reading other uploads/);

    held.finish();
    const stored = await held.reply;
    assert.equal(stored.status, 201, JSON.stringify(stored.body));
    assert.equal(stored.body.dataset?.label, 'held');
    await upload(owner.client, notebookId, description('second'), INVENTED_TABLE).expect(201);
    await upload(other.client, otherNotebookId, description('other'), INVENTED_TABLE).expect(201);
    assert.equal(uploads.inFlight, 0);
  });
});

describe('dataset uploads per person per hour', () => {
  let h: Harness | undefined;
  after(() => h?.close());

  test('beyond DATASET_UPLOAD_LIMIT_PER_USER the upload gets 429 and nothing is stored', { timeout: 60_000 }, async () => {
    h = await startHarness({ DATASET_UPLOAD_LIMIT_PER_USER: '2' });
    const owner = await createPerson(h, { tag: 'owner' });
    const notebookId = (await owner.client.post('/api/notebooks').send({ title: 'Invented limit', summary: '' }).expect(201)).body.notebook.id;
    await upload(owner.client, notebookId, description('first'), INVENTED_TABLE).expect(201);
    await owner.client.post(`/api/notebooks/${notebookId}/datasets/pasted`).send({ ...description('second'), text: INVENTED_TABLE }).expect(201);
    const refused = await upload(owner.client, notebookId, description('third'), INVENTED_TABLE).expect(429);
    assert.equal(refused.body.error.code, 'rate_limited');
    assert.match(refused.body.error.message, /at most 2 dataset uploads per hour/);
    assert.equal(await h.rungbook.services.dataSource.getRepository(Dataset).count(), 2);
    // the quota is checked before the file is read: the answer comes while the body is held back
    const server = await listen(h);
    try {
      const held = heldUpload((server.address() as AddressInfo).port, await sessionCookie(h, owner), notebookId, multipartBody(description('fourth'), INVENTED_TABLE));
      const early = await held.reply;
      held.abort();
      assert.equal(early.status, 429);
      assert.equal(early.body.error?.code, 'rate_limited');
    } finally {
      server.closeAllConnections();
      server.close();
    }
  });
});
