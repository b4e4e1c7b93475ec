import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { GroupMembership, ResearchGroup, User } from '../../server/db/entities';
import { seedDemoDataIfEmpty } from '../../server/seed/demo';
import { startHarness, type Harness } from './harness';
import { testsUsePostgres } from '../db/postgres';

describe('platform: health, routing, body limits, database', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness({ BODY_LIMIT: '2kb' });
  });
  after(() => h.close());

  test('GET /api/health reports the database as ok', async () => {
    const reply = await h.raw.get('/api/health').expect(200);
    assert.deepEqual({ status: reply.body.status, database: reply.body.database, mail: reply.body.mail }, { status: 'ok', database: 'ok', mail: 'fake' });
  });

  test('unknown API routes are a JSON 404', async () => {
    const reply = await h.raw.get('/api/no-such-thing').expect(404).expect('Content-Type', /json/);
    assert.equal(reply.body.error.code, 'not_found');
    await h.raw.post('/api/auth/nope').send({}).expect(404);
  });

  test('app paths fall back to the web app; missing static files are 404', async () => {
    const page = await h.raw.get('/groups/abc').expect(200).expect('Content-Type', /html/);
    assert.match(page.text, /Rungbook test shell/);
    await h.raw.get('/_expo/static/js/web/missing-bundle.js').expect(404);
    await h.raw.get('/katex/fonts/nope.woff2').expect(404);
  });

  test('malformed JSON is a 400 and an oversize body a 413, both as JSON errors', async () => {
    const malformed = await h.raw.post('/api/auth/sign-in').set('Content-Type', 'application/json').send('{"email":').expect(400);
    assert.equal(malformed.body.error.code, 'malformed_json');
    const huge = await h.raw.post('/api/auth/sign-up').send({ name: 'x'.repeat(5000), email: 'a@b.example', password: 'long-enough-pass' }).expect(413);
    assert.equal(huge.body.error.code, 'payload_too_large');
    assert.equal(await h.rungbook.services.dataSource.getRepository(User).count(), 0);
  });

  // PostgreSQL always writes ahead and enforces foreign keys: these are SQLite's settings only
  test('the database runs in WAL mode with foreign keys on', { skip: testsUsePostgres() && 'SQLite settings (PostgreSQL has no such switches)' }, async () => {
    const [journal] = await h.rungbook.services.dataSource.query('PRAGMA journal_mode');
    assert.equal(journal.journal_mode, 'wal');
    const [foreignKeys] = await h.rungbook.services.dataSource.query('PRAGMA foreign_keys');
    assert.equal(foreignKeys.foreign_keys, 1);
  });

  test('the migrations produce exactly the schema the entities describe', async () => {
    const pending = await h.rungbook.services.dataSource.driver.createSchemaBuilder().log();
    assert.deepEqual(pending.upQueries.map((q) => q.query), []);
  });

  test('demo data is created once, on an empty database: one admin, one lead, two members', async () => {
    const ds = h.rungbook.services.dataSource;
    assert.equal(await seedDemoDataIfEmpty(ds), true);
    assert.equal(await seedDemoDataIfEmpty(ds), false);
    const users = await ds.getRepository(User).find();
    assert.deepEqual(users.map((u) => u.siteRole).sort(), ['admin', 'member', 'member', 'member']);
    assert.equal(await ds.getRepository(ResearchGroup).count(), 1);
    const roles = (await ds.getRepository(GroupMembership).find()).map((m) => m.role).sort();
    assert.deepEqual(roles, ['lead', 'member', 'member']);
    assert.ok(users.every((u) => /demo/.test(u.name)), 'demo people are labelled as demo data');
    const lead = h.browser();
    const signIn = await lead.post('/api/auth/sign-in').send({ email: 'lead@demo.rungbook.example', password: 'demo-lead-pass' }).expect(200);
    assert.equal(signIn.body.user.siteRole, 'member');
    const member = h.browser();
    await member.post('/api/auth/sign-in').send({ email: 'imre@demo.rungbook.example', password: 'demo-member-pass' }).expect(200);
    const shared = (await member.get('/api/notebooks').expect(200)).body.notebooks;
    assert.equal(shared.length, 1, 'the demo notebook is shared with the demo group');
    assert.match(shared[0].title, /invented scenario/);
    const detail = (await member.get(`/api/notebooks/${shared[0].id}`).expect(200)).body.notebook;
    assert.deepEqual(detail.cells.map((c: { kind: string }) => c.kind), ['note', 'setup', 'integral', 'flow', 'fixedpoints', 'exponents', 'scan', 'note', 'comparison', 'comparison']);
  });
});

describe('a separate app origin (development web server)', () => {
  test('is allowed by CORS with credentials and by the origin check only when listed in APP_ORIGINS', async () => {
    const devOrigin = 'http://localhost:8081';
    const h = await startHarness({ APP_ORIGINS: devOrigin });
    try {
      // CORS preflight semantics per the Fetch standard: the allowed origin is echoed, credentials allowed.
      const preflight = await h.raw.options('/api/auth/sign-up').set('Origin', devOrigin).set('Access-Control-Request-Method', 'POST').expect(204);
      assert.equal(preflight.headers['access-control-allow-origin'], devOrigin);
      assert.equal(preflight.headers['access-control-allow-credentials'], 'true');
      await h.raw.post('/api/auth/sign-up').set('Origin', devOrigin).send({ name: 'Dev Person', email: 'dev@test.rungbook.example', password: 'long-enough-pass' }).expect(202);
      const other = await h.raw.options('/api/auth/sign-up').set('Origin', 'http://localhost:9999').set('Access-Control-Request-Method', 'POST');
      assert.equal(other.headers['access-control-allow-origin'], undefined);
    } finally {
      await h.close();
    }
  });
});
