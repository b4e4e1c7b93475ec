import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import type { CellInput } from '../../../shared/notebook/cells';
import { canonicalJson, cellStates, dependentsOf, fingerprintOf, type CellForStaleness } from '../../../shared/notebook/dependencies';

const setup = (s: string): CellInput => ({ kind: 'setup', model: { preset: 'on', N: 3 }, d: '3', s, loops: 2, digits: 30 });
const flow: CellInput = { kind: 'flow', uses: 'params' };
const exponents: CellInput = { kind: 'exponents', uses: 'params' };
const note: CellInput = { kind: 'note', text: 'Invented scenario: $\\varepsilon = 2s - d$' };

function notebook(s: string, runs: Record<string, { fingerprintFrom: string; status: CellForStaleness['lastRunStatus'] }>) {
  const base = [
    { id: 'c1', label: 'params', input: setup(s) },
    { id: 'c2', label: 'flow', input: flow },
    { id: 'c3', label: 'exps', input: exponents },
    { id: 'c4', label: 'intro', input: note },
  ];
  const at = (sValue: string) => new Map(base.map((c) => [c.label, { ...c, input: c.label === 'params' ? setup(sValue) : c.input }]));
  return base.map((cell) => {
    const run = runs[cell.label];
    return {
      ...cell,
      lastRunFingerprint: run ? fingerprintOf(at(run.fingerprintFrom).get(cell.label)!, at(run.fingerprintFrom)) : null,
      lastRunStatus: run?.status ?? null,
    };
  });
}

describe('cell staleness (fingerprints of own and upstream inputs)', () => {
  test('canonical JSON ignores key order, so equal inputs fingerprint equally', () => {
    assert.equal(canonicalJson({ b: 1, a: { d: [1, 2], c: 'x' } }), canonicalJson({ a: { c: 'x', d: [1, 2] }, b: 1 }));
    assert.notEqual(canonicalJson({ a: [1, 2] }), canonicalJson({ a: [2, 1] }));
  });

  test('cells run on the current inputs are up to date; never-run cells say so; notes and parameters hold no run', () => {
    const states = cellStates(notebook('1.75', { flow: { fingerprintFrom: '1.75', status: 'done' } }));
    assert.deepEqual([...states.values()], ['text', 'up-to-date', 'never-run', 'text']);
  });

  test('editing the parameters puts every dependent out of date, and only those', () => {
    const states = cellStates(notebook('1.8', { flow: { fingerprintFrom: '1.75', status: 'done' }, exps: { fingerprintFrom: '1.8', status: 'done' } }));
    assert.equal(states.get('c2'), 'out-of-date');
    assert.equal(states.get('c3'), 'up-to-date');
  });

  test('a failed run on current inputs is failed, a running one is running', () => {
    const states = cellStates(notebook('1.75', { flow: { fingerprintFrom: '1.75', status: 'failed' }, exps: { fingerprintFrom: '1.75', status: 'running' } }));
    assert.deepEqual([states.get('c2'), states.get('c3')], ['failed', 'running']);
  });

  test('a reference to a missing label is reported, not silently ignored', () => {
    const cells = notebook('1.75', {}).filter((c) => c.label !== 'params');
    assert.equal(cellStates(cells).get('c2'), 'broken-reference');
  });

  test('dependents are found transitively and in notebook order', () => {
    const cells = [
      { label: 'a', input: setup('1.5') },
      { label: 'z', input: { kind: 'flow', uses: 'a' } as CellInput },
      { label: 'b', input: { kind: 'exponents', uses: 'a' } as CellInput },
      { label: 'n', input: note },
    ];
    assert.deepEqual(dependentsOf('a', cells), ['z', 'b']);
    assert.deepEqual(dependentsOf('b', cells), []);
  });
});
