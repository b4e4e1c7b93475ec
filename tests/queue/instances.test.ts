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
import { connectSharedState, sharedStateOf, type SharedState } from '../../server/jobs/sharedState';
import type { NotebookDetail } from '../../shared/notebook/api';
import { ORIGIN, type Harness } from '../api/harness';
import { createPerson, type TestPerson } from '../api/people';
import { openEventStream, type EventStreamClient } from './eventStream';

const setupCell = { label: 'setup', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.5', loops: 2, digits: 20 } };

interface Instance {
  rungbook: RunningRungbook;
  port: number;
  /** Set when this test connected the shared state itself (a start-up that does not do so yet). */
  shared?: SharedState;
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
    const logger = pino({ level: 'silent' });
    const rungbook = await startRungbook(config, logger, { listen: true });
    const instance: Instance = { rungbook, port: rungbook.port! };
    if (!sharedStateOf(rungbook.services)) {
      instance.shared = await connectSharedState(config, logger);
      instance.shared.attach(rungbook.services);
    }
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
    for (const { rungbook, shared } of instances) {
      await rungbook.stop();
      await shared?.runner.close();
      await shared?.close();
    }
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
});
