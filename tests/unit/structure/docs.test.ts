import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { test } from 'node:test';
import { ENGINE_LAYERS } from './layers';
import { ROOT, sourceFiles } from './imports';

const read = (path: string) => readFileSync(join(ROOT, path), 'utf8');

test('docs/engine.md lists the layers in the order the structure test enforces', () => {
  const rows = [...read('docs/engine.md').matchAll(/^\| \d+ \| `([a-z]+)\/` \|/gm)].map((match) => match[1]);
  assert.deepEqual(rows, [...ENGINE_LAYERS]);
});

/** "§2", "§Exact statements" → the headings of docs/physics.md they name. */
function citedSections(text: string): string[] {
  return [...text.matchAll(/docs\/physics\.md((?:[ ,;:]*(?:and |or )?§(?:\d+|[A-Z][A-Za-z-]*(?: [a-z][A-Za-z-]*)*))+)/g)].flatMap((match) =>
    [...match[1].matchAll(/§(\d+|[A-Z][A-Za-z-]*(?: [a-z][A-Za-z-]*)*)/g)].map((section) => section[1].replace(/ (and|or)$/, '')),
  );
}

test('every "docs/physics.md §…" cited in code, tests and docs names a section of docs/physics.md', () => {
  const headings = [...read('docs/physics.md').matchAll(/^## §(\d+) (.+)$/gm)].map((match) => ({ number: match[1], title: match[2] }));
  assert.ok(headings.length >= 10, 'docs/physics.md has its numbered sections');
  const files = ['shared', 'tests', 'docs', 'server', 'components'].flatMap(sourceFiles).concat(['docs/engine.md', 'docs/flows.md', 'docs/data-comparison.md'].map((path) => join(ROOT, path)));
  const unknown = files.flatMap((file) =>
    citedSections(readFileSync(file, 'utf8'))
      .filter((section) => !headings.some((heading) => heading.number === section || heading.title.startsWith(section)))
      .map((section) => `${file.slice(ROOT.length + 1)}: §${section}`),
  );
  assert.deepEqual(unknown, []);
});
