import { test } from 'node:test';
import assert from 'node:assert/strict';
import { regimeNotices, scanRegimeNotices } from '../../../shared/engine/exponents/notices';
import { q } from '../../../shared/engine/symbolic/rational';
import { runJob } from '../../../shared/jobs/index';

type Any = Record<string, any>;

// docs/physics.md §3 and §6: at s = 2 the local theory applies (field renormalization, Δ_{φ³} = Δ_φ + 2);
// below d = 2s = 4 it is not the Gaussian regime, so s = 2, d = 3.8 carries exactly that regime notice.
test('an exponents job at s = 2 carries the short-range-flow notice, with the kind and words of the scan at its s = 2 point', () => {
  const exponents = runJob({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '3.8', s: '2', loops: 2, digits: 15 }) as Any;
  const notice = exponents.notices.find((n: Any) => n.kind === 'short-range-flow');
  assert.ok(notice, JSON.stringify(exponents.notices));
  assert.match(notice.message, /Δ_\{φ³\} = Δ_φ \+ 2/);
  const scan = runJob({ job: 'scan', model: { preset: 'on', N: 1 }, d: '3.8', s: { from: '1.95', to: '2', points: 2 }, loops: 2, digits: 15, quantities: ['nuInv'] }) as Any;
  assert.deepEqual(scan.points[1].notices, ['short-range-flow']);
  assert.equal(scan.notices.find((n: Any) => n.kind === 'short-range-flow').message, `At s = 2: ${notice.message}`);
});

test('the short-range-flow notice is given at s = 2 only: not below, and not in the Gaussian regime d ≥ 2s', () => {
  const kinds = (d: number, s: [number, number]) => regimeNotices(q(d), q(...s), null).map((n) => n.kind);
  assert.deepEqual(kinds(3, [2, 1]), ['short-range-flow']);
  assert.deepEqual(regimeNotices(q(3), q(2), null), scanRegimeNotices(q(3), q(2), null));
  assert.deepEqual(kinds(3, [19, 10]), []);
  assert.deepEqual(kinds(4, [2, 1]), ['upper-critical-dimension']);
  assert.deepEqual(kinds(5, [2, 1]), ['mean-field']);
});
