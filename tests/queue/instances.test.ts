import assert from 'node:assert/strict';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { after, before, describe, test } from 'node:test';
import { pino } from 'pino';
import supertest from 'supertest';
import { startRedis, type RunningRedis } from '../../scripts/services/redis';
import { startRungbook, type RunningRungbook } from '../../server/boot';
import { loadConfig } from '../../server/config';
import type { NotebookDetail } from '../../shared/notebook/api';
import { ORIGIN, type Harness } from '../api/harness';
import { createPerson, type TestPerson } from '../api/people';
import { JobRun } from '../../server/db/entities';
import { newId } from '../../server/ids';
import { openEventStream, type EventStreamClient } from './eventStream';
import { slowScanJob } from './processes';

const setupCell = { label: 'setup', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.5', loops: 2, digits: 20 } };

interface Instance {
  rungbook: RunningRungbook;
  port: number;
}

describe('two server instances on one database file and one Redis', () => {
  let redis: RunningRedis;
  let dir: string;
  const instances: Instance[] = [];
  const streams: EventStreamClient[] = [];
  let owner: TestPerson;
  let notebook: NotebookDetail;

  async function startInstance(): Promise<Instance> {
    const config = loadConfig({
      DATABASE_PATH: path.join(dir, 'shared.sqlite'), JOB_QUEUE_URL: redis.url, PORT: '0', SMTP_PORT: '0', PUBLIC_URL: ORIGIN, WEB_ROOT: dir, SEED_DEMO_DATA: 'false',
    });
    const rungbook = await startRungbook(config, pino({ level: 'silent' }), { listen: true });
    const instance: Instance = { rungbook, port: rungbook.port! };
    instances.push(instance);
    return instance;
  }

  const asHarness = (instance: Instance) => ({ rungbook: instance.rungbook, browser: () => supertest.agent(instance.rungbook.app).set('Origin', ORIGIN) }) as unknown as Harness;
  const cookieOn = async (instance: Instance, person: TestPerson) => (await instance.rungbook.services.sessions.start(person.id)).split(';')[0];

  before(async () => {
    redis = await startRedis();
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-instances-'));
    const first = await startInstance();
    await startInstance();
    owner = await createPerson(asHarness(first));
    notebook = (await owner.client.post('/api/notebooks').send({ title: 'Seen from two servers' }).expect(201)).body.notebook;
  });

  after(async () => {
    streams.forEach((stream) => stream.close());
    for (const { rungbook } of instances) await rungbook.stop();
    fs.rmSync(dir, { recursive: true, force: true });
    await redis.stop();
  });

  test('a change written through one server reaches an event-stream client of the other', async () => {
    const [first, second] = instances;
    const stream = await openEventStream(second.port, `/api/notebooks/${notebook.id}/events`, await cookieOn(second, owner));
    streams.push(stream);
    assert.equal(stream.status, 200);
    await stream.next('hello');
    const readOnSecond = async () => (await supertest(second.rungbook.app).get(`/api/notebooks/${notebook.id}`).set('Cookie', await cookieOn(second, owner)).expect(200)).body.notebook as NotebookDetail;
    assert.deepEqual((await readOnSecond()).cells, []);
    // owner's client talks to the first server
    await owner.client.post(`/api/notebooks/${notebook.id}/cells`).send(setupCell).expect(201);
    const changed = await stream.next('changed');
    assert.equal(changed.actorId, owner.id);
    assert.equal(first.rungbook.services.live.openStreams(), 0, 'the stream is held by the second server only');
    // the second server's cached copy (read above) was dropped: it serves the new cell
    assert.deepEqual((await readOnSecond()).cells.map((cell) => cell.label), ['setup']);
  });

  test('presenting through one server is followed by a client of the other', async () => {
    const [, second] = instances;
    const stream = await openEventStream(second.port, `/api/notebooks/${notebook.id}/events`, await cookieOn(second, owner));
    streams.push(stream);
    await stream.next('hello');
    const cells = ((await owner.client.get(`/api/notebooks/${notebook.id}`).expect(200)).body.notebook as NotebookDetail).cells;
    // the first server accepts because the owner has the notebook open on the second one
    const reply = (await owner.client.post(`/api/notebooks/${notebook.id}/presentation`).send({ cellId: cells[0].id }).expect(200)).body.presenter;
    const followed = await stream.next('presenter');
    assert.deepEqual(followed.presenter, reply);
  });

  test('a run started through one server is cancelled through the other, and its own server lets it go', async () => {
    const [first, second] = instances;
    // no worker serves this queue: the job waits in it until cancelled
    const submitted = await first.rungbook.services.runs.submit({ job: slowScanJob('0.9'), userId: owner.id });
    assert.equal(submitted.status, 'queued');
    const cancelled = await second.rungbook.services.runs.cancel(submitted.id);
    assert.equal(cancelled.status, 'cancelled');
    const seenByItsServer = await first.rungbook.services.runs.settle(submitted.id, 30_000);
    assert.equal(seenByItsServer.status, 'cancelled');
    assert.equal((JSON.parse(seenByItsServer.errorJson!) as { code: string }).code, 'cancelled');
  });

  test('health names the shared queue, and is degraded while no worker serves it', async () => {
    const health = (await supertest(instances[0].rungbook.app).get('/api/health').expect(200)).body;
    assert.equal(health.queue, 'ok');
    assert.equal(health.workers, 0);
    assert.equal(health.status, 'degraded');
  });

  test('a run whose server stopped for good is reported interrupted once it is older than any run can last', async () => {
    const [, second] = instances;
    // the defaults allow 600 s of waiting on the server, 600 s in the shared queue and 120 s of engine time: a day is past all of them
    const aDayAgo = new Date(Date.now() - 24 * 3600 * 1000);
    const id = newId();
    await second.rungbook.services.dataSource.getRepository(JobRun).insert({ id, inputHash: newId(), engineVersion: 'test', jobJson: '{}', status: 'running', progress: 0.5, cached: false, cellId: null, requestedBy: owner.id, startedAt: aDayAgo, createdAt: aDayAgo });
    const run = await second.rungbook.services.runs.find(id);
    assert.equal(run.status, 'failed');
    assert.equal((JSON.parse(run.errorJson!) as { code: string }).code, 'interrupted');
  });
});
