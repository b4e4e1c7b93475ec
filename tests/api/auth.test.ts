import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { LessThan } from 'typeorm';
import { sessionKey } from '../../server/auth/sessions';
import { Session, User } from '../../server/db/entities';
import { mailTo, ORIGIN, person, signUpVerified, startHarness, verificationTokenFrom, type Harness } from './harness';

describe('sign-up, sign-in, sign-out, current user', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness({ SIGNIN_LIMIT_PER_ACCOUNT: '3', SIGNIN_LIMIT_PER_IP: '1000' });
  });
  after(() => h.close());

  const userCount = () => h.rungbook.services.dataSource.getRepository(User).count();

  test('sign-up creates an unconfirmed account without a session; the e-mailed link and the password confirm it and sign in with an HttpOnly SameSite=Lax cookie', async () => {
    const client = h.browser();
    const reply = await client.post('/api/auth/sign-up').send(person(1)).expect(202);
    assert.deepEqual(Object.keys(reply.body), ['message']);
    assert.match(reply.body.message, /person1@test\.rungbook\.example/);
    assert.equal(reply.headers['set-cookie'], undefined);
    await client.get('/api/me').expect(401);
    const mail = await mailTo(h, person(1).email, 'Confirm your Rungbook e-mail address');
    const stored = await h.rungbook.services.dataSource.getRepository(User).findOneByOrFail({ emailKey: person(1).email });
    assert.equal(stored.emailVerifiedAt, null);
    const token = verificationTokenFrom(mail.textBody);
    const noPassword = await client.post('/api/auth/verify').send({ token }).expect(400);
    assert.equal(noPassword.body.error.code, 'validation_failed');
    assert.ok(noPassword.body.error.fields.password);
    const verified = await client.post('/api/auth/verify').send({ token, password: person(1).password }).expect(200);
    assert.equal(verified.body.user.email, person(1).email);
    assert.equal(verified.body.user.siteRole, 'member');
    assert.equal(verified.body.user.emailVerified, true);
    const cookie = String(verified.headers['set-cookie']);
    // Cookie attributes per RFC 6265 / the SameSite draft: HttpOnly, SameSite=Lax; not Secure on http.
    assert.match(cookie, /rungbook_session=[a-z0-9]+/);
    assert.match(cookie, /HttpOnly/);
    assert.match(cookie, /SameSite=Lax/);
    assert.doesNotMatch(cookie, /Secure/);
    const me = await client.get('/api/me').expect(200);
    assert.equal(me.body.user.name, person(1).name);
    assert.equal(me.body.user.emailVerified, true);
  });

  test('the stored password is an argon2id hash with the OWASP parameters (m=19456 KiB, t=2, p=1)', async () => {
    const stored = await h.rungbook.services.dataSource.getRepository(User).findOneByOrFail({ emailKey: person(1).email });
    // PHC string format of argon2 (RFC 9106 §4 parameters, OWASP Password Storage Cheat Sheet values).
    assert.match(stored.passwordHash, /^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
    assert.ok(!stored.passwordHash.includes(person(1).password));
  });

  test('a taken e-mail (differing only in case) gets the reply a new one gets, nothing is written, and the owner is told', async () => {
    const before = await userCount();
    const taken = { ...person(1), email: person(1).email.toUpperCase() };
    const reply = await h.browser().post('/api/auth/sign-up').send(taken).expect(202);
    const fresh = await h.browser().post('/api/auth/sign-up').send(person(6)).expect(202);
    assert.deepEqual(Object.keys(reply.body), Object.keys(fresh.body));
    assert.equal(reply.body.message, fresh.body.message.replace(person(6).email, taken.email));
    assert.equal(reply.headers['set-cookie'], undefined);
    // The account is written after the reply, with the mail.
    await h.rungbook.services.mailer.idle();
    assert.equal(await userCount(), before + 1, 'only the new address made an account');
    const note = await mailTo(h, person(1).email, 'Someone tried to sign up with your address');
    assert.match(note.textBody, /\/forgot-password/);
    // An owner who never finished a sign-up is told how to take the address back.
    assert.match(note.textBody, /never finished it[\s\S]*forgot-password[\s\S]*signs everyone else out/);
    assert.doesNotMatch(note.textBody, /verify-email/);
  });

  test('bad sign-up input gives 400 with a message per field and writes nothing', async () => {
    const before = await userCount();
    const reply = await h.browser().post('/api/auth/sign-up').send({ name: ' ', email: 'not-an-address', password: 'short' }).expect(400);
    assert.equal(reply.body.error.code, 'validation_failed');
    assert.deepEqual(Object.keys(reply.body.error.fields).sort(), ['email', 'name', 'password']);
    assert.match(reply.body.error.fields.password, /at least 10/);
    const missing = await h.browser().post('/api/auth/sign-up').send({}).expect(400);
    assert.deepEqual(Object.keys(missing.body.error.fields).sort(), ['email', 'name', 'password']);
    const extra = await h.browser().post('/api/auth/sign-up').send({ ...person(9), siteRole: 'admin' }).expect(400);
    assert.equal(extra.body.error.fields.siteRole, 'Unknown field');
    assert.equal(await userCount(), before);
  });

  test('sign-in accepts the e-mail in any case; a wrong password is a 401 with a clear message', async () => {
    const ok = await h.browser().post('/api/auth/sign-in').send({ email: '  PERSON1@Test.Rungbook.Example ', password: person(1).password }).expect(200);
    assert.equal(ok.body.user.email, person(1).email);
    const wrong = await h.browser().post('/api/auth/sign-in').send({ email: person(1).email, password: 'not-the-password' }).expect(401);
    assert.equal(wrong.body.error.code, 'wrong_credentials');
    const unknown = await h.browser().post('/api/auth/sign-in').send({ email: 'nobody@test.rungbook.example', password: 'whatever-pass' }).expect(401);
    assert.equal(unknown.body.error.message, wrong.body.error.message, 'unknown account and wrong password look the same');
  });

  test('an unconfirmed account cannot sign in: sign-up then sign-in with the same password answers exactly like a wrong password', async () => {
    // Without this, signing up an address and signing in with the chosen password would tell whether it was free.
    await h.browser().post('/api/auth/sign-up').send(person(7)).expect(202);
    await h.rungbook.services.mailer.idle();
    const unconfirmed = await h.browser().post('/api/auth/sign-in').send({ email: person(7).email, password: person(7).password }).expect(401);
    const wrong = await h.browser().post('/api/auth/sign-in').send({ email: person(1).email, password: 'not-the-password-7' }).expect(401);
    assert.deepEqual(unconfirmed.body, wrong.body);
    assert.equal(unconfirmed.headers['set-cookie'], undefined);
    // The confirmation link with the password signs its owner in.
    const link = verificationTokenFrom((await mailTo(h, person(7).email, 'Confirm your Rungbook e-mail address')).textBody);
    const client = h.browser();
    await client.post('/api/auth/verify').send({ token: link, password: person(7).password }).expect(200);
    assert.equal((await client.get('/api/me').expect(200)).body.user.emailVerified, true);
    await h.browser().post('/api/auth/sign-in').send({ email: person(7).email, password: person(7).password }).expect(200);
  });

  test('repeated failures for one account from one source are rate-limited with 429, even from a fresh client', async () => {
    await signUpVerified(h, 2);
    for (let attempt = 0; attempt < 3; attempt += 1) {
      await h.browser().post('/api/auth/sign-in').send({ email: person(2).email, password: 'wrong-password' }).expect(401);
    }
    const limited = await h.browser().post('/api/auth/sign-in').send({ email: person(2).email, password: person(2).password }).expect(429);
    assert.equal(limited.body.error.code, 'rate_limited');
  });

  test('sign-out ends the session on the server: the old cookie no longer works', async () => {
    const client = h.browser();
    const signIn = await client.post('/api/auth/sign-in').send({ email: person(1).email, password: person(1).password }).expect(200);
    const cookie = String(signIn.headers['set-cookie']).split(';')[0];
    await client.post('/api/auth/sign-out').send({}).expect(204);
    await h.raw.get('/api/me').set('Cookie', cookie).expect(401);
  });

  test('an expired session is refused with 401 and its cookie is cleared', async () => {
    const client = h.browser();
    const signIn = await client.post('/api/auth/sign-in').send({ email: person(1).email, password: person(1).password }).expect(200);
    const cookie = String(signIn.headers['set-cookie']).split(';')[0];
    const sessionId = cookie.split('=')[1];
    await h.rungbook.services.dataSource.getRepository(Session).update({ id: sessionKey(sessionId) }, { expiresAt: new Date(Date.now() - 1000) });
    const reply = await h.raw.get('/api/me').set('Cookie', cookie).expect(401);
    assert.equal(reply.body.error.code, 'unauthenticated');
    assert.match(String(reply.headers['set-cookie']), /Max-Age=0/);
    assert.equal(await h.rungbook.services.dataSource.getRepository(Session).countBy({ expiresAt: LessThan(new Date()) }), 0);
  });

  test('a mangled session cookie is treated as no session (401), not a server error', async () => {
    const reply = await h.raw.get('/api/me').set('Cookie', 'rungbook_session=%E0%A4%A').expect(401);
    assert.equal(reply.body.error.code, 'unauthenticated');
    await h.raw.get('/api/health').set('Cookie', 'rungbook_session=%E0%A4%A').expect(200);
  });

  test('/me without a session is 401', async () => {
    const reply = await h.raw.get('/api/me').expect(401);
    assert.equal(reply.body.error.code, 'unauthenticated');
  });

  test('cookie-carrying requests from another site, or that hide their origin, are refused (CSRF)', async () => {
    const client = h.browser();
    const signIn = await client.post('/api/auth/sign-in').send({ email: person(1).email, password: person(1).password }).expect(200);
    const cookie = String(signIn.headers['set-cookie']).split(';')[0];
    const foreign = await h.raw.post('/api/groups').set('Cookie', cookie).set('Origin', 'https://elsewhere.example').send({ name: 'Hijacked' }).expect(403);
    assert.equal(foreign.body.error.code, 'cross_site_request');
    await h.raw.post('/api/groups').set('Cookie', cookie).send({ name: 'No origin' }).expect(403);
    await h.raw.post('/api/groups').set('Cookie', cookie).set('Referer', `${ORIGIN}/groups`).send({ name: 'Referer ok' }).expect(201);
    await h.raw.post('/api/auth/sign-out').set('Cookie', cookie).set('Origin', 'https://elsewhere.example').send({}).expect(403);
    await h.raw.get('/api/me').set('Cookie', cookie).expect(200);
  });
});

describe('session cookie over https', () => {
  test('is marked Secure when PUBLIC_URL is https', async () => {
    const h = await startHarness({ PUBLIC_URL: 'https://rungbook.example' });
    try {
      await h.raw.post('/api/auth/sign-up').set('Origin', 'https://rungbook.example').send(person(3)).expect(202);
      const mail = await mailTo(h, person(3).email, 'Confirm your Rungbook e-mail address');
      assert.match(mail.textBody, /https:\/\/rungbook\.example\/verify-email\?token=/);
      const reply = await h.raw.post('/api/auth/verify').set('Origin', 'https://rungbook.example').send({ token: verificationTokenFrom(mail.textBody), password: person(3).password }).expect(200);
      assert.match(String(reply.headers['set-cookie']), /rungbook_session=[^;]+;[^,]*; Secure/);
    } finally {
      await h.close();
    }
  });
});

describe('sign-in rate limit per network address', () => {
  test('too many attempts from one address get 429', async () => {
    const h = await startHarness({ SIGNIN_LIMIT_PER_IP: '2' });
    try {
      await h.browser().post('/api/auth/sign-in').send({ email: 'a@test.rungbook.example', password: 'x' }).expect(401);
      await h.browser().post('/api/auth/sign-in').send({ email: 'b@test.rungbook.example', password: 'x' }).expect(401);
      const limited = await h.browser().post('/api/auth/sign-in').send({ email: 'c@test.rungbook.example', password: 'x' }).expect(429);
      assert.equal(limited.body.error.code, 'rate_limited');
    } finally {
      await h.close();
    }
  });

  test('successes do not use up the allowance, and a known device of the named account passes an address a stranger spent', async () => {
    const h = await startHarness({ SIGNIN_LIMIT_PER_IP: '2', SIGNIN_LIMIT_PER_ACCOUNT: '1000' });
    try {
      // Confirming the address with the password makes this browser a known device of person 1.
      const { client: device } = await signUpVerified(h, 1);
      const rightPassword = { email: person(1).email, password: person(1).password };
      for (let i = 0; i < 3; i += 1) await h.browser().post('/api/auth/sign-in').send(rightPassword).expect(200);
      // A stranger behind the same address (campus NAT) spends its allowance with failures.
      await h.browser().post('/api/auth/sign-in').send({ email: 'a@test.rungbook.example', password: 'x' }).expect(401);
      await h.browser().post('/api/auth/sign-in').send({ email: 'b@test.rungbook.example', password: 'x' }).expect(401);
      await h.browser().post('/api/auth/sign-in').send({ email: 'c@test.rungbook.example', password: 'x' }).expect(429);
      await device.post('/api/auth/sign-in').send(rightPassword).expect(200);
      // The device is known for person 1 only; a new browser is counted by its address.
      await device.post('/api/auth/sign-in').send({ email: 'd@test.rungbook.example', password: 'x' }).expect(429);
      await h.browser().post('/api/auth/sign-in').send(rightPassword).expect(429);
    } finally {
      await h.close();
    }
  });
});
