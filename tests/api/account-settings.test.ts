import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { sessionKey } from '../../server/auth/sessions';
import { Session, User } from '../../server/db/entities';
import { WRONG_PASSWORDS_PER_PERSON_PER_15_MIN } from '../../server/services/accountSettings';
import { deviceSummary } from '../../server/services/deviceSummary';
import { mailTo, startHarness, type Harness } from './harness';
import { createPerson, type Client, type TestPerson } from './people';

// User-Agent strings as browsers send them (formats recalled from memory; only their tokens matter here).
const FIREFOX_LINUX = 'Mozilla/5.0 (X11; Linux x86_64; rv:128.0) Gecko/20100101 Firefox/128.0';
const SAFARI_IPHONE = 'Mozilla/5.0 (iPhone; CPU iPhone OS 17_5 like Mac OS X) AppleWebKit/605.1.15 (KHTML, like Gecko) Version/17.5 Mobile/15E148 Safari/604.1';
const CHROME_ANDROID = 'Mozilla/5.0 (Linux; Android 14; Pixel 8) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/126.0.0.0 Mobile Safari/537.36';
const EDGE_WINDOWS = 'Mozilla/5.0 (Windows NT 10.0; Win64; x64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/126.0.0.0 Safari/537.36 Edg/126.0.0.0';
const CHROME_MAC = 'Mozilla/5.0 (Macintosh; Intel Mac OS X 10_15_7) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/126.0.0.0 Safari/537.36';

const CHANGE_LINK = /\/confirm-email\?token=([A-Za-z0-9_-]+)/;

function changeTokenFrom(text: string): string {
  const match = CHANGE_LINK.exec(text);
  if (!match) throw new Error(`No address-change link in: ${text}`);
  return match[1];
}

/** Sign the person in once more, in a new client that says it is this browser. */
async function signInFrom(h: Harness, who: TestPerson, userAgent: string, password = who.password): Promise<Client> {
  const client = h.browser().set('User-Agent', userAgent);
  await client.post('/api/auth/sign-in').send({ email: who.email, password }).expect(200);
  return client;
}

describe('device summaries of User-Agent strings', () => {
  test('browser and system are named in words; Edge, Chrome on Android and Safari on iPhone are not mistaken for their look-alikes', () => {
    assert.equal(deviceSummary(FIREFOX_LINUX), 'Firefox on Linux');
    assert.equal(deviceSummary(SAFARI_IPHONE), 'Safari on iPhone');
    assert.equal(deviceSummary(CHROME_ANDROID), 'Chrome on Android');
    assert.equal(deviceSummary(EDGE_WINDOWS), 'Edge on Windows');
    assert.equal(deviceSummary(CHROME_MAC), 'Chrome on macOS');
    assert.equal(deviceSummary(undefined), 'Unknown browser');
    assert.equal(deviceSummary('curl/8.5.0'), 'Unknown browser');
  });
});

describe('account settings: name, password, e-mail address, sessions', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness({ SIGNIN_LIMIT_PER_ACCOUNT: '1000', SIGNIN_LIMIT_PER_IP: '1000' });
  });
  after(() => h.close());

  const users = () => h.rungbook.services.dataSource.getRepository(User);

  test('the name changes for the person and is checked at the edge; signed-out callers are refused', async () => {
    const owner = await createPerson(h);
    const reply = await owner.client.patch('/api/me').send({ name: '  Invented Renamed  ' }).expect(200);
    assert.equal(reply.body.user.name, 'Invented Renamed');
    assert.equal((await owner.client.get('/api/me').expect(200)).body.user.name, 'Invented Renamed');
    const empty = await owner.client.patch('/api/me').send({ name: '   ' }).expect(400);
    assert.equal(empty.body.error.fields.name, 'Name is required');
    const extra = await owner.client.patch('/api/me').send({ name: 'Invented', siteRole: 'admin' }).expect(400);
    assert.equal(extra.body.error.code, 'validation_failed');
    assert.equal((await users().findOneByOrFail({ id: owner.id })).siteRole, 'member');
    await h.browser().patch('/api/me').send({ name: 'Nobody' }).expect(401);
  });

  test('a password change needs the current password, keeps this session and ends the others', async () => {
    const owner = await createPerson(h);
    const elsewhere = await signInFrom(h, owner, FIREFOX_LINUX);
    const wrong = await owner.client.post('/api/me/password').send({ currentPassword: 'not-the-password', newPassword: 'a-new-password-123' }).expect(403);
    assert.equal(wrong.body.error.code, 'wrong_password');
    assert.equal(wrong.body.error.fields.currentPassword, 'Not your current password');
    const same = await owner.client.post('/api/me/password').send({ currentPassword: owner.password, newPassword: owner.password }).expect(400);
    assert.equal(same.body.error.fields.newPassword, 'Choose a password different from the current one');
    const short = await owner.client.post('/api/me/password').send({ currentPassword: owner.password, newPassword: 'short' }).expect(400);
    assert.equal(short.body.error.fields.newPassword, 'Password must be at least 10 characters');

    const changed = await owner.client.post('/api/me/password').send({ currentPassword: owner.password, newPassword: 'a-new-password-123' }).expect(200);
    // Two sessions were open (createPerson's and `elsewhere`): one other ends.
    assert.equal(changed.body.ended, 1);
    assert.match(changed.body.message, /1 other session was signed out/);
    await owner.client.get('/api/me').expect(200);
    await elsewhere.get('/api/me').expect(401);
    await h.browser().post('/api/auth/sign-in').send({ email: owner.email, password: owner.password }).expect(401);
    await signInFrom(h, owner, FIREFOX_LINUX, 'a-new-password-123');
    // Still argon2id with the OWASP parameters (PHC string format, RFC 9106; OWASP Password Storage Cheat Sheet).
    assert.match((await users().findOneByOrFail({ id: owner.id })).passwordHash, /^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
  });

  test(`after ${WRONG_PASSWORDS_PER_PERSON_PER_15_MIN} wrong current passwords the next try is refused as rate-limited, even a right one`, async () => {
    const owner = await createPerson(h);
    for (let i = 0; i < WRONG_PASSWORDS_PER_PERSON_PER_15_MIN; i += 1) {
      await owner.client.post('/api/me/email').send({ email: 'elsewhere@test.rungbook.example', currentPassword: `wrong-${i}` }).expect(403);
    }
    const refused = await owner.client.post('/api/me/password').send({ currentPassword: owner.password, newPassword: 'a-new-password-123' }).expect(429);
    assert.match(refused.body.error.message, /Too many wrong passwords/);
  });

  test('an address change needs the password, mails a link to the new address, and changes the address only when the link is opened', async () => {
    const owner = await createPerson(h);
    const newEmail = `moved-${owner.id}@test.rungbook.example`;
    const wrong = await owner.client.post('/api/me/email').send({ email: newEmail, currentPassword: 'not-the-password' }).expect(403);
    assert.equal(wrong.body.error.code, 'wrong_password');
    const sameAddress = await owner.client.post('/api/me/email').send({ email: owner.email.toUpperCase(), currentPassword: owner.password }).expect(400);
    assert.equal(sameAddress.body.error.fields.email, 'This is already your address');
    const malformed = await owner.client.post('/api/me/email').send({ email: 'not an address', currentPassword: owner.password }).expect(400);
    assert.equal(malformed.body.error.fields.email, 'Enter a valid e-mail address');

    const started = await owner.client.post('/api/me/email').send({ email: newEmail, currentPassword: owner.password }).expect(202);
    assert.match(started.body.message, new RegExp(`sent a link to ${newEmail}`));
    const mail = await mailTo(h, newEmail, 'Confirm the new address of your Rungbook account');
    const token = changeTokenFrom(mail.textBody);
    assert.equal((await owner.client.get('/api/me').expect(200)).body.user.email, owner.email);
    // A change link is no sign-up confirmation.
    await h.browser().post('/api/auth/verify').send({ token, password: owner.password }).expect(400);

    const confirmed = await h.browser().post('/api/auth/email-change/confirm').send({ token }).expect(200);
    assert.equal(confirmed.body.user.email, newEmail);
    assert.equal((await owner.client.get('/api/me').expect(200)).body.user.email, newEmail);
    const notice = await mailTo(h, owner.email, 'The address of your Rungbook account has changed');
    assert.match(notice.textBody, new RegExp(`from ${owner.email} to ${newEmail}`));
    await h.browser().post('/api/auth/sign-in').send({ email: newEmail, password: owner.password }).expect(200);
    await h.browser().post('/api/auth/sign-in').send({ email: owner.email, password: owner.password }).expect(401);

    const reused = await h.browser().post('/api/auth/email-change/confirm').send({ token }).expect(400);
    assert.match(reused.body.error.message, /invalid, already used or expired/);
  });

  test('asking for a taken address answers like a free one; the owner of that address gets a note, no link, and nothing changes', async () => {
    const owner = await createPerson(h);
    const other = await createPerson(h);
    const free = `free-${owner.id}@test.rungbook.example`;
    const takenReply = await owner.client.post('/api/me/email').send({ email: other.email, currentPassword: owner.password }).expect(202);
    const freeReply = await owner.client.post('/api/me/email').send({ email: free, currentPassword: owner.password }).expect(202);
    assert.equal(takenReply.body.message, freeReply.body.message.replace(free, other.email));
    const note = await mailTo(h, other.email, 'Someone tried to move a Rungbook account to your address');
    assert.doesNotMatch(note.textBody, CHANGE_LINK);
    assert.equal((await users().findOneByOrFail({ id: other.id })).email, other.email);
    assert.equal((await users().findOneByOrFail({ id: owner.id })).email, owner.email);
  });

  test('a newer address-change link spends the older one', async () => {
    const owner = await createPerson(h);
    const first = `first-${owner.id}@test.rungbook.example`;
    const second = `second-${owner.id}@test.rungbook.example`;
    await owner.client.post('/api/me/email').send({ email: first, currentPassword: owner.password }).expect(202);
    const firstToken = changeTokenFrom((await mailTo(h, first, 'Confirm the new address of your Rungbook account')).textBody);
    await owner.client.post('/api/me/email').send({ email: second, currentPassword: owner.password }).expect(202);
    const secondToken = changeTokenFrom((await mailTo(h, second, 'Confirm the new address of your Rungbook account')).textBody);
    await h.browser().post('/api/auth/email-change/confirm').send({ token: firstToken }).expect(400);
    await h.browser().post('/api/auth/email-change/confirm').send({ token: secondToken }).expect(200);
    assert.equal((await users().findOneByOrFail({ id: owner.id })).email, second);
  });

  test('the session list names browsers, marks this device, and ends one or all other sessions', async () => {
    const owner = await createPerson(h);
    const here = await signInFrom(h, owner, FIREFOX_LINUX);
    const phone = await signInFrom(h, owner, SAFARI_IPHONE);
    const laptop = await signInFrom(h, owner, EDGE_WINDOWS);

    const listed = (await here.get('/api/me/sessions').expect(200)).body.sessions as { id: string; device: string; current: boolean; createdAt: string; lastSeenAt: string }[];
    // createPerson's session plus three sign-ins.
    assert.equal(listed.length, 4);
    assert.deepEqual(listed.filter((s) => s.current).map((s) => s.device), ['Firefox on Linux']);
    assert.ok(listed.some((s) => s.device === 'Safari on iPhone'));
    for (const session of listed) {
      assert.ok(!Number.isNaN(Date.parse(session.createdAt)));
      assert.ok(!Number.isNaN(Date.parse(session.lastSeenAt)));
    }
    // Neither the cookie's token nor the stored key is shown.
    const storedKeys = (await h.rungbook.services.dataSource.getRepository(Session).findBy({ userId: owner.id })).map((row) => row.id);
    assert.ok(listed.every((s) => !storedKeys.includes(s.id)));

    const current = listed.find((s) => s.current)!;
    const own = await here.delete(`/api/me/sessions/${current.id}`).expect(409);
    assert.match(own.body.error.message, /sign out/);
    const phoneSession = listed.find((s) => s.device === 'Safari on iPhone')!;
    await here.delete(`/api/me/sessions/${phoneSession.id}`).expect(200);
    await phone.get('/api/me').expect(401);
    await here.delete(`/api/me/sessions/${phoneSession.id}`).expect(404);
    await laptop.get('/api/me').expect(200);
    // Someone else's session cannot be ended by its listed id.
    const stranger = await createPerson(h);
    const laptopSession = listed.find((s) => s.device === 'Edge on Windows')!;
    await stranger.client.delete(`/api/me/sessions/${laptopSession.id}`).expect(404);
    await laptop.get('/api/me').expect(200);

    const endedOthers = await here.post('/api/me/sessions/end-others').send({}).expect(200);
    assert.equal(endedOthers.body.ended, 2);
    await laptop.get('/api/me').expect(401);
    await owner.client.get('/api/me').expect(401);
    const left = (await here.get('/api/me/sessions').expect(200)).body.sessions;
    assert.equal(left.length, 1);
    assert.equal(left[0].current, true);
    await here.delete('/api/me/sessions/not-a-session').expect(400);
  });

  test('every account route refuses signed-out callers', async () => {
    const anonymous = h.browser();
    await anonymous.get('/api/me/sessions').expect(401);
    await anonymous.post('/api/me/sessions/end-others').send({}).expect(401);
    await anonymous.delete(`/api/me/sessions/${'a'.repeat(32)}`).expect(401);
    await anonymous.post('/api/me/password').send({ currentPassword: 'x', newPassword: 'long-enough-new' }).expect(401);
    await anonymous.post('/api/me/email').send({ email: 'x@test.rungbook.example', currentPassword: 'x' }).expect(401);
  });

  test('the User-Agent of the signing-in browser is kept on the session row, found by the hash of the cookie token', async () => {
    const owner = await createPerson(h);
    const client = h.browser().set('User-Agent', CHROME_MAC);
    const reply = await client.post('/api/auth/sign-in').send({ email: owner.email, password: owner.password }).expect(200);
    const token = /rungbook_session=([a-z0-9]+)/.exec(String(reply.headers['set-cookie']))![1];
    const row = await h.rungbook.services.dataSource.getRepository(Session).findOneByOrFail({ id: sessionKey(token) });
    assert.equal(row.userAgent, CHROME_MAC);
  });
});
