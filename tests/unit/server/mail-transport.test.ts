import assert from 'node:assert/strict';
import type { AddressInfo } from 'node:net';
import { test } from 'node:test';
import { pino } from 'pino';
import { SMTPServer } from 'smtp-server';
import { loadConfig } from '../../../server/config';
import { createMailer, transportOptions } from '../../../server/mail/mailer';

// nodemailer's SMTP transport: `requireTLS` makes it refuse to go on unless STARTTLS succeeds;
// `secure` means TLS from the first byte (port 465), where STARTTLS does not apply.
const relay = (env: Record<string, string> = {}) =>
  loadConfig({ NODE_ENV: 'production', SMTP_HOST: 'mail.example', SMTP_PORT: '587', SMTP_USER: 'rungbook', SMTP_PASSWORD: 'relay-secret', ...env }).mail;

test('a real relay must upgrade to TLS before credentials or links are sent', () => {
  const options = transportOptions(relay());
  assert.equal(options.requireTLS, true);
  assert.equal(options.ignoreTLS, false);
  assert.deepEqual(options.auth, { user: 'rungbook', pass: 'relay-secret' });
});

test('a relay that speaks TLS from the start (SMTP_SECURE) needs no STARTTLS', () => {
  const options = transportOptions(relay({ SMTP_SECURE: 'true', SMTP_PORT: '465' }));
  assert.equal(options.secure, true);
  assert.equal(options.requireTLS, false);
});

test('SMTP_REQUIRE_TLS=false lets an operator send to a relay without TLS', () => {
  assert.equal(transportOptions(relay({ SMTP_REQUIRE_TLS: 'false' })).requireTLS, false);
});

test('the local mail fake speaks plain SMTP on loopback with its per-start credential', () => {
  const credential = { user: 'rungbook', pass: 'per-start-credential' };
  const options = transportOptions(loadConfig({}).mail, credential);
  assert.equal(options.requireTLS, false);
  assert.equal(options.ignoreTLS, true);
  assert.deepEqual(options.auth, credential);
});

test('a relay that offers no STARTTLS gets nothing: the message is refused before it is sent', async () => {
  const received: string[] = [];
  // A plain-text relay on loopback (smtp-server with STARTTLS switched off).
  const plainRelay = new SMTPServer({
    disabledCommands: ['STARTTLS', 'AUTH'],
    onData(stream, _session, callback) {
      stream.on('data', (chunk: Buffer) => received.push(chunk.toString()));
      stream.on('end', () => callback());
    },
  });
  await new Promise<void>((resolve) => plainRelay.listen(0, '127.0.0.1', resolve));
  const port = (plainRelay.server.address() as AddressInfo).port;
  const config = loadConfig({ MAIL_FAKE: 'false', SMTP_HOST: '127.0.0.1', SMTP_PORT: String(port) }).mail;
  const mailer = createMailer(config, pino({ level: 'silent' }));
  try {
    const { delivered } = await mailer.send({ to: 'someone@test.rungbook.example', subject: 'Invented', text: 'a sign-in link' });
    assert.equal(delivered, false);
    assert.deepEqual(received, []);
  } finally {
    await mailer.close();
    await new Promise<void>((resolve) => plainRelay.close(() => resolve()));
  }
});
