import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runFlowJob } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const run = (job: object) => runFlowJob(job) as Any;
const significant = (text: string) => text.replace(/^-?0\.0*|\./g, '').length;

// Source: at one loop β = −εu + b u², so β'(u*) = ε exactly at u* = ε/b and β'(0) = −ε (hand computation).
test('one-loop stability eigenvalues are printed at the requested digits: O(1), d = 3.4, s = 1.75 (ε = 1/10) gives exactly "0.1" and "-0.1"', () => {
  const r = run({ job: 'fixedpoints', model: { preset: 'on', N: 1 }, d: '3.4', s: '1.75', loops: 1, digits: 25 });
  assert.deepEqual(r.fixedPoints.map((p: Any) => p.stability.values[0]).sort(), ['-0.1', '0.1']);
});

// Source: one-loop cubic anisotropy at the O(N) point, eigenvalues ε (radial) and ε(4 − N)/(N + 8)
// (Aharony 1973 — recalled from memory; the one-loop β has the short-range structure up to the scale of u).
test('one-loop cubic N = 3 at the O(N) point: eigenvalues ε and ε/11 to 25 digits (ε = 1/10)', () => {
  const r = run({ job: 'fixedpoints', model: { preset: 'cubic', N: 3 }, d: '3.4', s: '1.75', loops: 1, digits: 25 });
  const on = r.fixedPoints.find((p: Any) => p.name === 'O(N)');
  const values = [...on.stability.values].sort((a: string, b: string) => Number(a) - Number(b));
  assert.equal(values[1], '0.1');
  assert.ok(Math.abs(Number(values[0]) - 0.1 / 11) < 1e-17, values[0]);
  assert.ok(significant(values[0]) >= 24, `25 significant digits: ${values[0]}`);
  assert.equal(values[0], '0.009090909090909090909090909');
});
