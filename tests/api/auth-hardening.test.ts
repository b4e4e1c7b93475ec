import assert from 'node:assert/strict';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { after, before, describe, test } from 'node:test';
import type { Request } from 'express';
import nodemailer from 'nodemailer';
import { createKnownDevices, deviceKeyIn } from '../../server/auth/knownDevices';
import { hashPassword, passwordHashesComputed, verifyPassword } from '../../server/auth/passwords';
import { createDataSource, openDatabase } from '../../server/db/data-source';
import { EmailVerificationToken, PasswordResetToken, ServerSecret, Session, User } from '../../server/db/entities';
import { migrations } from '../../server/db/migrations';
import type { Mailer, OutgoingMessage } from '../../server/mail/mailer';
import { CONFIRMATION_MAILS_PER_ADDRESS_PER_HOUR, SIGN_IN_DELAY_AT_CAP_MS } from '../../server/http/rateLimits';
import { createAccountService } from '../../server/services/accounts';
import { mailTo, person, resetTokenFrom, signUpVerified, startHarness, verificationTokenFrom, type Harness } from './harness';
import { giveSession } from './people';

const CONFIRM = 'Confirm your Rungbook e-mail address';
const RESET = 'Reset your Rungbook password';
// FIPS 180-4 SHA-256, as computed by Node's OpenSSL binding, rendered in hex.
const sha256 = (text: string) => createHash('sha256').update(text).digest('hex');
const sessionTokenOf = (setCookie: unknown) => /rungbook_session=([^;]+)/.exec(String(setCookie))![1];
const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];

async function timed<T>(work: () => Promise<T>): Promise<[T, number]> {
  const start = performance.now();
  const result = await work();
  return [result, performance.now() - start];
}

describe('sessions are stored only as SHA-256 hashes and end when they should', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness();
    await signUpVerified(h, 1);
    await signUpVerified(h, 2);
  });
  after(() => h.close());

  const signIn = (client: ReturnType<Harness['browser']>, n: number) =>
    client.post('/api/auth/sign-in').send({ email: person(n).email, password: person(n).password }).expect(200);

  test('the sessions table holds sha256(token), never the token; a token rebuilt from a database copy opens nothing', async () => {
    const token = sessionTokenOf((await signIn(h.browser(), 1)).headers['set-cookie']);
    const rows = await h.rungbook.services.dataSource.getRepository(Session).find();
    assert.ok(rows.every((row) => row.id !== token && /^[0-9a-f]{64}$/.test(row.id)));
    assert.ok(rows.some((row) => row.id === sha256(token)));
    for (const row of rows) await h.raw.get('/api/me').set('Cookie', `rungbook_session=${row.id}`).expect(401);
    await h.raw.get('/api/me').set('Cookie', `rungbook_session=${token}`).expect(200);
  });

  test('sign-out ends a session at once, even one validated a moment ago (no cached survival)', async () => {
    const client = h.browser();
    const cookie = `rungbook_session=${sessionTokenOf((await signIn(client, 1)).headers['set-cookie'])}`;
    await h.raw.get('/api/me').set('Cookie', cookie).expect(200);
    await client.post('/api/auth/sign-out').send({}).expect(204);
    await h.raw.get('/api/me').set('Cookie', cookie).expect(401);
  });

  test('signing in as another person in the same browser ends the previous session on the server', async () => {
    const client = h.browser();
    const first = `rungbook_session=${sessionTokenOf((await signIn(client, 1)).headers['set-cookie'])}`;
    await signIn(client, 2);
    assert.equal((await client.get('/api/me').expect(200)).body.user.email, person(2).email);
    await h.raw.get('/api/me').set('Cookie', first).expect(401);
  });

  test('a password reset ends every session at once, cached or not', async () => {
    const cookie = `rungbook_session=${sessionTokenOf((await signIn(h.browser(), 2)).headers['set-cookie'])}`;
    await h.raw.get('/api/me').set('Cookie', cookie).expect(200);
    await h.browser().post('/api/auth/forgot').send({ email: person(2).email }).expect(202);
    const token = resetTokenFrom((await mailTo(h, person(2).email, RESET)).textBody);
    await h.browser().post('/api/auth/reset').send({ token, password: 'changed-password-2' }).expect(200);
    await h.raw.get('/api/me').set('Cookie', cookie).expect(401);
  });
});

describe('the migration to hashed sessions and verified addresses', () => {
  test('hashes existing session ids in place (people stay signed in) and marks existing accounts verified', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-migrate-'));
    const file = path.join(dir, 'old.sqlite');
    try {
      const old = createDataSource(file);
      old.setOptions({ migrations: migrations.slice(0, 2) });
      await old.initialize();
      await old.runMigrations();
      await old.query(`INSERT INTO users (id, name, email, emailKey, passwordHash) VALUES ('u0000000001', 'Invented Old Account', 'old@test.rungbook.example', 'old@test.rungbook.example', 'x')`);
      await old.query(`INSERT INTO sessions (id, userId, expiresAt) VALUES ('oldtoken1234567890abcdef', 'u0000000001', '2099-01-01 00:00:00')`);
      await old.destroy();
      const current = await openDatabase(file);
      try {
        const [session] = await current.getRepository(Session).find();
        assert.equal(session.id, sha256('oldtoken1234567890abcdef'));
        const [user] = await current.getRepository(User).find();
        assert.ok(user.emailVerifiedAt instanceof Date);
      } finally {
        await current.destroy();
      }
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('e-mail verification links', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness();
  });
  after(() => h.close());

  test('only the SHA-256 of the token is stored; the link works once, and never after it expires', async () => {
    await h.browser().post('/api/auth/sign-up').send(person(1)).expect(202);
    const token = verificationTokenFrom((await mailTo(h, person(1).email, CONFIRM)).textBody);
    const rows = await h.rungbook.services.dataSource.getRepository(EmailVerificationToken).find();
    assert.deepEqual(rows.map((row) => row.tokenHash), [sha256(token)]);
    // 24 hours, as promised in the message.
    const lifetimeH = (rows[0].expiresAt.getTime() - rows[0].createdAt.getTime()) / 3_600_000;
    assert.ok(Math.abs(lifetimeH - 24) < 0.1, `lifetime ${lifetimeH} h`);
    await h.browser().post('/api/auth/verify').send({ token, password: person(1).password }).expect(200);
    const again = await h.browser().post('/api/auth/verify').send({ token, password: person(1).password }).expect(400);
    assert.equal(again.body.error.code, 'invalid_verification_token');

    await h.browser().post('/api/auth/sign-up').send(person(2)).expect(202);
    const late = verificationTokenFrom((await mailTo(h, person(2).email, CONFIRM)).textBody);
    await h.rungbook.services.dataSource.getRepository(EmailVerificationToken).update({ tokenHash: sha256(late) }, { expiresAt: new Date(Date.now() - 1000) });
    const expired = await h.browser().post('/api/auth/verify').send({ token: late, password: person(2).password }).expect(400);
    assert.equal(expired.body.error.code, 'invalid_verification_token');
    const made = await h.browser().post('/api/auth/verify').send({ token: 'B'.repeat(43), password: person(2).password }).expect(400);
    assert.equal(made.body.error.code, 'invalid_verification_token');
  });

  test('confirming ends every other session of the account at once, cached or not, and signs in the confirming browser', async () => {
    const client = h.browser();
    await client.post('/api/auth/sign-up').send(person(3)).expect(202);
    const token = verificationTokenFrom((await mailTo(h, person(3).email, CONFIRM)).textBody);
    // An unconfirmed account cannot sign in; a session of it can only date from before that rule.
    const account = await h.rungbook.services.dataSource.getRepository(User).findOneByOrFail({ emailKey: person(3).email });
    await giveSession(h, client, account.id);
    assert.equal((await client.get('/api/me').expect(200)).body.user.emailVerified, false);
    // Another browser follows the link; the first one's (cached) session must end with it.
    const confirming = h.browser();
    await confirming.post('/api/auth/verify').send({ token, password: person(3).password }).expect(200);
    await client.get('/api/me').expect(401);
    assert.equal((await confirming.get('/api/me').expect(200)).body.user.emailVerified, true);
  });

  test('a wrong password leaves the link unspent and the address unconfirmed, and points to "Forgot password"', async () => {
    await h.browser().post('/api/auth/sign-up').send(person(5)).expect(202);
    const token = verificationTokenFrom((await mailTo(h, person(5).email, CONFIRM)).textBody);
    const wrong = await h.browser().post('/api/auth/verify').send({ token, password: 'not-the-password-5' }).expect(400);
    assert.match(wrong.body.error.message, /different password/);
    assert.match(wrong.body.error.message, /Forgot password/);
    assert.ok(wrong.body.error.fields.password);
    assert.equal(wrong.headers['set-cookie'], undefined);
    const stored = await h.rungbook.services.dataSource.getRepository(User).findOneByOrFail({ emailKey: person(5).email });
    assert.equal(stored.emailVerifiedAt, null);
    const [row] = await h.rungbook.services.dataSource.getRepository(EmailVerificationToken).findBy({ tokenHash: sha256(token) });
    assert.equal(row.usedAt, null);
    await h.browser().post('/api/auth/verify').send({ token, password: person(5).password }).expect(200);
  });

  test('an unknown link costs a password hash check like a known one (the same decoy as sign-in)', async () => {
    // Reference: the cost of one argon2id verification with the OWASP parameters. The fastest of
    // several tries is compared on both sides, so a busy machine slows neither side alone.
    const reference = await hashPassword('reference-password');
    const fastest = async (work: (i: number) => Promise<unknown>) => {
      let best = Infinity;
      for (let i = 0; i < 5; i += 1) best = Math.min(best, (await timed(() => work(i)))[1]);
      return best;
    };
    const verifyMs = await fastest((i) => verifyPassword(reference, `attempt-${i}`));
    const unknownMs = await fastest((i) => h.browser().post('/api/auth/verify').send({ token: `unknown${i}`.padEnd(43, 'U'), password: 'whatever-pass' }).expect(400));
    assert.ok(unknownMs > verifyMs / 2, `the fastest unknown link took ${unknownMs.toFixed(0)} ms; the fastest argon2id verification takes ${verifyMs.toFixed(0)} ms`);
  });

  test('resend is public and answers alike for an unconfirmed, a confirmed and an unknown address; only the unconfirmed one gets a fresh link', async () => {
    await h.browser().post('/api/auth/sign-up').send(person(4)).expect(202);
    const first = verificationTokenFrom((await mailTo(h, person(4).email, CONFIRM)).textBody);
    const mailBefore = (await h.capturedMail()).length;
    const ask = (email: string) => h.raw.post('/api/auth/verify/resend').send({ email });
    const unconfirmed = await ask(person(4).email.toUpperCase()).expect(202);
    const confirmed = await ask(person(1).email).expect(202);
    const unknown = await ask('nobody-at-all@test.rungbook.example').expect(202);
    assert.deepEqual(confirmed.body, unconfirmed.body);
    assert.deepEqual(unknown.body, unconfirmed.body);
    for (const reply of [confirmed, unknown]) assert.equal(reply.headers['set-cookie'], unconfirmed.headers['set-cookie']);
    await h.rungbook.services.mailer.idle();
    const sent = (await h.capturedMail()).slice(mailBefore);
    assert.deepEqual(sent.map((m) => [m.recipients.toLowerCase().includes(person(4).email), m.subject]), [[true, CONFIRM]]);
    const second = verificationTokenFrom(sent[0].textBody);
    assert.notEqual(second, first);
    // The fresh link confirms (and signs in) like the first one.
    await h.browser().post('/api/auth/verify').send({ token: second, password: person(4).password }).expect(200);
  });
});

describe('confirmation resends are rate-limited per network address and per address e-mailed', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness({ FORGOT_LIMIT_PER_IP: '2', TRUST_PROXY: 'true' });
  });
  after(() => h.close());
  const ask = (email: string, from: string) => h.raw.post('/api/auth/verify/resend').set('X-Forwarded-For', from).send({ email });

  test('FORGOT_LIMIT_PER_IP requests per source per 15 minutes, whatever the addresses', async () => {
    // Documentation addresses (RFC 5737).
    await ask('a@test.rungbook.example', '192.0.2.10').expect(202);
    await ask('b@test.rungbook.example', '192.0.2.10').expect(202);
    assert.equal((await ask('c@test.rungbook.example', '192.0.2.10').expect(429)).body.error.code, 'rate_limited');
    await ask('c@test.rungbook.example', '192.0.2.11').expect(202);
  });

  test(`${CONFIRMATION_MAILS_PER_ADDRESS_PER_HOUR} requests per address e-mailed per hour, from any sources; malformed ones are not counted`, async () => {
    for (let i = 0; i < 3; i += 1) await ask('not-an-address', `198.51.100.${i + 1}`).expect(400);
    for (let i = 0; i < CONFIRMATION_MAILS_PER_ADDRESS_PER_HOUR; i += 1) await ask('target@test.rungbook.example', `198.51.100.${i + 10}`).expect(202);
    const limited = await ask('TARGET@test.rungbook.example', '198.51.100.99').expect(429);
    assert.equal(limited.body.error.code, 'rate_limited');
    await ask('someone-else@test.rungbook.example', '198.51.100.99').expect(202);
  });
});

describe('rate limits on sign-up, forgot-password and reset', () => {
  test('each answers 429 past its per-source limit', async () => {
    const h = await startHarness({ SIGNUP_LIMIT_PER_IP: '2', FORGOT_LIMIT_PER_IP: '2', RESET_LIMIT_PER_IP: '2' });
    try {
      for (const n of [1, 2]) await h.browser().post('/api/auth/sign-up').send(person(n)).expect(202);
      assert.equal((await h.browser().post('/api/auth/sign-up').send(person(3)).expect(429)).body.error.code, 'rate_limited');
      for (let i = 0; i < 2; i += 1) await h.browser().post('/api/auth/forgot').send({ email: person(1).email }).expect(202);
      assert.equal((await h.browser().post('/api/auth/forgot').send({ email: person(1).email }).expect(429)).body.error.code, 'rate_limited');
      for (let i = 0; i < 2; i += 1) await h.browser().post('/api/auth/reset').send({ token: 'C'.repeat(43), password: 'whatever-new-pass' }).expect(400);
      assert.equal((await h.browser().post('/api/auth/reset').send({ token: 'C'.repeat(43), password: 'whatever-new-pass' }).expect(429)).body.error.code, 'rate_limited');
    } finally {
      await h.close();
    }
  });
});

describe('password reset', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness({ RESET_LIMIT_PER_IP: '1000' });
    await signUpVerified(h, 1);
  });
  after(() => h.close());

  async function requestLink(): Promise<string> {
    const before = (await h.capturedMail()).length;
    await h.browser().post('/api/auth/forgot').send({ email: person(1).email }).expect(202);
    await h.rungbook.services.mailer.idle();
    const mail = (await h.capturedMail()).slice(before).filter((m) => m.subject === RESET);
    assert.equal(mail.length, 1);
    return resetTokenFrom(mail[0].textBody);
  }

  test('a completed reset spends every other outstanding link of the account', async () => {
    const older = await requestLink();
    const newer = await requestLink();
    await h.browser().post('/api/auth/reset').send({ token: newer, password: 'reset-password-one' }).expect(200);
    const stale = await h.browser().post('/api/auth/reset').send({ token: older, password: 'reset-password-two' }).expect(400);
    assert.equal(stale.body.error.code, 'invalid_reset_token');
    const open = await h.rungbook.services.dataSource.getRepository(PasswordResetToken).find();
    assert.ok(open.every((row) => row.usedAt !== null));
    await h.browser().post('/api/auth/sign-in').send({ email: person(1).email, password: 'reset-password-one' }).expect(200);
  });

  test('a junk token is refused before any password hash is computed', async () => {
    const before = passwordHashesComputed();
    for (let i = 0; i < 8; i += 1) {
      await h.browser().post('/api/auth/reset').send({ token: `junk${i}`.padEnd(43, 'J'), password: 'whatever-new-pass' }).expect(400);
    }
    assert.equal(passwordHashesComputed(), before, 'no argon2 hash was computed for a junk token');
    // the counter does count: a real hash moves it by one
    await hashPassword('reference-password');
    assert.equal(passwordHashesComputed(), before + 1);
  });
});

describe('no account enumeration', () => {
  let silentSmtp: net.Server;
  let h: Harness;
  before(async () => {
    // An SMTP relay that accepts the connection and never greets: a send waits for the mailer's 5 s greeting timeout.
    silentSmtp = net.createServer(() => undefined);
    await new Promise<void>((resolve) => silentSmtp.listen(0, '127.0.0.1', resolve));
    const port = (silentSmtp.address() as net.AddressInfo).port;
    h = await startHarness({ MAIL_FAKE: 'false', SMTP_PORT: String(port), SIGNUP_LIMIT_PER_IP: '1000' });
  });
  after(async () => {
    await h.close();
    await new Promise((resolve) => silentSmtp.close(resolve));
  });

  test('forgot-password answers at once and alike for known and unknown addresses: the reply never waits for SMTP', async () => {
    await h.browser().post('/api/auth/sign-up').send(person(1)).expect(202);
    const [known, knownMs] = await timed(() => h.browser().post('/api/auth/forgot').send({ email: person(1).email }).expect(202));
    const [unknown, unknownMs] = await timed(() => h.browser().post('/api/auth/forgot').send({ email: 'nobody@test.rungbook.example' }).expect(202));
    assert.deepEqual(known.body, unknown.body);
    assert.ok(knownMs < 1000 && unknownMs < 1000, `known ${knownMs.toFixed(0)} ms, unknown ${unknownMs.toFixed(0)} ms; a send would take ≥ 5000 ms`);
  });

  test('sign-up with a taken address replies like a new sign-up and spends a password hash too', async () => {
    const newTimes: number[] = [];
    const takenTimes: number[] = [];
    for (let i = 0; i < 5; i += 1) {
      const [fresh, freshMs] = await timed(() => h.browser().post('/api/auth/sign-up').send(person(100 + i)).expect(202));
      const [taken, takenMs] = await timed(() => h.browser().post('/api/auth/sign-up').send({ ...person(100 + i), name: 'Someone Else (invented)' }).expect(202));
      assert.equal(taken.body.message, fresh.body.message);
      assert.equal(taken.headers['set-cookie'], fresh.headers['set-cookie']);
      newTimes.push(freshMs);
      takenTimes.push(takenMs);
    }
    // Without the hash a taken address would answer in about a millisecond, against tens for argon2id.
    assert.ok(median(takenTimes) > median(newTimes) / 3, `medians: taken ${median(takenTimes).toFixed(1)} ms, new ${median(newTimes).toFixed(1)} ms`);
  });
});

describe('sign-in to an unconfirmed account tells nothing', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness({ SIGNIN_LIMIT_PER_ACCOUNT: '1000', SIGNIN_LIMIT_PER_IP: '1000' });
    await signUpVerified(h, 1);
  });
  after(() => h.close());

  test('sign-up then sign-in with the chosen password: the reply of a wrong password, after a password check as long', async () => {
    await h.browser().post('/api/auth/sign-up').send(person(2)).expect(202);
    await h.rungbook.services.mailer.idle();
    const unconfirmedTimes: number[] = [];
    const wrongTimes: number[] = [];
    for (let i = 0; i < 5; i += 1) {
      const [unconfirmed, unconfirmedMs] = await timed(() => h.browser().post('/api/auth/sign-in').send({ email: person(2).email, password: person(2).password }).expect(401));
      const [wrong, wrongMs] = await timed(() => h.browser().post('/api/auth/sign-in').send({ email: person(1).email, password: `not-the-password-${i}` }).expect(401));
      assert.deepEqual(unconfirmed.body, wrong.body);
      assert.equal(unconfirmed.headers['set-cookie'], wrong.headers['set-cookie']);
      unconfirmedTimes.push(unconfirmedMs);
      wrongTimes.push(wrongMs);
    }
    // Refused before the argon2id check, the unconfirmed account would answer in about a millisecond, against tens.
    assert.ok(median(unconfirmedTimes) > median(wrongTimes) / 3, `medians: unconfirmed ${median(unconfirmedTimes).toFixed(1)} ms, wrong ${median(wrongTimes).toFixed(1)} ms`);
  });
});

describe('a stranger cannot lock an account out', () => {
  let h: Harness;
  const owner = person(1);
  const fail = (xff: string, client = h.browser()) =>
    client.post('/api/auth/sign-in').set('X-Forwarded-For', xff).send({ email: owner.email, password: 'not-the-password' });
  before(async () => {
    h = await startHarness({ TRUST_PROXY: 'true', SIGNIN_LIMIT_PER_ACCOUNT: '3', SIGNIN_LIMIT_PER_IP: '1000' });
    await signUpVerified(h, 1);
  });
  after(() => h.close());

  test('failures count per account and source: the stranger is stopped, the owner elsewhere signs in', async () => {
    // Documentation addresses (RFC 5737).
    for (let i = 0; i < 3; i += 1) await fail('203.0.113.7').expect(401);
    assert.equal((await fail('203.0.113.7').expect(429)).body.error.code, 'rate_limited');
    await h.browser().post('/api/auth/sign-in').set('X-Forwarded-For', '198.51.100.2').send({ email: owner.email, password: owner.password }).expect(200);
  });

  test('the owner on a known device signs in even from the address the stranger exhausted', async () => {
    const device = h.browser();
    await device.post('/api/auth/sign-in').set('X-Forwarded-For', '192.0.2.50').send({ email: owner.email, password: owner.password }).expect(200);
    for (let i = 0; i < 3; i += 1) await fail('192.0.2.50').expect(401);
    await fail('192.0.2.50').expect(429);
    await device.post('/api/auth/sign-in').set('X-Forwarded-For', '192.0.2.50').send({ email: owner.email, password: owner.password }).expect(200);
    // A forged device cookie is just an unknown source.
    const forger = h.browser();
    await forger.post('/api/auth/sign-in').set('X-Forwarded-For', '192.0.2.50').set('Cookie', 'rungbook_device=abc.def').send({ email: owner.email, password: owner.password }).expect(429);
  });

  test('malformed attempts do not count against the account', async () => {
    for (let i = 0; i < 6; i += 1) {
      await h.browser().post('/api/auth/sign-in').set('X-Forwarded-For', '198.51.100.77').send({ email: owner.email, password: '' }).expect(400);
    }
    await h.browser().post('/api/auth/sign-in').set('X-Forwarded-For', '198.51.100.77').send({ email: owner.email, password: owner.password }).expect(200);
  });
});

describe('proxy headers without TRUST_PROXY', () => {
  test('X-Forwarded-For is ignored: a stranger cannot pose as many sources', async () => {
    const h = await startHarness({ SIGNIN_LIMIT_PER_ACCOUNT: '3', SIGNIN_LIMIT_PER_IP: '1000' });
    try {
      await signUpVerified(h, 1);
      for (let i = 0; i < 3; i += 1) {
        await h.browser().post('/api/auth/sign-in').set('X-Forwarded-For', `203.0.113.${i + 1}`).send({ email: person(1).email, password: 'not-the-password' }).expect(401);
      }
      await h.browser().post('/api/auth/sign-in').set('X-Forwarded-For', '203.0.113.99').send({ email: person(1).email, password: 'not-the-password' }).expect(429);
    } finally {
      await h.close();
    }
  });
});

describe('the local mail capture accepts only the server’s own messages', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness();
  });
  after(() => h.close());

  const rawClient = (auth?: { user: string; pass: string }) =>
    nodemailer.createTransport({ host: '127.0.0.1', port: h.config.mail.smtpPort, secure: false, ignoreTLS: true, auth });
  const planted = { from: 'intruder@test.rungbook.example', to: 'someone@test.rungbook.example', subject: 'Planted message', text: 'planted' };

  test('a client without the per-start credential, or with a wrong one, is refused and nothing is captured', async () => {
    await assert.rejects(rawClient().sendMail(planted), /530|Authentication required/i);
    await assert.rejects(rawClient({ user: 'rungbook', pass: 'guessed-password' }).sendMail(planted), /535|Invalid username or password/i);
    assert.equal((await h.capturedMail()).length, 0);
  });

  test('the server’s own mail is captured; the credential differs at every start', async () => {
    await h.browser().post('/api/auth/sign-up').send(person(1)).expect(202);
    await mailTo(h, person(1).email, CONFIRM);
    const other = await startHarness();
    try {
      assert.notEqual(other.rungbook.smtpFake!.credential.pass, h.rungbook.smtpFake!.credential.pass);
      assert.ok(h.rungbook.smtpFake!.credential.pass.length >= 32);
    } finally {
      await other.close();
    }
  });
});

describe('pre-registration takeover', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness({ RESET_LIMIT_PER_IP: '1000' });
  });
  after(() => h.close());

  test('an attacker signs up with the victim’s address: the link refuses the victim’s password, and a reset locks the attacker out', async () => {
    const victim = person(1);
    const attacker = { name: 'Invented Attacker', email: victim.email, password: 'attacker-knows-this-1' };
    await h.browser().post('/api/auth/sign-up').send(attacker).expect(202);
    const link = verificationTokenFrom((await mailTo(h, victim.email, CONFIRM)).textBody);
    // The unconfirmed account does not let its creator in.
    const attackerBrowser = h.browser();
    await attackerBrowser.post('/api/auth/sign-in').send({ email: victim.email, password: attacker.password }).expect(401);

    // The victim signs up later, is told someone tried, and follows the earlier link with their own password.
    await h.browser().post('/api/auth/sign-up').send(victim).expect(202);
    assert.match((await mailTo(h, victim.email, 'Someone tried to sign up with your address')).textBody, /forgot-password/);
    const victimBrowser = h.browser();
    const refused = await victimBrowser.post('/api/auth/verify').send({ token: link, password: victim.password }).expect(400);
    assert.match(refused.body.error.message, /different password[\s\S]*Forgot password/);
    await victimBrowser.get('/api/me').expect(401);

    // "Forgot password": the reset confirms the address and ends every session, the attacker's included.
    await h.browser().post('/api/auth/forgot').send({ email: victim.email }).expect(202);
    const reset = resetTokenFrom((await mailTo(h, victim.email, RESET)).textBody);
    await h.browser().post('/api/auth/reset').send({ token: reset, password: 'victims-own-password' }).expect(200);
    await h.browser().post('/api/auth/sign-in').send({ email: victim.email, password: attacker.password }).expect(401);
    // The reset spent the earlier link too: the attacker's password opens nothing through it.
    assert.equal((await h.browser().post('/api/auth/verify').send({ token: link, password: attacker.password }).expect(400)).body.error.code, 'invalid_verification_token');
    const signedIn = await victimBrowser.post('/api/auth/sign-in').send({ email: victim.email, password: 'victims-own-password' }).expect(200);
    assert.equal(signedIn.body.user.emailVerified, true);
  });
});

describe('sign-up does the same work before the reply for a new and a taken address', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness();
    await signUpVerified(h, 1);
  });
  after(() => h.close());

  test('before the reply: no database query at all; the lookup, the insert and the mail run after it', async () => {
    const { dataSource, emailVerification } = h.rungbook.services;
    const queued: Array<() => Promise<OutgoingMessage | null>> = [];
    const holdingMailer: Mailer = { send: async () => ({ delivered: true }), sendLater: (compose) => void queued.push(compose), idle: async () => {}, close: async () => {} };
    const accounts = createAccountService(dataSource, holdingMailer, emailVerification, 'http://localhost:8080');
    const queries: string[] = [];
    const logger = dataSource.logger as { logQuery: (query: string, ...rest: unknown[]) => unknown };
    const logQuery = logger.logQuery;
    logger.logQuery = (query, ...rest) => {
      queries.push(query);
      return logQuery.call(dataSource.logger, query, ...rest);
    };
    try {
      await accounts.signUp(person(2));
      await accounts.signUp({ ...person(1), name: 'Someone Else (invented)' });
      assert.deepEqual(queries, [], 'nothing touched the database before the replies');
      assert.equal(queued.length, 2);
      const [fresh, taken] = [await queued[0](), await queued[1]()];
      assert.ok(queries.some((q) => /INSERT INTO "users"/.test(q)));
      assert.equal(fresh?.subject, CONFIRM);
      assert.equal(taken?.subject, 'Someone tried to sign up with your address');
      assert.equal(await dataSource.getRepository(User).countBy({ emailKey: person(2).email }), 1);
    } finally {
      logger.logQuery = logQuery;
    }
  });
});

describe('a cap on failed sign-ins per account from all sources together', () => {
  let h: Harness;
  const owner = person(1);
  const attempt = (client: ReturnType<Harness['browser']>, xff: string, password: string) =>
    client.post('/api/auth/sign-in').set('X-Forwarded-For', xff).send({ email: owner.email, password });
  before(async () => {
    // Per-source limits out of the way, so only the cap across sources is at work.
    h = await startHarness({ TRUST_PROXY: 'true', SIGNIN_LIMIT_PER_ACCOUNT: '1000', SIGNIN_LIMIT_PER_IP: '1000' });
  });
  after(() => h.close());

  test('past 100 failures an hour from many addresses, the owner still signs in from a new browser, slowly; wrong passwords are refused', async () => {
    const { client: device } = await signUpVerified(h, 1);
    // 100 failures per hour: the documented cap. Addresses from the RFC 2544 benchmarking range, one per attempt.
    for (let batch = 0; batch < 10; batch += 1) {
      await Promise.all(Array.from({ length: 10 }, (_, i) => attempt(h.browser(), `198.18.${batch}.${i + 1}`, 'not-the-password').expect(401)));
    }
    const [refused, refusedMs] = await timed(() => attempt(h.browser(), '198.19.0.1', 'not-the-password').expect(429));
    assert.equal(refused.body.error.code, 'rate_limited');
    assert.ok(refusedMs >= SIGN_IN_DELAY_AT_CAP_MS - 5, `refused after ${refusedMs.toFixed(0)} ms`);
    // The owner, in a browser never used before, from a fresh address.
    const newBrowser = h.browser();
    const [signedIn, signedInMs] = await timed(() => attempt(newBrowser, '198.19.0.9', owner.password).expect(200));
    assert.equal(signedIn.body.user.email, owner.email);
    assert.ok(signedInMs >= SIGN_IN_DELAY_AT_CAP_MS - 5, `signed in after ${signedInMs.toFixed(0)} ms`);
    assert.equal((await newBrowser.get('/api/me').expect(200)).body.user.email, owner.email);
    // Other accounts are not affected.
    await signUpVerified(h, 2);
    await h.browser().post('/api/auth/sign-in').set('X-Forwarded-For', '198.19.0.2').send({ email: person(2).email, password: person(2).password }).expect(200);
    // The owner's known device (the confirming browser) is neither refused nor counted by the cap.
    await attempt(device, '198.19.0.3', 'a-typo-of-the-owner').expect(401);
    await attempt(device, '198.19.0.3', owner.password).expect(200);
  });
});

describe('known devices stay known across a restart', () => {
  test('after stop and start on the same database, the owner’s device passes the address a stranger exhausted', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-restart-'));
    const env = { DATABASE_PATH: path.join(dir, 'kept.sqlite'), TRUST_PROXY: 'true', SIGNIN_LIMIT_PER_ACCOUNT: '3', SIGNIN_LIMIT_PER_IP: '1000' };
    const owner = person(1);
    try {
      const first = await startHarness(env);
      let deviceCookie: string;
      try {
        await signUpVerified(first, 1);
        const signedIn = await first.browser().post('/api/auth/sign-in').set('X-Forwarded-For', '192.0.2.77').send({ email: owner.email, password: owner.password }).expect(200);
        deviceCookie = /rungbook_device=[^;]+/.exec(String(signedIn.headers['set-cookie']))![0];
      } finally {
        await first.close();
      }
      const second = await startHarness(env);
      try {
        // The browser keeps its cookie across the restart; the server it talks to is a new process.
        const again = second.browser().set('Cookie', deviceCookie);
        const fail = () => second.browser().post('/api/auth/sign-in').set('X-Forwarded-For', '192.0.2.77').send({ email: owner.email, password: 'not-the-password' });
        for (let i = 0; i < 3; i += 1) await fail().expect(401);
        await fail().expect(429);
        await again.post('/api/auth/sign-in').set('X-Forwarded-For', '192.0.2.77').send({ email: owner.email, password: owner.password }).expect(200);
        // The key is in the database, drawn once.
        assert.equal(await second.rungbook.services.dataSource.getRepository(ServerSecret).count(), 1);
      } finally {
        await second.close();
      }
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });

  test('two key loaders on one database agree: a cookie signed by one is recognised by the other', async () => {
    const h = await startHarness();
    try {
      const { dataSource } = h.rungbook.services;
      const [one, other] = [createKnownDevices(false, deviceKeyIn(dataSource)), createKnownDevices(false, deviceKeyIn(dataSource))];
      const cookie = (await one.cookieFor('owner@test.rungbook.example')).split(';')[0];
      const request = { headers: { cookie } } as Request;
      assert.ok(await other.deviceFor(request, 'owner@test.rungbook.example'));
      assert.equal(await other.deviceFor(request, 'someone-else@test.rungbook.example'), null);
      // A loader with a key of its own (as before keys were kept) does not recognise it.
      assert.equal(await createKnownDevices(false).deviceFor(request, 'owner@test.rungbook.example'), null);
    } finally {
      await h.close();
    }
  });
});
