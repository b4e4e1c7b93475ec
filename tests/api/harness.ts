import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pino } from 'pino';
import supertest from 'supertest';
import { startRungbook, type RunningRungbook } from '../../server/boot';
import { loadConfig, type ServerConfig } from '../../server/config';
import { CapturedMail } from '../../server/db/entities';
import { freshPostgresDatabase, testsUsePostgres } from '../db/postgres';
import { forgetRateLimitCounts, sharedQueueUrl, testsUseQueue } from './sharedQueue';

export const ORIGIN = 'http://localhost:8080';

export interface Harness {
  rungbook: RunningRungbook;
  config: ServerConfig;
  /** A cookie-keeping client that sends our Origin, like the web app does. */
  browser(): ReturnType<typeof supertest.agent>;
  raw: ReturnType<typeof supertest>;
  capturedMail(): Promise<CapturedMail[]>;
  close(): Promise<void>;
}

/** On PostgreSQL, a test that names a database file (to open it again later) gets the same database each time. */
const postgresDatabasesByPath = new Map<string, Promise<string>>();
function postgresDatabaseFor(databasePath: string | undefined): Promise<string> {
  if (!databasePath) return freshPostgresDatabase();
  if (!postgresDatabasesByPath.has(databasePath)) postgresDatabasesByPath.set(databasePath, freshPostgresDatabase());
  return postgresDatabasesByPath.get(databasePath)!;
}

/** JOB_QUEUE_URL of this test process's Redis queue and workers (RUNGBOOK_TEST_QUEUE=redis), with fresh rate-limit counts. */
async function sharedQueueSettings(): Promise<Record<string, string>> {
  if (!testsUseQueue()) return {};
  const url = await sharedQueueUrl();
  await forgetRateLimitCounts(url);
  return { JOB_QUEUE_URL: url };
}

/**
 * The settings that put a server on the services the tests were asked to use: DATABASE_URL of a database
 * on PostgreSQL (the same one for the same `databasePath`) and JOB_QUEUE_URL of the Redis queue; none by default.
 */
export async function testServiceSettings(databasePath?: string): Promise<Record<string, string>> {
  return {
    ...(testsUsePostgres() ? { DATABASE_URL: await postgresDatabaseFor(databasePath) } : {}),
    ...(await sharedQueueSettings()),
  };
}

/**
 * A real server stack on a fresh temporary SQLite file (or, with RUNGBOOK_TEST_DATABASE=postgres, a fresh
 * database on this test process's PostgreSQL cluster), with the mail capture on a free port. With
 * RUNGBOOK_TEST_QUEUE=redis its engine jobs go through the test process's Redis queue to two worker
 * processes; job limits (time, queue wait, per person) are the server's settings, and the time limit
 * travels with each job to the worker.
 */
export async function startHarness(env: Record<string, string> = {}): Promise<Harness> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-api-'));
  const webRoot = path.join(dir, 'web');
  fs.mkdirSync(webRoot);
  fs.writeFileSync(path.join(webRoot, 'index.html'), '<!doctype html><title>Rungbook test shell</title>');
  const config = loadConfig({
    DATABASE_PATH: path.join(dir, 'test.sqlite'),
    SMTP_PORT: '0',
    PUBLIC_URL: ORIGIN,
    WEB_ROOT: webRoot,
    SEED_DEMO_DATA: 'false',
    ...(await testServiceSettings(env.DATABASE_PATH)),
    ...env,
  });
  const rungbook = await startRungbook(config, pino({ level: 'silent' }), { listen: false });
  return {
    rungbook,
    config,
    browser: () => supertest.agent(rungbook.app).set('Origin', ORIGIN),
    raw: supertest(rungbook.app),
    capturedMail: () => rungbook.services.dataSource.getRepository(CapturedMail).find({ order: { id: 'ASC' } }),
    async close() {
      await rungbook.stop();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Mail delivery is asynchronous on the capture side; wait until `count` messages are stored. */
export async function waitForMail(harness: Harness, count: number, timeoutMs = 5000): Promise<CapturedMail[]> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const mail = await harness.capturedMail();
    if (mail.length >= count || Date.now() > deadline) return mail;
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

export const person = (n: number) => ({ name: `Invented Person ${n}`, email: `person${n}@test.rungbook.example`, password: `long-enough-pass-${n}` });

export function resetTokenFrom(text: string): string {
  const match = /reset-password\?token=([A-Za-z0-9_-]+)/.exec(text);
  if (!match) throw new Error(`No reset link in: ${text}`);
  return match[1];
}

export function verificationTokenFrom(text: string): string {
  const match = /verify-email\?token=([A-Za-z0-9_-]+)/.exec(text);
  if (!match) throw new Error(`No confirmation link in: ${text}`);
  return match[1];
}

/** The newest message to `email` with this subject, waiting for it to arrive through the capture. */
export async function mailTo(harness: Harness, email: string, subject: string, timeoutMs = 5000): Promise<CapturedMail> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    await harness.rungbook.services.mailer.idle();
    const found = (await harness.capturedMail()).filter((m) => m.recipients.toLowerCase().includes(email.toLowerCase()) && m.subject === subject);
    if (found.length) return found[found.length - 1];
    if (Date.now() > deadline) throw new Error(`No message "${subject}" to ${email}`);
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
}

/**
 * Sign up person `n` (or the given person) through the API and follow the e-mailed confirmation link
 * with their password, which signs them in: returns the signed-in client and the account.
 */
export async function signUpVerified(
  harness: Harness,
  who: number | { name: string; email: string; password: string },
  client: ReturnType<Harness['browser']> = harness.browser(),
) {
  const account = typeof who === 'number' ? person(who) : who;
  await client.post('/api/auth/sign-up').send(account).expect(202);
  const mail = await mailTo(harness, account.email, 'Confirm your Rungbook e-mail address');
  const verified = await client.post('/api/auth/verify').send({ token: verificationTokenFrom(mail.textBody), password: account.password }).expect(200);
  return { client, user: verified.body.user as { id: string; name: string; email: string; siteRole: string; emailVerified: boolean } };
}
