import assert from 'node:assert/strict';
import { test } from 'node:test';
import { createDocumentRenderer, type DocumentRenderer } from '../../../server/jobs/documents';
import { loadConfig } from '../../../server/config';
import { AppError } from '../../../server/http/errors';
import { NOTEBOOK_FORMAT, NOTEBOOK_FORMAT_VERSION } from '../../../shared/notebook/exports';

const note = (i: number, text = `$x_{${i}}^2$`) => ({ label: `n${i}`, input: { kind: 'note' as const, text }, output: null });
const documentJson = (cells: ReturnType<typeof note>[]) =>
  JSON.stringify({ format: NOTEBOOK_FORMAT, formatVersion: NOTEBOOK_FORMAT_VERSION, title: 'Invented', summary: '', exportedAt: new Date().toISOString(), cells });
const small = documentJson([note(1)]);
const formula = '$\\frac{\\Gamma(a)}{\\Gamma(b)} + x_{1}^{2}$ ';
/** Formula-heavy: every formula is checked with KaTeX, tens of milliseconds at least. */
const heavy = documentJson(Array.from({ length: 10 }, (_, i) => note(i, formula.repeat(200))));

async function refusal(promise: Promise<unknown>): Promise<AppError> {
  const error = await promise.then(
    () => assert.fail('expected a refusal'),
    (reason: unknown) => reason,
  );
  assert.ok(error instanceof AppError, String(error));
  return error;
}

async function closing<T>(renderer: DocumentRenderer, body: () => Promise<T>): Promise<T> {
  try {
    return await body();
  } finally {
    await renderer.close();
  }
}

test('documents beyond the threads and the queue limit are refused with queue_full; the others are rendered', async () => {
  const renderer = createDocumentRenderer({ threads: 1, maxQueue: 2 });
  await closing(renderer, async () => {
    const outcomes = await Promise.allSettled(Array.from({ length: 5 }, (_, i) => renderer.latex(small, `person-${i}`)));
    // one running + two waiting are accepted; the fourth and fifth find the queue full
    assert.deepEqual(outcomes.map((o) => o.status), ['fulfilled', 'fulfilled', 'fulfilled', 'rejected', 'rejected']);
    const refused = (outcomes[3] as PromiseRejectedResult).reason;
    assert.ok(refused instanceof AppError);
    assert.equal(refused.code, 'queue_full');
    // the queue drains: a document asked for afterwards is rendered
    assert.match(await renderer.latex(small, 'person-0'), /\\begin\{document\}/);
  });
});

test('one person may have only a few documents outstanding; someone else is still served', async () => {
  const renderer = createDocumentRenderer({ threads: 1, maxQueue: 10, perPerson: 2 });
  await closing(renderer, async () => {
    const mine = [renderer.latex(heavy, 'alice'), renderer.latex(heavy, 'alice')];
    const third = await refusal(renderer.latex(small, 'alice'));
    assert.equal(third.code, 'queue_full');
    assert.equal(third.status, 429);
    assert.match(third.message, /You already have 2 exports or comparisons in preparation/);
    assert.match(await renderer.latex(small, 'bob'), /\\begin\{document\}/);
    await Promise.all(mine);
    // once they are done the person may ask again
    assert.match(await renderer.latex(small, 'alice'), /\\begin\{document\}/);
  });
});

test('a worker exception is a clear 400, never an internal error', async () => {
  const renderer = createDocumentRenderer({ threads: 1 });
  await closing(renderer, async () => {
    const broken = await refusal(renderer.latex('{"title": ', 'alice'));
    assert.equal(broken.code, 'validation_failed');
    assert.match(broken.message, /^This notebook could not be exported: /);
    const comparison = await refusal(renderer.compare('{}', 'not json', 'alice'));
    assert.equal(comparison.code, 'validation_failed');
    assert.match(comparison.message, /^These versions could not be compared: /);
  });
});

test('a document over its time limit is stopped and answered with queue_full; the pool keeps working', async () => {
  const renderer = createDocumentRenderer({ threads: 1, timeLimitMs: 1 });
  await closing(renderer, async () => {
    const stopped = await refusal(renderer.latex(heavy, 'alice'));
    assert.equal(stopped.code, 'queue_full');
    assert.match(stopped.message, /longer than the 0 s allowed|longer than the \d+ s allowed/);
  });
});

test('a document that waits too long for a thread is refused with queue_full', async () => {
  const renderer = createDocumentRenderer({ threads: 1, queueWaitLimitMs: 1 });
  await closing(renderer, async () => {
    const first = renderer.latex(heavy, 'alice');
    const waited = await refusal(renderer.latex(small, 'bob'));
    assert.equal(waited.code, 'queue_full');
    assert.match(await first, /\\begin\{document\}/);
  });
});

test('the time limit counts work, not the wait for a thread', async () => {
  const probe = createDocumentRenderer({ threads: 1 });
  const { bootMs, documentMs } = await closing(probe, async () => {
    const timed = async (json: string) => {
      const started = performance.now();
      await probe.latex(json, 'probe');
      return performance.now() - started;
    };
    const boot = await timed(small);
    const measured = [await timed(heavy), await timed(heavy), await timed(heavy)].sort((a, b) => a - b);
    return { bootMs: boot, documentMs: measured[1] };
  });
  // the limit covers a thread's start and several documents; the queue holds three limits' worth of work
  const limitMs = Math.ceil(2 * bootMs + 4 * documentMs + 100);
  let count = Math.ceil((3 * limitMs) / documentMs);
  const renderer = createDocumentRenderer({ threads: 1, maxQueue: 100_000, perPerson: 100_000, timeLimitMs: limitMs });
  await closing(renderer, async () => {
    await renderer.latex(small, 'warm-up');
    // documents may run faster than measured: the queue grows until the last one waits longer than the limit
    let waitedMs = 0;
    for (let attempt = 0; attempt < 5 && waitedMs <= limitMs; attempt += 1, count *= 2) {
      const started = performance.now();
      const outcomes = await Promise.allSettled(Array.from({ length: count }, () => renderer.latex(heavy, 'alice')));
      waitedMs = performance.now() - started;
      assert.deepEqual(outcomes.filter((o) => o.status === 'rejected').map((o) => String((o as PromiseRejectedResult).reason)), []);
    }
    assert.ok(waitedMs > limitMs, `the last document waited ${waitedMs.toFixed(0)} ms, longer than the ${limitMs} ms limit`);
  });
});

test('DOCUMENT_QUEUE_LIMIT sets the queue limit (documented default 16, README configuration table)', () => {
  assert.equal(loadConfig({ DOCUMENT_QUEUE_LIMIT: '0' }).documentQueueLimit, 0);
  assert.equal(loadConfig({ DOCUMENT_QUEUE_LIMIT: '40' }).documentQueueLimit, 40);
  assert.equal(loadConfig({}).documentQueueLimit, 16);
  assert.throws(() => loadConfig({ DOCUMENT_QUEUE_LIMIT: 'many' }), /Expected an integer/);
});
