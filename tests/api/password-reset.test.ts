import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { PasswordResetToken, User } from '../../server/db/entities';
import { person, resetTokenFrom, signUpVerified, startHarness, waitForMail, type Harness } from './harness';

describe('forgot password → e-mailed single-use link → new password', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness();
    await signUpVerified(h, 1);
  });
  after(() => h.close());

  async function requestLink(): Promise<string> {
    const already = (await h.capturedMail()).length;
    await h.browser().post('/api/auth/forgot').send({ email: person(1).email.toUpperCase() }).expect(202);
    const mail = await waitForMail(h, already + 1);
    const message = mail[mail.length - 1];
    assert.equal(message.subject, 'Reset your Rungbook password');
    assert.match(message.recipients, /person1@test\.rungbook\.example/);
    return resetTokenFrom(message.textBody);
  }

  test('the link arrives through SMTP in the mail capture and resets the password once', async () => {
    const signedIn = h.browser();
    await signedIn.post('/api/auth/sign-in').send({ email: person(1).email, password: person(1).password }).expect(200);
    const token = await requestLink();
    assert.ok(token.length >= 40);
    await h.browser().post('/api/auth/reset').send({ token, password: 'a-brand-new-password' }).expect(200);
    await h.browser().post('/api/auth/sign-in').send({ email: person(1).email, password: person(1).password }).expect(401);
    await h.browser().post('/api/auth/sign-in').send({ email: person(1).email, password: 'a-brand-new-password' }).expect(200);
    // Sessions opened before the reset are ended.
    await signedIn.get('/api/me').expect(401);
    const reused = await h.browser().post('/api/auth/reset').send({ token, password: 'yet-another-password' }).expect(400);
    assert.equal(reused.body.error.code, 'invalid_reset_token');
    await h.browser().post('/api/auth/sign-in').send({ email: person(1).email, password: 'a-brand-new-password' }).expect(200);
  });

  test('only the token hash is stored, never the token', async () => {
    const token = await requestLink();
    const rows = await h.rungbook.services.dataSource.getRepository(PasswordResetToken).find();
    assert.ok(rows.every((row) => row.tokenHash !== token && /^[0-9a-f]{64}$/.test(row.tokenHash)));
  });

  test('an expired link is refused and the password stays as it was', async () => {
    const token = await requestLink();
    await h.rungbook.services.dataSource
      .getRepository(PasswordResetToken)
      .createQueryBuilder()
      .update()
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where('"usedAt" IS NULL')
      .execute();
    const hashBefore = (await h.rungbook.services.dataSource.getRepository(User).findOneByOrFail({ emailKey: person(1).email })).passwordHash;
    const reply = await h.browser().post('/api/auth/reset').send({ token, password: 'expired-attempt-pass' }).expect(400);
    assert.equal(reply.body.error.code, 'invalid_reset_token');
    const hashAfter = (await h.rungbook.services.dataSource.getRepository(User).findOneByOrFail({ emailKey: person(1).email })).passwordHash;
    assert.equal(hashAfter, hashBefore);
  });

  test('a made-up or malformed token is refused', async () => {
    const madeUp = await h.browser().post('/api/auth/reset').send({ token: 'A'.repeat(43), password: 'whatever-new-pass' }).expect(400);
    assert.equal(madeUp.body.error.code, 'invalid_reset_token');
    const malformed = await h.browser().post('/api/auth/reset').send({ token: '../etc', password: 'whatever-new-pass' }).expect(400);
    assert.equal(malformed.body.error.code, 'validation_failed');
    assert.ok(malformed.body.error.fields.token);
  });

  test('an unknown e-mail gets the same 202 reply and no message is sent', async () => {
    const before = (await h.capturedMail()).length;
    const reply = await h.browser().post('/api/auth/forgot').send({ email: 'nobody@test.rungbook.example' }).expect(202);
    assert.match(reply.body.message, /If an account has this e-mail/);
    await new Promise((resolve) => setTimeout(resolve, 300));
    assert.equal((await h.capturedMail()).length, before);
  });
});

describe('when the mail service is down', () => {
  let h: Harness;
  before(async () => {
    // Point the mailer at a closed port: every delivery fails.
    h = await startHarness({ MAIL_FAKE: 'false', SMTP_PORT: '9' });
  });
  after(() => h.close());

  test('sign-up still answers 202 (mail goes out after the reply) and the account exists', async () => {
    const reply = await h.browser().post('/api/auth/sign-up').send(person(5)).expect(202);
    assert.match(reply.body.message, /sent a message/);
    // The account is written after the reply, whether or not its mail then goes out.
    await h.rungbook.services.mailer.idle();
    assert.equal(await h.rungbook.services.dataSource.getRepository(User).countBy({ emailKey: person(5).email }), 1);
  });

  test('forgot password answers 202 as always, and the link that could not be sent is not left usable', async () => {
    await h.browser().post('/api/auth/forgot').send({ email: person(5).email }).expect(202);
    await h.rungbook.services.mailer.idle();
    assert.equal(await h.rungbook.services.dataSource.getRepository(PasswordResetToken).count(), 0);
  });
});
