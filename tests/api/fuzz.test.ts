// Property-based fuzzing (fast-check) of every route in the API route table: arbitrary JSON, mutated
// valid bodies, hostile keys, lone surrogates, odd path segments and queries. The contract under test
// is the API's own promise: bad input is a 4xx JSON error, never a 500, and the server stays healthy.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import fc from 'fast-check';
import { apiRouteTable } from '../../server/app';
import type { AnyRouteSpec } from '../../server/http/route';
import { startHarness, type Harness } from './harness';
import { collaborationFixture, createPerson, datasetFixture, INVENTED_TABLE, notebookWithRun, type RouteFixture as Fixture, type TestPerson } from './people';

const RUNS_PER_ROUTE = Number(process.env.FUZZ_RUNS ?? 25);

/** A plausible valid body per route, as the seed that mutations start from (unknown routes start from {}). */
function seedBody(spec: AnyRouteSpec): Record<string, unknown> {
  const key = `${spec.method.toUpperCase()} ${spec.path}`;
  const seeds: Record<string, Record<string, unknown>> = {
    'POST /auth/sign-up': { name: 'Invented Fuzz', email: 'fuzz@test.rungbook.example', password: 'long-enough-pass-fuzz' },
    'POST /auth/sign-in': { email: 'fuzz@test.rungbook.example', password: 'long-enough-pass-fuzz' },
    'POST /auth/forgot': { email: 'fuzz@test.rungbook.example' },
    'POST /auth/reset': { token: 'x'.repeat(43), password: 'long-enough-pass-fuzz' },
    'POST /auth/verify': { token: 'x'.repeat(43), password: 'long-enough-pass-fuzz' },
    'POST /auth/verify/resend': { email: 'fuzz@test.rungbook.example' },
    'PATCH /me': { name: 'Invented Fuzz Renamed' },
    'POST /me/password': { currentPassword: 'wrong-password-fuzz', newPassword: 'long-enough-pass-fuzz2' },
    'POST /me/email': { email: 'fuzz-moved@test.rungbook.example', currentPassword: 'wrong-password-fuzz' },
    'POST /auth/email-change/confirm': { token: 'x'.repeat(43) },
    'POST /groups': { name: 'Invented Fuzz Group', description: 'invented' },
    'POST /groups/:groupId/members': { email: 'fuzz@test.rungbook.example', role: 'member' },
    'PATCH /groups/:groupId/members/:userId': { role: 'member' },
    'POST /notebooks': { title: 'Invented fuzz notebook', summary: 'invented' },
    'PATCH /notebooks/:notebookId': { title: 'Renamed' },
    'POST /notebooks/:notebookId/cells': { label: 'note1', input: { kind: 'note', text: 'Invented $x^2$' } },
    'PATCH /notebooks/:notebookId/cells/:cellId': { revision: 1, input: { kind: 'note', text: 'edited' } },
    'POST /notebooks/:notebookId/cells/:cellId/move': { position: 0 },
    'POST /notebooks/:notebookId/versions': { message: 'fuzz' },
    'POST /notebooks/import': { format: 'rungbook-notebook', formatVersion: 1, title: 'Invented import', summary: '', cells: [] },
    'POST /calc': { job: { job: 'special', fn: 'gamma', x: '0.5', digits: 20 } },
    'POST /notebooks/:notebookId/members': { email: 'fuzz@test.rungbook.example', role: 'viewer' },
    'PATCH /notebooks/:notebookId/members/:memberId': { role: 'commenter' },
    'POST /notebooks/:notebookId/owner': { userId: 'zzzzzzzzzzzz' },
    'POST /notebooks/:notebookId/links': { role: 'viewer', expiresAt: '2030-01-01T00:00:00Z' },
    'POST /notebooks/:notebookId/comments': { body: 'Invented $\\varepsilon^2$ comment @owner', parentId: 'zzzzzzzzzzzz' },
    'PATCH /comments/:commentId': { resolved: true },
    'POST /shared/:token/comments': { body: 'Invented comment through a link' },
    'POST /activity/read': { ids: [] },
    'POST /notebooks/:notebookId/presentation': { cellId: null },
    'POST /notebooks/:notebookId/datasets': DATASET_DESCRIPTION_SEED,
    'POST /notebooks/:notebookId/datasets/pasted': { ...DATASET_DESCRIPTION_SEED, label: 'pasted', text: INVENTED_TABLE },
  };
  return seeds[key] ?? {};
}

/** A valid dataset description (invented): x = s, y = Δφ² with symmetric errors in the third column. */
const DATASET_DESCRIPTION_SEED = {
  label: 'fuzzed', name: 'Invented fuzz data', source: 'invented', note: '', shape: 'points',
  xAxis: { kind: 's' }, yAxis: { kind: 'Delta_phi2' }, mapping: { x: 0, y: 1, yError: { kind: 'symmetric', column: 2 } },
};

const anyCodeUnit = fc.integer({ min: 0, max: 0xffff }).map((code) => String.fromCharCode(code));
const hostileString = fc.oneof(
  fc.string(),
  fc.string({ unit: anyCodeUnit, maxLength: 12 }),
  fc.constantFrom('\ud800', 'a\udfffb', '__proto__', 'constructor', '((u1+u2+u3+u4+u5+u6+u7)^4)^3', '%E0%A4%A', '\\input{/etc/passwd}', '1e999', '-0'),
);
const hostileKey = fc.oneof(fc.constantFrom('__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty'), fc.string({ maxLength: 8 }));
const anyJson = fc.oneof(fc.jsonValue({ maxDepth: 3 }), hostileString);

/** Valid-looking bodies with one field changed, a hostile key added, or replaced wholesale. */
function bodies(seed: Record<string, unknown>): fc.Arbitrary<unknown> {
  const keys = Object.keys(seed);
  const replaced = keys.length
    ? fc.tuple(fc.constantFrom(...keys), anyJson).map(([key, value]) => ({ ...seed, [key]: value }))
    : fc.constant(seed);
  const extra = fc.tuple(hostileKey, anyJson).map(([key, value]) => JSON.parse(JSON.stringify({ ...seed }).replace(/^\{/, () => `{${JSON.stringify(key)}:${JSON.stringify(value)}${keys.length ? ',' : ''}`)));
  const dropped = keys.length ? fc.constantFrom(...keys).map((key) => Object.fromEntries(Object.entries(seed).filter(([k]) => k !== key))) : fc.constant({});
  return fc.oneof(replaced, extra, dropped, anyJson, fc.dictionary(hostileKey, anyJson, { maxKeys: 4 }));
}

const pathSegment = fc.oneof(
  { weight: 6, arbitrary: fc.constant(null) }, // the real id
  { weight: 1, arbitrary: fc.string({ maxLength: 12 }).map((s) => encodeURIComponent(s)) },
  { weight: 1, arbitrary: fc.constantFrom('%E0%A4%A', '%ff', '%', '..', 'a'.repeat(300), '%00', '__proto__') },
);

/** Live streams never end: read an accepted stream's first bytes and hang up; error replies are read whole. */
function firstChunkOnly(response: unknown, done: (error: Error | null, body: unknown) => void) {
  const res = response as NodeJS.ReadableStream & { headers: Record<string, string | undefined>; destroy(): void };
  if (res.headers['content-type']?.startsWith('text/event-stream')) {
    res.once('data', () => {
      res.destroy();
      done(null, null);
    });
    return;
  }
  let text = '';
  res.on('data', (chunk: Buffer) => (text += chunk.toString('utf8')));
  res.on('end', () => {
    try {
      done(null, JSON.parse(text));
    } catch {
      done(null, text);
    }
  });
}

function fillPath(path: string, fixture: Fixture, overrides: (string | null)[]): string {
  let index = 0;
  return path.replace(/:(\w+)/g, (_match, name: keyof Fixture) => overrides[index++] ?? fixture[name] ?? 'zzzzzzzzzzzz');
}

describe('fuzzing every request schema: only 4xx, never 500', () => {
  let h: Harness;
  let owner: TestPerson;
  let fixture: Fixture;
  let requests = 0;
  const statusCounts = new Map<number, number>();

  before(async () => {
    h = await startHarness({ SIGNIN_LIMIT_PER_IP: '100000', SIGNIN_LIMIT_PER_ACCOUNT: '100000', INVITE_LIMIT_PER_USER: '100000', SHARED_LINK_LIMIT_PER_IP: '100000', DATASET_UPLOAD_LIMIT_PER_USER: '100000' });
    owner = await createPerson(h, { tag: 'owner' });
    const member = await createPerson(h, { tag: 'member', signIn: false });
    fixture = await buildFixture(h, owner, member.id);
  });
  after(async () => {
    const counts = [...statusCounts.entries()].sort(([a], [b]) => a - b).map(([status, n]) => `${status}×${n}`).join(' ');
    console.log(`fuzz: ${requests} requests over ${apiRouteTable(h.rungbook.services).length} routes; statuses ${counts}`);
    await h.close();
  });

  async function signedIn(): Promise<void> {
    const me = await owner.client.get('/api/me');
    if (me.status === 401) await owner.client.post('/api/auth/sign-in').send({ email: owner.email, password: owner.password }).expect(200);
  }

  test('every route answers arbitrary input with a status below 500', async () => {
    const specs = apiRouteTable(h.rungbook.services).filter((spec) => !(spec.method === 'delete' && spec.path === '/notebooks/:notebookId'));
    const paramCount = (path: string) => (path.match(/:\w+/g) ?? []).length;
    for (const spec of specs) {
      await signedIn();
      const property = fc.asyncProperty(
        bodies(seedBody(spec)),
        fc.array(pathSegment, { minLength: paramCount(spec.path), maxLength: paramCount(spec.path) }),
        fc.dictionary(hostileKey, hostileString, { maxKeys: 3 }),
        async (body, segments, query) => {
          const url = `/api${fillPath(spec.path, fixture, segments)}`;
          let request = owner.client[spec.method](url);
          if (spec.eventStream) request = request.buffer(false).parse(firstChunkOnly);
          if (spec.method === 'get') request = request.query(query);
          else request = request.set('Content-Type', 'application/json').send(JSON.stringify(body) ?? 'null');
          const reply = await request;
          requests += 1;
          statusCounts.set(reply.status, (statusCounts.get(reply.status) ?? 0) + 1);
          assert.ok(reply.status < 500, `${spec.method.toUpperCase()} ${url} with ${JSON.stringify(body)?.slice(0, 300)} gave ${reply.status}: ${(reply.text ?? JSON.stringify(reply.body) ?? "").slice(0, 300)}`);
          if (reply.status >= 400) assert.equal(typeof reply.body?.error?.code, 'string', `${url}: a 4xx reply carries a JSON error code`);
        },
      );
      await fc.assert(property, { numRuns: RUNS_PER_ROUTE });
    }
  });

  test('the upload route answers arbitrary multipart forms (description and file) with a status below 500', async () => {
    await signedIn();
    const fileContent = fc.oneof(
      fc.constant(INVENTED_TABLE),
      fc.string({ unit: anyCodeUnit, maxLength: 200 }),
      fc.uint8Array({ maxLength: 300 }).map((bytes) => Buffer.from(bytes).toString('latin1')),
      fc.constantFrom('', 'x,y\n', '=cmd|\' /C calc\'!A0,1\n1,2\n', 'NaN,Infinity\n1,2\n', '1,2\n1,3\n'),
    );
    const property = fc.asyncProperty(bodies(DATASET_DESCRIPTION_SEED), fileContent, fc.constantFrom('t.csv', 't.tsv', 'x', '../../etc/passwd', ''), async (description, content, name) => {
      let request = owner.client.post(`/api/notebooks/${fixture.notebookId}/datasets`).field('description', JSON.stringify(description) ?? 'null');
      request = name ? request.attach('file', Buffer.from(content, 'latin1'), name) : request;
      const reply = await request;
      requests += 1;
      statusCounts.set(reply.status, (statusCounts.get(reply.status) ?? 0) + 1);
      assert.ok(reply.status < 500, `upload ${JSON.stringify(description)?.slice(0, 200)} / ${JSON.stringify(content.slice(0, 80))} gave ${reply.status}: ${reply.text.slice(0, 300)}`);
      if (reply.status >= 400) assert.equal(typeof reply.body?.error?.code, 'string', 'a 4xx reply carries a JSON error code');
    });
    await fc.assert(property, { numRuns: RUNS_PER_ROUTE * 2 });
  });

  test('the server is healthy after the fuzzing', async () => {
    const health = await h.raw.get('/api/health').expect(200);
    assert.equal(health.body.database, 'ok');
  });
});

async function buildFixture(h: Harness, owner: TestPerson, userId: string): Promise<Fixture> {
  const groupId = (await owner.client.post('/api/groups').send({ name: 'Invented Fuzz Group', description: 'invented' }).expect(201)).body.group.id as string;
  const notebook = await notebookWithRun(owner.client, groupId);
  const extra = await collaborationFixture(h, { ...notebook, ownerId: owner.id }, [{ userId, role: 'viewer' }]);
  const datasetId = await datasetFixture(owner.client, notebook.notebookId);
  return { ...notebook, groupId, userId, memberId: extra.memberId, invitationId: extra.invitationId, linkId: extra.linkId, token: extra.commenterToken, commentId: extra.commentId, datasetId, sessionId: 'f'.repeat(32) };
}
