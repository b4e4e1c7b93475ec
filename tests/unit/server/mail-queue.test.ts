import assert from 'node:assert/strict';
import { test } from 'node:test';
import { pino } from 'pino';
import { loadConfig } from '../../../server/config';
import { createMailer } from '../../../server/mail/mailer';

// Port 9 (discard) is closed on test machines: every delivery fails at connect.
const unreachable = () => loadConfig({ MAIL_FAKE: 'false', SMTP_HOST: '127.0.0.1', SMTP_PORT: '9' }).mail;

test('sendLater returns before composing; a failed delivery is logged and runs the undelivered hook', async () => {
  const logged: string[] = [];
  const logger = pino({ level: 'info' }, { write: (line: string) => void logged.push(JSON.parse(line).msg) });
  const mailer = createMailer(unreachable(), logger);
  const steps: string[] = [];
  mailer.sendLater(
    async () => {
      steps.push('composed');
      return { to: 'someone@test.rungbook.example', subject: 'Invented', text: 'x' };
    },
    async () => void steps.push('undelivered'),
  );
  steps.push('returned');
  await mailer.idle();
  assert.deepEqual(steps, ['returned', 'composed', 'undelivered']);
  assert.ok(logged.includes('mail delivery failed'));
  await mailer.close();
});

test('nothing is sent when compose has nothing to say, and a throwing compose is logged, not thrown', async () => {
  const logged: string[] = [];
  const logger = pino({ level: 'info' }, { write: (line: string) => void logged.push(JSON.parse(line).msg) });
  const mailer = createMailer(unreachable(), logger);
  let undelivered = 0;
  mailer.sendLater(async () => null, async () => void (undelivered += 1));
  mailer.sendLater(async () => {
    throw new Error('invented failure');
  });
  await mailer.close();
  assert.equal(undelivered, 0);
  assert.deepEqual(logged, ['background mail task failed']);
});
