import assert from 'node:assert/strict';
import { test } from 'node:test';
import { createDocumentRenderer, documentPoolOptionsFrom } from '../../../server/jobs/documents';
import { AppError } from '../../../server/http/errors';
import { NOTEBOOK_FORMAT, NOTEBOOK_FORMAT_VERSION, type NotebookDocument } from '../../../shared/notebook/exports';

const note = (i: number) => ({ label: `n${i}`, input: { kind: 'note' as const, text: `$x_{${i}}^2$` }, output: null });

test('documents beyond the threads and the queue limit are refused with queue_full; the others are rendered', async () => {
  const renderer = createDocumentRenderer({ threads: 1, maxQueue: 2 });
  try {
    const document = { format: NOTEBOOK_FORMAT, formatVersion: NOTEBOOK_FORMAT_VERSION, title: 'Invented', summary: '', exportedAt: new Date().toISOString(), cells: [note(1)] } as unknown as NotebookDocument;
    const outcomes = await Promise.allSettled(Array.from({ length: 5 }, () => renderer.latex(document)));
    // one running + two waiting are accepted; the fourth and fifth find the queue full
    assert.deepEqual(outcomes.map((o) => o.status), ['fulfilled', 'fulfilled', 'fulfilled', 'rejected', 'rejected']);
    const refused = (outcomes[3] as PromiseRejectedResult).reason;
    assert.ok(refused instanceof AppError);
    assert.equal(refused.code, 'queue_full');
    // the queue drains: a document asked for afterwards is rendered
    assert.match(await renderer.latex(document), /\\begin\{document\}/);
  } finally {
    await renderer.close();
  }
});

test('DOCUMENT_QUEUE_LIMIT sets the queue limit; anything else keeps the default', () => {
  assert.deepEqual(documentPoolOptionsFrom({ DOCUMENT_QUEUE_LIMIT: '0' }), { maxQueue: 0 });
  assert.deepEqual(documentPoolOptionsFrom({ DOCUMENT_QUEUE_LIMIT: '40' }), { maxQueue: 40 });
  assert.deepEqual(documentPoolOptionsFrom({}), {});
  assert.deepEqual(documentPoolOptionsFrom({ DOCUMENT_QUEUE_LIMIT: 'many' }), {});
});
