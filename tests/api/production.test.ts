// Production defaults: what an operator gets from NODE_ENV=production without reading any docs.
import assert from 'node:assert/strict';
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, test } from 'node:test';
import { ConfigError, loadConfig } from '../../server/config';
import { User } from '../../server/db/entities';
import { demoPeople } from '../../server/seed/demo';
import { startHarness } from './harness';
import { createPerson } from './people';

const ROOT = path.resolve(__dirname, '..', '..');

describe('production defaults', () => {
  test('local defaults stay friendly: demo data and the mail fake', () => {
    const config = loadConfig({});
    assert.equal(config.production, false);
    assert.equal(config.seedDemoData, true);
    assert.equal(config.mail.startFake, true);
    assert.equal(config.trustProxy, false, 'proxy headers are not trusted unless TRUST_PROXY says so');
  });

  test('NODE_ENV=production without SMTP settings refuses to start and names the variables', () => {
    assert.throws(() => loadConfig({ NODE_ENV: 'production' }), (error: unknown) => error instanceof ConfigError && /SMTP_HOST/.test(error.message) && /MAIL_FAKE=true/.test(error.message));
  });

  test('NODE_ENV=production with a relay: no demo data, no mail fake', () => {
    const config = loadConfig({ NODE_ENV: 'production', SMTP_HOST: 'smtp.relay.example' });
    assert.equal(config.seedDemoData, false);
    assert.equal(config.mail.startFake, false);
  });

  test('the server process exits with the message instead of starting', () => {
    const result = spawnSync(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
      cwd: ROOT,
      env: { ...process.env, NODE_ENV: 'production', SMTP_HOST: '', MAIL_FAKE: '', PORT: '0', DATABASE_PATH: path.join(os.tmpdir(), `rungbook-never-${process.pid}.sqlite`) },
      encoding: 'utf8',
      timeout: 60_000,
    });
    assert.equal(result.status, 1);
    assert.match(result.stderr, /refuses to start: .*SMTP_HOST/);
  });

  test('demo data asked for explicitly in production: no site admin, no published password works, DEMO_PASSWORD does', async () => {
    const h = await startHarness({ NODE_ENV: 'production', MAIL_FAKE: 'true', SEED_DEMO_DATA: 'true', DEMO_PASSWORD: 'operator-chosen-demo-pass' });
    try {
      const users = await h.rungbook.services.dataSource.getRepository(User).find();
      assert.equal(users.length, demoPeople.length - 1, 'every demo person except the admin');
      assert.deepEqual(users.filter((u) => u.siteRole === 'admin'), []);
      const lead = demoPeople.find((p) => p.groupRole === 'lead')!;
      await h.browser().post('/api/auth/sign-in').send({ email: lead.email, password: lead.password }).expect(401);
      await h.browser().post('/api/auth/sign-in').send({ email: lead.email, password: 'operator-chosen-demo-pass' }).expect(200);
    } finally {
      await h.close();
    }
  });

  test('a start others can reach (HOST=0.0.0.0) without NODE_ENV gets no demo admin, no published passwords and no mail reader', async () => {
    assert.equal(loadConfig({ HOST: '0.0.0.0' }).localOnly, false);
    assert.equal(loadConfig({ HOST: '127.0.0.1' }).localOnly, true);
    const h = await startHarness({ HOST: '0.0.0.0', SEED_DEMO_DATA: 'true' });
    try {
      const users = await h.rungbook.services.dataSource.getRepository(User).find();
      assert.deepEqual(users.filter((u) => u.siteRole === 'admin'), []);
      const lead = demoPeople.find((p) => p.groupRole === 'lead')!;
      await h.browser().post('/api/auth/sign-in').send({ email: lead.email, password: lead.password }).expect(401);
      const admin = await createPerson(h, { siteAdmin: true });
      await admin.client.get('/api/admin/mail').expect(404);
    } finally {
      await h.close();
    }
  });

  test('local-only means HOST and PUBLIC_URL on loopback and no proxy in front', () => {
    assert.equal(loadConfig({ PUBLIC_URL: 'http://localhost:8080' }).localOnly, true);
    assert.equal(loadConfig({ PUBLIC_URL: 'https://rungbook.example.org' }).localOnly, false);
    assert.equal(loadConfig({ TRUST_PROXY: '1' }).localOnly, false);
    assert.equal(loadConfig({ NODE_ENV: 'production', MAIL_FAKE: 'true' }).localOnly, false);
  });

  test('a database first seeded locally, later served to others: the published demo passwords stop working', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-reseed-'));
    const databasePath = path.join(dir, 'shared.sqlite');
    const admin = demoPeople.find((p) => p.siteRole === 'admin')!;
    try {
      const local = await startHarness({ DATABASE_PATH: databasePath, SEED_DEMO_DATA: 'true' });
      await local.browser().post('/api/auth/sign-in').send({ email: admin.email, password: admin.password }).expect(200);
      await local.close();
      const reachable = await startHarness({ DATABASE_PATH: databasePath, HOST: '0.0.0.0', SEED_DEMO_DATA: 'true' });
      try {
        await reachable.browser().post('/api/auth/sign-in').send({ email: admin.email, password: admin.password }).expect(401);
        const users = await reachable.rungbook.services.dataSource.getRepository(User).find();
        assert.equal(users.length, demoPeople.length, 'nobody deleted');
        assert.deepEqual(users.filter((u) => u.siteRole === 'admin'), [], 'no site admin left');
      } finally {
        await reachable.close();
      }
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });

  test('a local start answers only requests addressed to a loopback name (no DNS rebinding), and only its own origin may change state', async () => {
    const h = await startHarness();
    try {
      const rebound = await h.raw.get('/api/health').set('Host', 'attacker.example:8080');
      assert.equal(rebound.status, 403);
      await h.raw.get('/api/health').set('Host', 'localhost:8080').expect(200);
      // Origin equal to the request's own Host is no longer enough: only PUBLIC_URL and APP_ORIGINS.
      const person = await createPerson(h);
      const forged = await person.client.post('/api/notebooks').set('Origin', 'http://127.0.0.1:9999').set('Host', '127.0.0.1:9999').send({ title: 'x', summary: '' });
      assert.equal(forged.status, 403);
      assert.equal(forged.body.error.code, 'cross_site_request');
    } finally {
      await h.close();
    }
  });

  test('TRUST_PROXY=true is refused in production (clients could forge X-Forwarded-For)', () => {
    assert.throws(() => loadConfig({ NODE_ENV: 'production', SMTP_HOST: 'smtp.relay.example', TRUST_PROXY: 'true' }), (error: unknown) => error instanceof ConfigError && /TRUST_PROXY=1/.test(error.message));
    assert.equal(loadConfig({ NODE_ENV: 'production', SMTP_HOST: 'smtp.relay.example', TRUST_PROXY: '1' }).trustProxy, 1);
  });

  test('in production the captured-mail reader does not exist, even for a site admin', async () => {
    const h = await startHarness({ NODE_ENV: 'production', MAIL_FAKE: 'true' });
    try {
      const admin = await createPerson(h, { siteAdmin: true });
      await admin.client.get('/api/admin/mail').expect(404);
    } finally {
      await h.close();
    }
  });

  test('a production start with demo data prints no password', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-prod-'));
    const child = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
      cwd: ROOT,
      env: { ...process.env, NODE_ENV: 'production', MAIL_FAKE: 'true', SMTP_PORT: '0', SEED_DEMO_DATA: 'true', PORT: '0', DATABASE_PATH: path.join(dir, 'p.sqlite'), WEB_ROOT: dir, LOG_LEVEL: 'info' },
    });
    let output = '';
    child.stdout.on('data', (chunk) => (output += chunk));
    child.stderr.on('data', (chunk) => (output += chunk));
    try {
      const deadline = Date.now() + 60_000;
      while (!output.includes('"started"') && !output.includes('running at') && Date.now() < deadline && child.exitCode === null) await new Promise((r) => setTimeout(r, 100));
      assert.ok(output.includes('running at'), `the server started: ${output.slice(0, 500)}`);
      for (const person of demoPeople) assert.ok(!output.includes(person.password), `${person.password} is not printed`);
      assert.ok(!/demo sign-ins/i.test(output));
    } finally {
      child.kill('SIGTERM');
      await new Promise((r) => child.once('exit', r));
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });

  test('npm run site-admin grants and revokes site-admin rights', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-admin-cli-'));
    const databasePath = path.join(dir, 'cli.sqlite');
    const h = await startHarness({ DATABASE_PATH: databasePath });
    try {
      const person = await createPerson(h, { signIn: false });
      const cli = (action: string) =>
        spawnSync(process.execPath, ['--import', 'tsx', 'server/cli/siteAdmin.ts', action, person.email.toUpperCase()], { cwd: ROOT, env: { ...process.env, DATABASE_PATH: databasePath, ...(h.config.databaseUrl ? { DATABASE_URL: h.config.databaseUrl } : {}) }, encoding: 'utf8' });
      assert.equal(cli('grant').status, 0);
      assert.equal((await h.rungbook.services.dataSource.getRepository(User).findOneByOrFail({ id: person.id })).siteRole, 'admin');
      assert.equal(cli('revoke').status, 0);
      assert.equal((await h.rungbook.services.dataSource.getRepository(User).findOneByOrFail({ id: person.id })).siteRole, 'member');
      assert.equal(cli('promote').status, 1, 'an unknown action is refused');
    } finally {
      await h.close();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
