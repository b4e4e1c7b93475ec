import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { loadConfig } from '../../../server/config';
import { AppError } from '../../../server/http/errors';
import { parseInput } from '../../../server/http/validation';
import { signUpInput } from '../../../shared/api/schemas';

describe('configuration from the environment', () => {
  test('defaults work with nothing set', () => {
    const config = loadConfig({});
    assert.equal(config.port, 8080);
    assert.equal(config.publicUrl, 'http://localhost:8080');
    assert.equal(config.mail.startFake, true);
    assert.equal(config.mail.smtpPort, 2525);
    assert.match(config.databasePath, /rungbook\.sqlite$/);
  });

  test('values from the environment win; PUBLIC_URL loses a trailing slash', () => {
    const config = loadConfig({ PORT: '9000', PUBLIC_URL: 'https://rb.example/', MAIL_FAKE: 'false', SMTP_HOST: 'mail.example', SMTP_PORT: '587' });
    assert.deepEqual([config.port, config.publicUrl, config.mail.startFake, config.mail.smtpHost, config.mail.smtpPort], [9000, 'https://rb.example', false, 'mail.example', 587]);
  });

  test('a non-numeric port is refused at start-up rather than ignored', () => {
    assert.throws(() => loadConfig({ PORT: 'eighty' }), /Expected an integer/);
  });
});

describe('input validation at the API edge', () => {
  test('returns the parsed value, trimmed', () => {
    const parsed = parseInput(signUpInput, { name: '  Invented Name ', email: ' x@y.example ', password: '0123456789' });
    assert.deepEqual(parsed, { name: 'Invented Name', email: 'x@y.example', password: '0123456789' });
  });

  test('collects one message per field and names unknown fields', () => {
    try {
      parseInput(signUpInput, { name: 'A', email: 'nope', password: '123', role: 'admin' });
      assert.fail('expected a validation error');
    } catch (error) {
      assert.ok(error instanceof AppError);
      assert.equal(error.status, 400);
      assert.deepEqual(Object.keys(error.fields ?? {}).sort(), ['email', 'password', 'role']);
      assert.equal(error.fields?.role, 'Unknown field');
    }
  });
});
