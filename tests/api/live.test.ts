import assert from 'node:assert/strict';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { after, before, describe, test } from 'node:test';
import type { LiveEvent, NotebookRole } from '../../shared/notebook/sharing';
import type { NotebookDetail } from '../../shared/notebook/api';
import pino from 'pino';
import { sha256Hex } from '../../server/auth/linkTokens';
import { Cell, NotebookMember, ShareLink } from '../../server/db/entities';
import { newId } from '../../server/ids';
import { createLiveHub, type LinkHolder, type LiveHub, type LiveStream } from '../../server/services/live';
import { AppError } from '../../server/http/errors';
import { ORIGIN, startHarness, type Harness } from './harness';
import { createPerson, joinGroup, type TestPerson } from './people';

/** What a browser's EventSource would read: named events, each with JSON data. */
interface OpenStream {
  status: number;
  contentType: string;
  /** The next event of this type not read yet (events of other types are kept for later calls). */
  next<T extends LiveEvent['type']>(type: T): Promise<Extract<LiveEvent, { type: T }>>;
  /** Resolves when the server ends the stream. */
  ended: Promise<void>;
  retry: number | null;
  close(): void;
}

const setupInput = { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.5', loops: 2, digits: 20 };
const bubbleInput = { kind: 'integral', uses: 'setup', form: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1 };
// Generous: a safety net so a missing event fails the test instead of hanging it, not a timing assertion.
const EVENT_WAIT_MS = 15_000;

describe('live notebook streams', () => {
  let h: Harness;
  let server: http.Server;
  let port: number;
  let owner: TestPerson;
  let editor: TestPerson;
  let stranger: TestPerson;
  let notebookId: string;
  let cookies: Map<string, string>;
  const opened: OpenStream[] = [];

  async function cookieOf(person: TestPerson): Promise<string> {
    const setCookie = await h.rungbook.services.sessions.start(person.id);
    return setCookie.split(';')[0];
  }

  function openStream(path: string, cookie: string | null): Promise<OpenStream> {
    return new Promise((resolve, reject) => {
      const req = http.get({ host: '127.0.0.1', port, path, headers: { Accept: 'text/event-stream', ...(cookie ? { Cookie: cookie } : {}) } }, (res) => {
        const queue: LiveEvent[] = [];
        const waiting: { type: string; resolve: (event: LiveEvent) => void }[] = [];
        let buffer = '';
        let retry: number | null = null;
        let endedResolve!: () => void;
        const ended = new Promise<void>((r) => (endedResolve = r));
        const deliver = () => {
          for (let i = 0; i < waiting.length; ) {
            const index = queue.findIndex((event) => event.type === waiting[i].type);
            if (index < 0) {
              i += 1;
              continue;
            }
            const [event] = queue.splice(index, 1);
            waiting.splice(i, 1)[0].resolve(event);
          }
        };
        res.setEncoding('utf8');
        res.on('data', (chunk: string) => {
          buffer += chunk;
          for (let end = buffer.indexOf('\n\n'); end >= 0; end = buffer.indexOf('\n\n')) {
            const block = buffer.slice(0, end);
            buffer = buffer.slice(end + 2);
            const fields = new Map<string, string>();
            for (const line of block.split('\n')) {
              if (line.startsWith(':')) continue;
              const colon = line.indexOf(':');
              fields.set(line.slice(0, colon), line.slice(colon + 1).trimStart());
            }
            if (fields.has('retry')) retry = Number(fields.get('retry'));
            if (!fields.has('event')) continue;
            const event = JSON.parse(fields.get('data')!) as LiveEvent;
            assert.equal(event.type, fields.get('event'), 'the event name is the type of its data');
            queue.push(event);
          }
          deliver();
        });
        res.on('end', endedResolve);
        res.on('close', endedResolve);
        const stream: OpenStream = {
          status: res.statusCode ?? 0,
          contentType: String(res.headers['content-type'] ?? ''),
          next: (type) =>
            new Promise((resolveEvent, rejectEvent) => {
              const timer = setTimeout(() => rejectEvent(new Error(`no "${type}" event arrived`)), EVENT_WAIT_MS);
              waiting.push({ type, resolve: (event) => (clearTimeout(timer), resolveEvent(event as never)) });
              deliver();
            }),
          ended,
          get retry() {
            return retry;
          },
          close: () => req.destroy(),
        };
        opened.push(stream);
        if (res.statusCode !== 200) res.resume();
        resolve(stream);
      });
      req.on('error', (error) => {
        if ((error as NodeJS.ErrnoException).code !== 'ECONNRESET') reject(error);
      });
    });
  }

  const eventsPath = (id: string) => `/api/notebooks/${id}/events`;

  async function grant(person: TestPerson, role: NotebookRole) {
    const members = h.rungbook.services.dataSource.getRepository(NotebookMember);
    await members.delete({ notebookId, userId: person.id });
    await members.insert({ id: newId(), notebookId, userId: person.id, groupId: null, role: role as 'editor', grantedById: owner.id });
    h.rungbook.services.events.accessChanged({ notebookId });
  }

  before(async () => {
    h = await startHarness();
    server = http.createServer(h.rungbook.app);
    await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
    port = (server.address() as AddressInfo).port;
    owner = await createPerson(h, { tag: 'owner' });
    editor = await createPerson(h, { tag: 'editor' });
    stranger = await createPerson(h, { tag: 'stranger' });
    cookies = new Map([[owner.id, await cookieOf(owner)], [editor.id, await cookieOf(editor)], [stranger.id, await cookieOf(stranger)]]);
    const created = (await owner.client.post('/api/notebooks').send({ title: 'Invented live notebook', summary: '' }).expect(201)).body.notebook as NotebookDetail;
    notebookId = created.id;
    await owner.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'setup', input: setupInput }).expect(201);
    await grant(editor, 'editor');
  });
  after(async () => {
    for (const stream of opened) stream.close();
    h.rungbook.services.live.closeAll();
    server.closeAllConnections();
    await new Promise<void>((resolve) => server.close(() => resolve()));
    await h.close();
  });

  test('a stream opens with retry, hello (role, viewers, presenter) as named server-sent events', async () => {
    const stream = await openStream(eventsPath(notebookId), cookies.get(owner.id)!);
    assert.equal(stream.status, 200);
    assert.match(stream.contentType, /^text\/event-stream/);
    const hello = await stream.next('hello');
    assert.equal(stream.retry, 3000);
    assert.equal(hello.role, 'owner');
    assert.deepEqual(hello.viewers.map((v) => v.userId), [owner.id]);
    assert.equal(hello.presenter, null);
    stream.close();
    await stream.ended;
  });

  test('signed out is 401, someone without a role gets 404 as for a missing notebook, and no stream opens', async () => {
    const signedOut = await openStream(eventsPath(notebookId), null);
    assert.equal(signedOut.status, 401);
    const unrelated = await openStream(eventsPath(notebookId), cookies.get(stranger.id)!);
    assert.equal(unrelated.status, 404);
    const missing = await openStream(eventsPath('nosuchnotebook000'), cookies.get(owner.id)!);
    assert.equal(missing.status, 404);
  });

  test('a change by one person reaches the other\'s open stream; presence lists both, once per person', async () => {
    const mine = await openStream(eventsPath(notebookId), cookies.get(owner.id)!);
    await mine.next('hello');
    const theirs = await openStream(eventsPath(notebookId), cookies.get(editor.id)!);
    const hello = await theirs.next('hello');
    assert.deepEqual(new Set(hello.viewers.map((v) => v.userId)), new Set([owner.id, editor.id]));
    const presence = await mine.next('presence');
    assert.deepEqual(new Set(presence.viewers.map((v) => v.userId)), new Set([owner.id, editor.id]));

    // a second tab of the same person changes nothing in the list
    const secondTab = await openStream(eventsPath(notebookId), cookies.get(editor.id)!);
    const secondHello = await secondTab.next('hello');
    assert.equal(secondHello.viewers.length, 2);

    const reply = (await owner.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'note', input: { kind: 'note', text: 'An invented note.' } }).expect(201)).body.notebook as NotebookDetail;
    const added = reply.cells.find((c) => c.label === 'note')!;
    const changed = await theirs.next('changed');
    assert.deepEqual(changed, { type: 'changed', kind: 'cell-added', actorId: owner.id, actorName: 'Invented owner', cellId: added.id, comments: false });
    assert.equal((await secondTab.next('changed')).cellId, added.id, 'every tab hears it');

    secondTab.close();
    await secondTab.ended;
    theirs.close();
    const left = await mine.next('presence');
    assert.deepEqual(left.viewers.map((v) => v.userId), [owner.id], 'the editor left once their last tab closed');
    mine.close();
  });

  test('a finished run is announced to everyone looking, without an actor', async () => {
    const watching = await openStream(eventsPath(notebookId), cookies.get(editor.id)!);
    await watching.next('hello');
    const detail = (await owner.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'bubble', input: bubbleInput }).expect(201)).body.notebook as NotebookDetail;
    const bubble = detail.cells.find((c) => c.label === 'bubble')!;
    assert.equal((await watching.next('changed')).kind, 'cell-added');
    await owner.client.post(`/api/notebooks/${notebookId}/cells/${bubble.id}/run`).expect(202);
    // the start (by the owner) and the end (by nobody) may arrive in either order when the engine is quick
    const both = [await watching.next('changed'), await watching.next('changed')].map((e) => [e.kind, e.actorId, e.cellId]);
    assert.deepEqual(new Set(both.map((e) => JSON.stringify(e))), new Set([JSON.stringify(['cell-run', owner.id, bubble.id]), JSON.stringify(['cell-run', null, bubble.id])]));
    const after = (await editor.client.get(`/api/notebooks/${notebookId}`).expect(200)).body.notebook as NotebookDetail;
    assert.equal(after.cells.find((c) => c.id === bubble.id)?.lastRun?.status, 'done', 'the refetch the event asks for shows the result');
    watching.close();
  });

  test('the presenter\'s cell reaches a follower; others cannot present; the state ends with the presenter\'s last stream', async () => {
    const cells = ((await owner.client.get(`/api/notebooks/${notebookId}`).expect(200)).body.notebook as NotebookDetail).cells;
    // presenting follows the page one has open
    await owner.client.post(`/api/notebooks/${notebookId}/presentation`).send({ cellId: cells[0].id }).expect(409);

    const presenting = await openStream(eventsPath(notebookId), cookies.get(owner.id)!);
    await presenting.next('hello');
    const follower = await openStream(eventsPath(notebookId), cookies.get(editor.id)!);
    await follower.next('hello');
    const reply = (await owner.client.post(`/api/notebooks/${notebookId}/presentation`).send({ cellId: cells[0].id }).expect(200)).body.presenter;
    const first = await follower.next('presenter');
    assert.deepEqual(first.presenter, reply);
    assert.deepEqual([first.presenter?.userId, first.presenter?.cellId], [owner.id, cells[0].id]);
    const presence = await follower.next('presence');
    assert.equal(presence.viewers.find((v) => v.userId === owner.id)?.presenting, true);

    await owner.client.post(`/api/notebooks/${notebookId}/presentation`).send({ cellId: cells[1].id }).expect(200);
    const moved = await follower.next('presenter');
    assert.equal(moved.presenter?.cellId, cells[1].id);
    assert.equal(moved.presenter?.since, first.presenter?.since, 'still the same presentation');

    // a cell of no notebook of theirs, and a stranger
    await owner.client.post(`/api/notebooks/${notebookId}/presentation`).send({ cellId: 'nosuchcell0000' }).expect(404);
    await stranger.client.post(`/api/notebooks/${notebookId}/presentation`).send({ cellId: null }).expect(404);

    // someone who joins later learns who presents in the hello
    const late = await openStream(eventsPath(notebookId), cookies.get(editor.id)!);
    assert.equal((await late.next('hello')).presenter?.cellId, cells[1].id);
    late.close();

    presenting.close();
    const ended = await follower.next('presenter');
    assert.equal(ended.presenter, null);
    assert.equal(h.rungbook.services.live.presenter(notebookId), null);
    follower.close();
  });

  test('stopping: the presenter or another editor may, a viewer may not', async () => {
    const presenting = await openStream(eventsPath(notebookId), cookies.get(owner.id)!);
    await presenting.next('hello');
    await owner.client.post(`/api/notebooks/${notebookId}/presentation`).send({ cellId: null }).expect(200);
    assert.equal((await presenting.next('presenter')).presenter?.userId, owner.id);
    const viewer = await createPerson(h, { tag: 'viewer' });
    const members = h.rungbook.services.dataSource.getRepository(NotebookMember);
    await members.insert({ id: newId(), notebookId, userId: viewer.id, groupId: null, role: 'viewer', grantedById: owner.id });
    const refused = await viewer.client.delete(`/api/notebooks/${notebookId}/presentation`).expect(403);
    assert.match(refused.body.error.message, /viewer/);
    await viewer.client.post(`/api/notebooks/${notebookId}/presentation`).send({ cellId: null }).expect(403);
    await editor.client.delete(`/api/notebooks/${notebookId}/presentation`).expect(204);
    assert.equal((await presenting.next('presenter')).presenter, null);
    presenting.close();
  });

  test('a role change reaches an open stream at once: downgraded to viewer, then edits are refused; removed, then revoked and closed', async () => {
    const stream = await openStream(eventsPath(notebookId), cookies.get(editor.id)!);
    assert.equal((await stream.next('hello')).role, 'editor');

    await grant(editor, 'viewer');
    assert.equal((await stream.next('role')).role, 'viewer');
    const setup = await h.rungbook.services.dataSource.getRepository(Cell).findOneByOrFail({ notebookId, label: 'setup' });
    const refused = await editor.client
      .patch(`/api/notebooks/${notebookId}/cells/${setup.id}`)
      .send({ input: { ...setupInput, digits: 25 }, revision: setup.revision })
      .expect(403);
    assert.equal(refused.body.error.code, 'forbidden');
    const unchanged = await h.rungbook.services.dataSource.getRepository(Cell).findOneByOrFail({ id: setup.id });
    assert.deepEqual([unchanged.revision, unchanged.inputJson], [setup.revision, setup.inputJson], 'the cell is unchanged');

    await h.rungbook.services.dataSource.getRepository(NotebookMember).delete({ notebookId, userId: editor.id });
    h.rungbook.services.events.accessChanged({ notebookId });
    await stream.next('revoked');
    await stream.ended;
    await grant(editor, 'editor');
  });

  test('a change of one person\'s access anywhere (e.g. leaving a group) re-checks only their streams', async () => {
    const theirs = await openStream(eventsPath(notebookId), cookies.get(editor.id)!);
    await theirs.next('hello');
    await h.rungbook.services.dataSource.getRepository(NotebookMember).update({ notebookId, userId: editor.id }, { role: 'commenter' });
    h.rungbook.services.events.accessChanged({ userId: editor.id });
    assert.equal((await theirs.next('role')).role, 'commenter');
    theirs.close();
    await grant(editor, 'editor');
  });

  test('at most 10 open streams per person: the 11th is 429 until one closes', async () => {
    const streams: OpenStream[] = [];
    for (let i = 0; i < 10; i += 1) {
      const stream = await openStream(eventsPath(notebookId), cookies.get(owner.id)!);
      assert.equal(stream.status, 200);
      await stream.next('hello');
      streams.push(stream);
    }
    const refused = await openStream(eventsPath(notebookId), cookies.get(owner.id)!);
    assert.equal(refused.status, 429);
    const others = await openStream(eventsPath(notebookId), cookies.get(editor.id)!);
    assert.equal(others.status, 200, 'the limit is per person');
    others.close();
    streams[0].close();
    await streams[0].ended;
    // the server notices the close when the socket ends; wait for the count to drop, then try again
    for (let i = 0; i < 200 && h.rungbook.services.live.openStreams() > 9; i += 1) await new Promise((resolve) => setTimeout(resolve, 10));
    const again = await openStream(eventsPath(notebookId), cookies.get(owner.id)!);
    assert.equal(again.status, 200);
    for (const stream of [...streams, again]) stream.close();
  });

  test('closeAll ends every open stream (server shutdown)', async () => {
    const a = await openStream(eventsPath(notebookId), cookies.get(owner.id)!);
    const b = await openStream(eventsPath(notebookId), cookies.get(editor.id)!);
    await a.next('hello');
    await b.next('hello');
    h.rungbook.services.live.closeAll();
    await Promise.all([a.ended, b.ended]);
    for (let i = 0; i < 200 && h.rungbook.services.live.openStreams() > 0; i += 1) await new Promise((resolve) => setTimeout(resolve, 10));
    assert.equal(h.rungbook.services.live.openStreams(), 0);
  });

  test('a share-link holder gets a read-only stream that says what changed but not who changed it', async () => {
    const created = await owner.client.post(`/api/notebooks/${notebookId}/links`).send({ role: 'viewer' }).expect(201);
    const token = created.body.token as string;
    const stream = await openStream(`/api/shared/${token}/events`, null);
    assert.equal(stream.status, 200);
    const hello = await stream.next('hello');
    assert.equal(hello.role, 'viewer');
    assert.deepEqual(hello.viewers, [], 'who else is looking is for people with a role');
    await owner.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'note2', input: { kind: 'note', text: 'Another invented note.' } }).expect(201);
    const changed = await stream.next('changed');
    assert.deepEqual([changed.kind, changed.actorId, changed.actorName], ['cell-added', null, null]);
    stream.close();
    const unknown = await openStream(`/api/shared/${'x'.repeat(43)}/events`, null);
    assert.equal(unknown.status, 404);
  });

  /** The server notices closed sockets a little later; wait (bounded) until no stream is counted. */
  async function noStreamsOpen() {
    for (let i = 0; i < 500 && h.rungbook.services.live.openStreams() > 0; i += 1) await new Promise((resolve) => setTimeout(resolve, 10));
    assert.equal(h.rungbook.services.live.openStreams(), 0);
  }

  test('an editor removed from the notebook: the stream through the link they made is revoked and closed', async () => {
    const maker = await createPerson(h, { tag: 'link-maker' });
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ email: maker.email, role: 'editor' }).expect(200);
    const token = (await maker.client.post(`/api/notebooks/${notebookId}/links`).send({ role: 'commenter' }).expect(201)).body.token as string;
    const stream = await openStream(`/api/shared/${token}/events`, null);
    assert.equal((await stream.next('hello')).role, 'commenter');
    const members = (await owner.client.get(`/api/notebooks/${notebookId}/members`).expect(200)).body.members as { id: string; subjectId: string }[];
    await owner.client.delete(`/api/notebooks/${notebookId}/members/${members.find((m) => m.subjectId === maker.id)!.id}`).expect(200);
    await stream.next('revoked');
    await stream.ended;
    assert.equal((await openStream(`/api/shared/${token}/events`, null)).status, 404);
  });

  test('at most 10 signed-out link streams per network address; a signed-in holder counts as a person instead', async () => {
    await noStreamsOpen();
    const token = (await owner.client.post(`/api/notebooks/${notebookId}/links`).send({ role: 'viewer' }).expect(201)).body.token as string;
    const held: OpenStream[] = [];
    for (let i = 0; i < 10; i += 1) {
      const stream = await openStream(`/api/shared/${token}/events`, null);
      assert.equal(stream.status, 200);
      held.push(stream);
    }
    const refused = await openStream(`/api/shared/${token}/events`, null);
    assert.equal(refused.status, 429);
    const signedIn = await openStream(`/api/shared/${token}/events`, cookies.get(stranger.id)!);
    assert.equal(signedIn.status, 200, 'from the same address, but counted per person');
    for (const stream of [...held, signedIn]) stream.close();
    await noStreamsOpen();
  });
});

/** A stream as the hub feeds it, recording what it is sent (the HTTP layer is not what is tested here). */
function recordingStream() {
  const events: LiveEvent[] = [];
  const waiting: { until: () => boolean; resolve: () => void }[] = [];
  const closeListeners: (() => void)[] = [];
  let pings = 0;
  let closed = false;
  const settle = () => {
    for (const waiter of [...waiting]) if (waiter.until()) waiting.splice(waiting.indexOf(waiter), 1)[0].resolve();
  };
  const waitFor = (until: () => boolean, what: string) =>
    new Promise<void>((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error(`${what} did not happen`)), EVENT_WAIT_MS);
      waiting.push({ until, resolve: () => (clearTimeout(timer), resolve()) });
      settle();
    });
  const stream: LiveStream = {
    send: (_event, data) => (events.push(data as LiveEvent), settle()),
    comment: () => ((pings += 1), settle()),
    close() {
      if (closed) return;
      closed = true;
      for (const listener of closeListeners) listener();
      settle();
    },
    onClose: (listener) => closeListeners.push(listener),
    get closed() {
      return closed;
    },
  };
  return {
    stream,
    types: () => events.map((event) => event.type),
    pings: () => pings,
    event: (type: LiveEvent['type']) => waitFor(() => events.some((event) => event.type === type), `a "${type}" event`),
    closedNow: () => waitFor(() => closed, 'closing the stream'),
    pingsReach: (count: number) => waitFor(() => pings >= count, `${count} heartbeats`),
  };
}

describe('live streams are checked again at every heartbeat: sessions and share links', () => {
  let h: Harness;
  let hub: LiveHub;
  let owner: TestPerson;
  let notebookId: string;

  before(async () => {
    h = await startHarness();
    const { notebooks, events, sessions, sharing } = h.rungbook.services;
    // a fast heartbeat so the checks come soon; the tests wait for events, never for an amount of time
    hub = createLiveHub({ notebooks, events, sessions, logger: pino({ level: 'silent' }), resolveLink: (token) => sharing.resolveLink(token), limits: { heartbeatMs: 50 } });
    owner = await createPerson(h, { tag: 'owner' });
    notebookId = ((await owner.client.post('/api/notebooks').send({ title: 'Invented heartbeat notebook', summary: '' }).expect(201)).body.notebook as NotebookDetail).id;
  });
  after(async () => {
    hub.closeAll();
    await h.close();
  });

  /** A fresh session of the person, as signing in in another browser gives: its cookie, id and user. */
  async function session(person: TestPerson) {
    const cookie = (await h.rungbook.services.sessions.start(person.id)).split(';')[0];
    const sessionId = cookie.slice(cookie.indexOf('=') + 1);
    const { user } = await h.rungbook.services.sessions.resolve(sessionId);
    return { cookie, sessionId, user: user! };
  }

  async function watching(person: TestPerson) {
    const { cookie, sessionId, user } = await session(person);
    const recorded = recordingStream();
    (await hub.watch(user, notebookId, sessionId))(recorded.stream);
    await recorded.event('hello');
    return { cookie, recorded };
  }

  test('signing out closes the streams opened with that session (revoked); a stream on another session stays open', async () => {
    const signingOut = await watching(owner);
    const staying = await watching(owner);
    await h.raw.post('/api/auth/sign-out').set('Origin', ORIGIN).set('Cookie', signingOut.cookie).expect(204);
    await signingOut.recorded.event('revoked');
    await signingOut.recorded.closedNow();
    // several heartbeats later (each one checks), the other session's stream is still open
    await staying.recorded.pingsReach(staying.recorded.pings() + 3);
    assert.equal(staying.recorded.stream.closed, false);
    assert.ok(!staying.recorded.types().includes('revoked'));
    staying.recorded.stream.close();
  });

  test('a password reset (which ends every session of the person) closes all their streams', async () => {
    const person = await createPerson(h, { tag: 'resetting' });
    await h.rungbook.services.dataSource.getRepository(NotebookMember).insert({ id: newId(), notebookId, userId: person.id, groupId: null, role: 'viewer', grantedById: owner.id });
    const first = await watching(person);
    const second = await watching(person);
    // what a completed password reset does to sessions (server/services/passwordReset.ts)
    await h.rungbook.services.sessions.endAllFor(person.id);
    await Promise.all([first.recorded.event('revoked'), second.recorded.event('revoked')]);
    assert.deepEqual([first.recorded.stream.closed, second.recorded.stream.closed], [true, true]);
  });

  test('a share link that expires while its stream is open: the stream is revoked and closed', async () => {
    const token = (await owner.client.post(`/api/notebooks/${notebookId}/links`).send({ role: 'viewer' }).expect(201)).body.token as string;
    const recorded = recordingStream();
    (await hub.watchShared(token, { address: '192.0.2.1' }))(recorded.stream);
    await recorded.event('hello');
    // the expiry passes; nothing else happens that would re-check access
    await h.rungbook.services.dataSource.getRepository(ShareLink).update({ tokenHash: sha256Hex(token) }, { expiresAt: new Date(Date.now() - 60_000) });
    await recorded.event('revoked');
    await recorded.closedNow();
    assert.equal(hub.openStreams(), 0);
  });

  test('a person leaving the group that made them an editor: streams through the links they made are revoked', async () => {
    const groupId = (await owner.client.post('/api/groups').send({ name: 'Invented Heartbeat Group', description: '' }).expect(201)).body.group.id as string;
    const member = await createPerson(h, { tag: 'group-editor' });
    await joinGroup(h, groupId, member.id, 'member');
    await owner.client.post(`/api/notebooks/${notebookId}/members`).send({ groupId, role: 'editor' }).expect(200);
    const token = (await member.client.post(`/api/notebooks/${notebookId}/links`).send({ role: 'viewer' }).expect(201)).body.token as string;
    const recorded = recordingStream();
    (await hub.watchShared(token, { address: '192.0.2.9' }))(recorded.stream);
    await recorded.event('hello');
    await member.client.delete(`/api/groups/${groupId}/members/${member.id}`).expect(200);
    await recorded.event('revoked');
    await recorded.closedNow();
  });

  test('a share link revoked in the database alone is noticed at the next heartbeat', async () => {
    const token = (await owner.client.post(`/api/notebooks/${notebookId}/links`).send({ role: 'commenter' }).expect(201)).body.token as string;
    const recorded = recordingStream();
    (await hub.watchShared(token, { address: '192.0.2.1' }))(recorded.stream);
    await recorded.event('hello');
    await h.rungbook.services.dataSource.getRepository(ShareLink).update({ tokenHash: sha256Hex(token) }, { revokedAt: new Date() });
    await recorded.event('revoked');
    await recorded.closedNow();
  });
});

describe('share-link streams are capped per notebook and per network address', () => {
  let h: Harness;
  let hub: LiveHub;
  let owner: TestPerson;
  let notebookId: string;
  const open: ReturnType<typeof recordingStream>[] = [];

  before(async () => {
    h = await startHarness();
    const { notebooks, events, sessions, sharing } = h.rungbook.services;
    hub = createLiveHub({
      notebooks, events, sessions, logger: pino({ level: 'silent' }), resolveLink: (token) => sharing.resolveLink(token),
      limits: { linkStreamsPerNotebook: 4, linkStreamsPerAddress: 2, perPerson: 3 },
    });
    owner = await createPerson(h, { tag: 'owner' });
    notebookId = await newNotebookOf(owner, 'Invented popular notebook');
  });
  after(async () => {
    hub.closeAll();
    await h.close();
  });

  async function newNotebookOf(person: TestPerson, title: string): Promise<string> {
    return ((await person.client.post('/api/notebooks').send({ title, summary: '' }).expect(201)).body.notebook as NotebookDetail).id;
  }
  const newLink = async (id: string) => (await owner.client.post(`/api/notebooks/${id}/links`).send({ role: 'viewer' }).expect(201)).body.token as string;
  async function admitted(token: string, holder: LinkHolder) {
    const recorded = recordingStream();
    (await hub.watchShared(token, holder))(recorded.stream);
    open.push(recorded);
    return recorded;
  }
  const refusedAs = (pattern: RegExp) => (error: unknown) => error instanceof AppError && error.code === 'rate_limited' && pattern.test(error.message);
  function closeEverything() {
    for (const recorded of open.splice(0)) recorded.stream.close();
    assert.equal(hub.openStreams(), 0);
  }

  test('per address: the third signed-out stream from one address is refused, whatever the link; another address is admitted', async () => {
    const [first, second] = [await newLink(notebookId), await newLink(notebookId)];
    await admitted(first, { address: '198.51.100.7' });
    await admitted(second, { address: '198.51.100.7' });
    await assert.rejects(hub.watchShared(first, { address: '198.51.100.7' }), refusedAs(/at most 2 live pages through share links .* one network address/i));
    await admitted(first, { address: '198.51.100.8' });
    assert.equal(hub.openStreams(), 3);
    open[0].stream.close();
    await admitted(first, { address: '198.51.100.7' });
    closeEverything();
  });

  test('per notebook: the fifth link stream of one notebook is refused, from any address and any of its links; people and other notebooks are not affected', async () => {
    const links = [await newLink(notebookId), await newLink(notebookId)];
    for (let i = 0; i < 4; i += 1) await admitted(links[i % 2], { address: `203.0.113.${i}` });
    await assert.rejects(hub.watchShared(links[0], { address: '203.0.113.50' }), refusedAs(/at most 4 live pages .* this notebook's share links/i));
    await assert.rejects(hub.watchShared(links[1], { userId: owner.id }), refusedAs(/this notebook's share links/));

    const session = (await h.rungbook.services.sessions.start(owner.id)).split(';')[0];
    const sessionId = session.slice(session.indexOf('=') + 1);
    const { user } = await h.rungbook.services.sessions.resolve(sessionId);
    const person = recordingStream();
    (await hub.watch(user!, notebookId, sessionId))(person.stream);
    open.push(person);
    await person.event('hello');

    const elsewhere = await newNotebookOf(owner, 'Invented quiet notebook');
    await admitted(await newLink(elsewhere), { address: '203.0.113.50' });
    assert.equal(hub.openStreams(), 6);
    closeEverything();
  });

  test('a signed-in holder is counted as a person (the per-person limit), not by address', async () => {
    const token = await newLink(notebookId);
    const holder = await createPerson(h, { tag: 'holder' });
    for (let i = 0; i < 3; i += 1) await admitted(token, { userId: holder.id });
    await assert.rejects(hub.watchShared(token, { userId: holder.id }), refusedAs(/at most 3 live pages per person/i));
    await admitted(token, { address: '198.51.100.7' });
    closeEverything();
  });
});
