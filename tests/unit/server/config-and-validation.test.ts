import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import fc from 'fast-check';
import { loadConfig } from '../../../server/config';
import { AppError } from '../../../server/http/errors';
import { MAX_BODY_DEPTH, nestsDeeperThan } from '../../../server/http/hardening';
import { NUL_TEXT_MESSAGE, findBrokenText, findNulText, parseInput } from '../../../server/http/validation';
import { signUpInput } from '../../../shared/api/schemas';
import { notebookDocument } from '../../../shared/notebook/exports';

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

  const fieldsOf = (schema: Parameters<typeof parseInput>[0], value: unknown) => {
    try {
      parseInput(schema, value);
    } catch (error) {
      assert.ok(error instanceof AppError);
      assert.equal(error.status, 400);
      return error.fields ?? {};
    }
    return assert.fail('expected a validation error');
  };

  test('a lone UTF-16 surrogate, in a value or a field name at any depth, is refused naming the field (well-formed strings: ECMA-262 IsStringWellFormedUnicode)', () => {
    assert.deepEqual(Object.keys(fieldsOf(signUpInput, { name: 'Invented \ud800', email: 'x@y.example', password: '0123456789' })), ['name']);
    assert.deepEqual(Object.keys(fieldsOf(signUpInput, { name: 'x', email: '\udfff@y.example', password: '0123456789' })), ['email']);
    const document = { format: 'rungbook-notebook', formatVersion: 1, title: 't', cells: [{ label: 'a', input: { kind: 'note', text: 'ok \udbff' } }] };
    assert.deepEqual(Object.keys(fieldsOf(notebookDocument, document)), ['cells.0.input.text']);
    assert.deepEqual(findBrokenText({ q: { ['k\ud800']: 'v' } }), 'q.k\ud800');
    // Surrogate pairs in either order of appearance: only the unpaired ones count.
    assert.equal(findBrokenText({ a: '\ud835\udec6', b: ['\ud83d\ude00'] }), undefined);
    assert.equal(findBrokenText(['\ude00\ud83d']), '0');
  });

  test('a NUL character (U+0000), in a value or a field name, is refused naming the field: PostgreSQL text cannot hold it (PostgreSQL docs, "Character Types"; common practice)', () => {
    assert.deepEqual(fieldsOf(signUpInput, { name: 'Invented\u0000', email: 'x@y.example', password: '0123456789' }), { name: NUL_TEXT_MESSAGE });
    const document = { format: 'rungbook-notebook', formatVersion: 1, title: 't', cells: [{ label: 'a', input: { kind: 'note', text: 'a\u0000b' } }] };
    assert.deepEqual(Object.keys(fieldsOf(notebookDocument, document)), ['cells.0.input.text']);
    assert.equal(findNulText({ q: { ['k\u0000']: 'v' } }), 'q.k\u0000');
    assert.equal(findNulText({ a: 'no nul here', b: ['\u0001\u007f'] }), undefined, 'other control characters are storable');
  });

  test('agrees with String.prototype.isWellFormed (ECMA-262, in Node 20) on arbitrary UTF-16 code-unit strings', () => {
    const codeUnit = fc.integer({ min: 0, max: 0xffff }).map((unit) => String.fromCharCode(unit));
    const surrogateHeavy = fc.constantFrom('\ud800', '\udbff', '\udc00', '\udfff', 'a');
    fc.assert(
      fc.property(fc.string({ unit: fc.oneof(codeUnit, surrogateHeavy), maxLength: 12 }), (text) => {
        const wellFormed = (text as unknown as { isWellFormed(): boolean }).isWellFormed();
        assert.equal(findBrokenText({ text }) === undefined, wellFormed, JSON.stringify(text));
      }),
      { numRuns: 2000 },
    );
  });

  test('field names such as __proto__ and constructor are reported as unknown fields, with their path', () => {
    const fields = fieldsOf(signUpInput, JSON.parse('{"name":"A","email":"x@y.example","password":"0123456789","__proto__":{"a":1},"constructor":1}'));
    assert.deepEqual(Object.keys(fields).sort(), ['__proto__', 'constructor']);
    assert.equal(Object.getPrototypeOf(fields), Object.prototype);
    const document = JSON.parse('{"format":"rungbook-notebook","formatVersion":1,"title":"t","cells":[{"label":"a","input":{"kind":"note","text":"x"},"prototype":1}]}');
    assert.equal(fieldsOf(notebookDocument, document)['cells.0.prototype'], 'Unknown field');
  });
});

describe('body nesting bound', () => {
  const nested = (depth: number) => JSON.parse('['.repeat(depth) + ']'.repeat(depth));

  test('counts arrays and objects, not scalars', () => {
    assert.equal(nestsDeeperThan(nested(MAX_BODY_DEPTH), MAX_BODY_DEPTH), false);
    assert.equal(nestsDeeperThan(nested(MAX_BODY_DEPTH + 1), MAX_BODY_DEPTH), true);
    assert.equal(nestsDeeperThan({ a: { b: 'text' } }, 2), false);
    assert.equal(nestsDeeperThan({ a: { b: {} } }, 2), true);
    assert.equal(nestsDeeperThan('x', 0), false);
  });

  test('a nesting far beyond what recursion survives is measured without overflowing the stack', () => {
    assert.equal(nestsDeeperThan(nested(200_000), MAX_BODY_DEPTH), true);
  });
});
