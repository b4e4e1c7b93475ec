import assert from 'node:assert/strict';
import { test } from 'node:test';
import { WeightedLru } from '../../../server/services/boundedCache';

test('entries are kept within the total weight, least recently used leaving first', () => {
  const cache = new WeightedLru<string, string>(100);
  cache.set('a', 'A', 40);
  cache.set('b', 'B', 40);
  assert.equal(cache.get('a'), 'A'); // a is now more recent than b
  cache.set('c', 'C', 40); // 120 > 100: the least recently used (b) goes
  assert.deepEqual([cache.get('a'), cache.get('b'), cache.get('c')], ['A', undefined, 'C']);
  assert.equal(cache.weight, 80);
});

test('replacing an entry replaces its weight; deleting frees it; an entry heavier than the budget is not kept', () => {
  const cache = new WeightedLru<string, number>(100);
  cache.set('a', 1, 30);
  cache.set('a', 2, 50);
  assert.deepEqual([cache.get('a'), cache.weight, cache.size], [2, 50, 1]);
  cache.delete('a');
  assert.deepEqual([cache.weight, cache.size], [0, 0]);
  cache.set('huge', 3, 101);
  assert.deepEqual([cache.get('huge'), cache.weight], [undefined, 0]);
});

test('many notebooks of 3 MB results stay within a 64 MB budget', () => {
  const cache = new WeightedLru<number, object>(64_000_000);
  for (let notebook = 0; notebook < 2000; notebook += 1) cache.set(notebook, {}, 3_000_000);
  // 21 × 3 MB = 63 MB fit; a 22nd would pass 64 MB
  assert.deepEqual([cache.size, cache.weight], [21, 63_000_000]);
  assert.equal(cache.get(1999) !== undefined && cache.get(1978) === undefined, true);
});
