import assert from 'node:assert/strict';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import zlib from 'node:zlib';
import { after, afterEach, before, describe, test } from 'node:test';
import { ORIGIN, startHarness, type Harness } from './harness';
import { createPerson, type TestPerson } from './people';

/** A request with exact bytes and headers (supertest re-serialises Buffers sent as JSON). */
function rawRequest(port: number, method: string, path: string, headers: Record<string, string | number>, body?: Buffer | string) {
  return new Promise<{ status: number; headers: http.IncomingHttpHeaders; json: unknown }>((resolve, reject) => {
    const request = http.request({ host: '127.0.0.1', port, method, path, headers }, (response) => {
      const chunks: Buffer[] = [];
      response.on('data', (chunk: Buffer) => chunks.push(chunk));
      response.on('end', () => {
        const text = Buffer.concat(chunks).toString('utf8');
        let json: unknown = null;
        try {
          json = JSON.parse(text);
        } catch {
          json = text;
        }
        resolve({ status: response.statusCode ?? 0, headers: response.headers, json });
      });
    });
    request.on('error', reject);
    request.end(body);
  });
}

const errorOf = (json: unknown) => (json as { error: { code: string; message: string; fields?: Record<string, string> } }).error;

describe('bad input gets a clear 4xx JSON error, never a 500', () => {
  let h: Harness;
  let server: http.Server;
  let port: number;
  let member: TestPerson;

  before(async () => {
    h = await startHarness();
    server = http.createServer(h.rungbook.app).listen(0, '127.0.0.1');
    await new Promise((resolve) => server.once('listening', resolve));
    port = (server.address() as AddressInfo).port;
    member = await createPerson(h);
  });
  after(async () => {
    await new Promise((resolve) => server.close(resolve));
    await h.close();
  });
  afterEach(async () => {
    await h.raw.get('/api/health').expect(200);
  });

  const signInBody = JSON.stringify({ email: 'nobody@test.rungbook.example', password: 'long-enough-pass' });
  const jsonPost = (body: Buffer | string, encoding?: string) =>
    rawRequest(port, 'POST', '/api/auth/sign-in', { 'content-type': 'application/json', 'content-length': Buffer.byteLength(body), origin: ORIGIN, ...(encoding ? { 'content-encoding': encoding } : {}) }, body);

  test('a gzip or deflate body reads exactly like the plain one (RFC 9110 §8.4: gzip and deflate content codings)', async () => {
    const plain = await jsonPost(signInBody);
    assert.equal(plain.status, 401);
    for (const [encoding, body] of [['gzip', zlib.gzipSync(signInBody)], ['deflate', zlib.deflateSync(signInBody)], ['identity', Buffer.from(signInBody)]] as const) {
      const reply = await jsonPost(body, encoding);
      assert.deepEqual([reply.status, reply.json], [plain.status, plain.json], encoding);
    }
  });

  test('any other Content-Encoding on a body is 415 unsupported_encoding', async () => {
    for (const [encoding, body] of [['br', zlib.brotliCompressSync(signInBody)], ['zstd', Buffer.from(signInBody)], ['x-garbage', Buffer.from(signInBody)], ['gzip, br', zlib.gzipSync(signInBody)]] as const) {
      const reply = await jsonPost(body, encoding);
      assert.equal(reply.status, 415, encoding);
      assert.equal(errorOf(reply.json).code, 'unsupported_encoding');
      assert.match(errorOf(reply.json).message, /gzip or deflate/);
    }
  });

  test('a body that claims gzip but is not is a 400', async () => {
    const reply = await jsonPost('not gzip at all', 'gzip');
    assert.equal(reply.status, 400);
    assert.equal(errorOf(reply.json).code, 'validation_failed');
  });

  test('malformed percent-encoding in the path is a 400 on API routes, app routes and static files', async () => {
    // "%E0%A4%A" is a truncated UTF-8 sequence, "%ff" is not UTF-8, "%" alone is not an escape (RFC 3986 §2.1).
    for (const path of ['/api/notebooks/%E0%A4%A', '/api/%ff', '/api/notebooks/%', '/groups/%E0%A4%A', '/%ff', '/_expo/static/js/%ff.js', '/katex/fonts/%E0%A4%A.woff2']) {
      const reply = await rawRequest(port, 'GET', path, {});
      assert.equal(reply.status, 400, path);
      assert.match(String(reply.headers['content-type']), /json/, path);
      assert.equal(errorOf(reply.json).code, 'validation_failed', path);
    }
  });

  test('a lone UTF-16 surrogate in any text field is a 400 naming the field (UTF-8 cannot encode it: RFC 3629 §3)', async () => {
    const signUp = await h.raw.post('/api/auth/sign-up').set('Content-Type', 'application/json').send('{"name":"Invented \\ud800","email":"s@test.rungbook.example","password":"long-enough-pass"}').expect(400);
    assert.equal(errorOf(signUp.body).code, 'validation_failed');
    assert.deepEqual(Object.keys(errorOf(signUp.body).fields ?? {}), ['name']);
    const email = await h.raw.post('/api/auth/sign-in').set('Content-Type', 'application/json').send('{"email":"a\\udc00@test.rungbook.example","password":"long-enough-pass"}').expect(400);
    assert.deepEqual(Object.keys(errorOf(email.body).fields ?? {}), ['email']);
    const title = await member.client.post('/api/notebooks').set('Content-Type', 'application/json').send('{"title":"Bubble \\udbff"}').expect(400);
    assert.deepEqual(Object.keys(errorOf(title.body).fields ?? {}), ['title']);
    // A correctly paired surrogate (U+1D6C6, mathematical italic epsilon) is ordinary text.
    await member.client.post('/api/notebooks').set('Content-Type', 'application/json').send('{"title":"Bubble \\ud835\\udec6"}').expect(201);
  });

  test('a NUL character (U+0000) in any text field is a 400 naming the field, not a 500 from the database (PostgreSQL text cannot hold it; found by the fuzz test on PostgreSQL)', async () => {
    const name = await member.client.patch('/api/me').set('Content-Type', 'application/json').send('{"name":"\\u0000"}').expect(400);
    assert.equal(errorOf(name.body).code, 'validation_failed');
    assert.deepEqual(Object.keys(errorOf(name.body).fields ?? {}), ['name']);
    const title = await member.client.post('/api/notebooks').set('Content-Type', 'application/json').send('{"title":"Bubble \\u0000"}').expect(400);
    assert.deepEqual(Object.keys(errorOf(title.body).fields ?? {}), ['title']);
  });

  test('__proto__, constructor and prototype as field names are refused as unknown fields and pollute nothing', async () => {
    for (const key of ['__proto__', 'constructor', 'prototype']) {
      const body = `{"email":"nobody@test.rungbook.example","password":"long-enough-pass","${key}":{"polluted":true,"prototype":{"polluted":true}}}`;
      const reply = await h.raw.post('/api/auth/sign-in').set('Content-Type', 'application/json').send(body).expect(400);
      assert.equal(errorOf(reply.body).code, 'validation_failed');
      assert.equal(errorOf(reply.body).fields?.[key], 'Unknown field', key);
    }
    const nested = await member.client.post('/api/notebooks').set('Content-Type', 'application/json').send('{"title":"x","__proto__":{"title":"y"}}').expect(400);
    assert.equal(errorOf(nested.body).fields?.__proto__, 'Unknown field');
    assert.equal(({} as Record<string, unknown>).polluted, undefined);
    assert.equal(Object.prototype.hasOwnProperty.call(Object.prototype, 'polluted'), false);
  });

  test('deeply nested JSON is a 400, not a stack overflow', async () => {
    const deep = `{"title":"x","summary":${'['.repeat(5000)}${']'.repeat(5000)}}`;
    const reply = await member.client.post('/api/notebooks').set('Content-Type', 'application/json').send(deep).expect(400);
    assert.match(errorOf(reply.body).message, /nests more than \d+ levels/);
    const importDeep = `{"format":"rungbook-notebook","formatVersion":1,"title":"x","cells":[{"label":"a","input":{"kind":"note","text":"t"},"output":${'{"a":'.repeat(3000)}1${'}'.repeat(3000)}}]}`;
    await member.client.post('/api/notebooks/import').set('Content-Type', 'application/json').send(importDeep).expect(400);
  });

  test('wrong shapes and types are 400s: arrays for objects, strings for numbers, bare JSON strings, other content types', async () => {
    const cases: [string, string][] = [
      ['application/json', '[]'],
      ['application/json', '[{"email":"a@b.example","password":"long-enough-pass"}]'],
      ['application/json', '"just a string"'],
      ['application/json', 'null'],
      ['application/json', '{"email":5,"password":["x"]}'],
      ['text/plain', 'email=a@b.example'],
      ['application/x-www-form-urlencoded', 'email=a%40b.example&password=long-enough-pass'],
      ['application/json; charset=utf-16', '{}'],
    ];
    for (const [type, body] of cases) {
      const reply = await h.raw.post('/api/auth/sign-in').set('Content-Type', type).send(body);
      assert.equal(reply.status, 400, `${type} ${body}`);
      assert.ok(['validation_failed', 'malformed_json'].includes(errorOf(reply.body).code), `${type} ${body}`);
    }
    const digitsAsString = await member.client.post('/api/notebooks').send({ title: 7 }).expect(400);
    assert.ok(errorOf(digitsAsString.body).fields?.title);
  });

  test('other methods and unknown addresses: HEAD and OPTIONS answer, unrouted methods are a JSON 404', async () => {
    await h.raw.head('/api/health').expect(200);
    await h.raw.head('/groups').expect(200);
    const options = await h.raw.options('/api/notebooks');
    assert.ok(options.status < 500);
    for (const [method, path] of [['put', '/api/notebooks/x'], ['post', '/groups'], ['delete', '/']] as const) {
      const reply = await h.raw[method](path).set('Origin', ORIGIN);
      assert.equal(reply.status, 404, `${method} ${path}`);
      assert.equal(errorOf(reply.body).code, 'not_found');
    }
  });

  test('an oversized header block is refused by Node with 431 (its 16 KiB default), not a 500', async () => {
    const reply = await rawRequest(port, 'GET', '/api/health', { 'x-padding': 'a'.repeat(20_000) });
    assert.equal(reply.status, 431);
  });
});

describe('security headers and caching', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness();
  });
  after(() => h.close());

  /** Values recommended by the OWASP Secure Headers Project and MDN for a same-origin web app. */
  function assertSecurityHeaders(headers: Record<string, string>, where: string) {
    const csp = headers['content-security-policy'] ?? '';
    for (const directive of ["default-src 'self'", "script-src 'self'", "object-src 'none'", "frame-ancestors 'none'", "base-uri 'self'"]) {
      assert.ok(csp.split(';').includes(directive), `${where}: CSP lacks ${directive} in ${csp}`);
    }
    assert.doesNotMatch(csp, /script-src[^;]*'unsafe-(inline|eval)'/, `${where}: scripts must not be inline or eval'd`);
    assert.equal(headers['x-content-type-options'], 'nosniff', where);
    assert.equal(headers['x-frame-options'], 'DENY', where);
    assert.equal(headers['referrer-policy'], 'same-origin', where);
    assert.equal(headers['x-powered-by'], undefined, where);
    // Over plain http (PUBLIC_URL http://localhost:8080 in these tests) HSTS would be meaningless (RFC 6797 §7.2).
    assert.equal(headers['strict-transport-security'], undefined, where);
  }

  test('on an API reply, an error reply and the web app page', async () => {
    assertSecurityHeaders((await h.raw.get('/api/health').expect(200)).headers, 'GET /api/health');
    assertSecurityHeaders((await h.raw.get('/api/no-such-thing').expect(404)).headers, 'API 404');
    const page = await h.raw.get('/notebooks').expect(200).expect('Content-Type', /html/);
    assertSecurityHeaders(page.headers, 'web app');
  });

  test('the CSP lets the web app load its own scripts, KaTeX styles and fonts, and react-native-web inline styles', async () => {
    const csp = (await h.raw.get('/').expect(200)).headers['content-security-policy'];
    assert.match(csp, /style-src 'self' 'unsafe-inline'/);
    assert.match(csp, /font-src 'self'/);
    assert.match(csp, /connect-src 'self'/);
  });

  test('API replies are Cache-Control: no-store, signed in or not (RFC 9111 §5.2.2.5)', async () => {
    assert.equal((await h.raw.get('/api/me')).headers['cache-control'], 'no-store');
    const person = await createPerson(h);
    const me = await person.client.get('/api/me').expect(200);
    assert.equal(me.headers['cache-control'], 'no-store');
    assert.equal((await person.client.get('/api/notebooks').expect(200)).headers['cache-control'], 'no-store');
  });

  test('with an https public address, HSTS is sent', async () => {
    const secure = await startHarness({ PUBLIC_URL: 'https://rungbook.example' });
    try {
      const reply = await secure.raw.get('/api/health').expect(200);
      assert.match(reply.headers['strict-transport-security'], /max-age=\d+/);
      assert.match(reply.headers['content-security-policy'], /upgrade-insecure-requests/);
    } finally {
      await secure.close();
    }
  });
});

describe('LaTeX export of an imported hostile notebook', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness();
  });
  after(() => h.close());

  test('the .tex download holds no file or shell primitive and says what it removed', async () => {
    const person = await createPerson(h);
    const text = 'Read this: $\\input{/etc/passwd}$ and $$\\immediate\\write18{touch pwned}$$ and \\openin and $\\frac{1}{2}$';
    const document = { format: 'rungbook-notebook', formatVersion: 1, title: 'Hostile \\input{x}', summary: '', cells: [{ label: 'intro', input: { kind: 'note', text } }] };
    const imported = await person.client.post('/api/notebooks/import').send(document).expect(201);
    const id = (imported.body as { id?: string; notebook?: { id: string } }).id ?? (imported.body as { notebook: { id: string } }).notebook.id;
    const tex = (await person.client.get(`/api/notebooks/${id}/export.tex`).expect(200)).text;
    const body = tex.replace(/^% Export note: .*$/m, '');
    assert.doesNotMatch(body, /\\(input|immediate|write|openin)(?![a-zA-Z])/);
    assert.match(body, /\$\\frac\{1\}\{2\}\$/);
    assert.match(tex, /% Export note: 2 formulas contained commands that were removed: \\input, \\immediate, \\write/);
  });
});
