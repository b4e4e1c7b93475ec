import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runFlowJob } from '../../../shared/jobs/flowJobs';
import { realContext } from '../../../shared/engine/precision/real';

type Any = Record<string, any>;
const run = (job: object) => runFlowJob(job) as Any;
const R = realContext(60);
const ALL = ['nuInv', 'omega', 'eta', 'Delta_phi', 'Delta_phi2', 'Delta_phi3', 'Delta_phi4', 'nu', 'gamma', 'alpha', 'beta', 'delta'];

test('s = 2: Δ_{φ³} = Δ_φ + 2 = 3 − ε/2 + (N+2)/(4(N+8)²) ε² (η = (N+2)/(2(N+8)²) ε², Wilson 1972; φ³ a descendant of φ, common practice) — not the shadow value with the opposite ε² sign', () => {
  for (const N of [1, 3]) {
    const r = run({ job: 'exponents', model: { preset: 'on', N }, d: '3', s: '2', digits: 25 });
    assert.equal(r.error, undefined, JSON.stringify(r.error));
    const expected = [new R(3), new R(-0.5), new R(N + 2).div(4 * (N + 8) ** 2)];
    r.series.Delta_phi3.forEach((c: string, k: number) => assert.ok(new R(c).minus(expected[k]).abs().lt('1e-23'), `O(${N}) ε^${k}: ${c} vs ${expected[k].toString()}`));
    assert.match(r.relations.Delta_phi3, /Δ_φ \+ 2.*descendant.*local equation of motion/);
    assert.match(r.relations.eta, /field renormalization/);
    assert.ok(new R(r.values.Delta_phi3).minus(new R(r.values.Delta_phi).plus(2)).abs().lt('1e-24'), 'value = Δ_φ + 2');
  }
});

test('Gaussian regime: Δ_{φ³} = 3Δ_φ (d = 5, s = 2: Δ_φ = 3/2, Δ_{φ³} = 9/2 by hand); d = 4 = 2s is the upper critical dimension with logarithmic corrections (common practice)', () => {
  const above = run({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '5', s: '2', digits: 20 });
  assert.deepEqual([above.values.Delta_phi, above.values.Delta_phi3], ['1.5', '4.5']);
  assert.match(above.relations.Delta_phi3, /3Δ_φ/);
  const upper = run({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '4', s: '2', digits: 20 });
  assert.match(upper.statement, /upper critical dimension.*logarithmic corrections/);
  assert.equal(upper.notices[0].kind, 'upper-critical-dimension');
  assert.equal(upper.values.Delta_phi3, '3', 'd = 2s: 3Δ_φ = 3(d − s)/2 = 3');
});

const sameDigits = (scanPoint: Any, job: Any, quantities: string[], where: string) => {
  for (const k of quantities) {
    assert.equal(scanPoint.values[k], job.values[k], `${where}: ${k}`);
    const entry = job.pade[k].find((e: Any) => e.L === 1 && e.M === 1);
    assert.equal(scanPoint.pade[k], entry.value, `${where}: Padé [1/1] of ${k}`);
    assert.equal(scanPoint.padeDefects?.[k], entry.reason ?? undefined, `${where}: Padé defect of ${k}`);
  }
};

test("a scan's s = 2 point equals the exponents job at s = 2 to every printed digit (independent path: the direct job), one coupling (O(1), O(2)) and two (cubic N = 2)", () => {
  for (const [model, d] of [[{ preset: 'on', N: 1 }, '3'], [{ preset: 'on', N: 2 }, '3.5'], [{ preset: 'cubic', N: 2 }, '3']] as const) {
    const where = `${model.preset} N = ${model.N} d = ${d}`;
    const scan = run({ job: 'scan', model, d, s: { from: '1.9', to: '2', points: 2 }, quantities: ALL, digits: 24 });
    const job = run({ job: 'exponents', model, d, s: '2', digits: 24 });
    assert.equal(scan.error, undefined, JSON.stringify(scan.error));
    const point = scan.points[1];
    assert.deepEqual([point.s, point.regime, point.flagged], ['2', 'short-range', true], where);
    sameDigits(point, job, ALL, where);
    if (model.preset === 'cubic') assert.equal(point.fixedPoint, job.fixedPoint, `${where}: same fixed point`);
    for (const n of job.notices) assert.ok(point.notices.includes(n.kind), `${where}: the scan point carries ${n.kind}`);
    assert.ok(point.notices.includes('short-range-flow'));
    assert.ok(scan.notices.some((n: Any) => n.kind === 'short-range-flow' && n.message.startsWith('At s = 2:')), where);
  }
});

test('built-in Δσ marks s* without typing: 2D Ising 1/8 exact ⇒ s* = 7/4; 3D Ising 0.5181489 ⇒ 1.9637022 (Kos et al. 2016); 3D O(2) 0.519088 ⇒ 1.961824 and O(3) 0.518936 ⇒ 1.962128 (Chester et al.; recalled from memory); none for O(4)', () => {
  const marks = (N: number, d: string, extra: Any = {}) => run({ job: 'scan', model: { preset: 'on', N }, d, s: { from: '1.5', to: '1.9', points: 2 }, quantities: ['nuInv'], digits: 12, ...extra }).marks;
  const ising2 = marks(1, '2');
  assert.equal(ising2.sStar, '1.75');
  assert.match(ising2.sStarSource, /^built in: 2D Ising Δσ = 0\.125, exact \(Onsager; Yang\)/);
  assert.equal(marks(1, '3').sStar, '1.9637022');
  assert.match(marks(1, '3').sStarSource, /Kos, Poland, Simmons-Duffin, Vichi, JHEP 08 \(2016\) 036/);
  assert.equal(marks(2, '3').sStar, '1.961824');
  assert.match(marks(2, '3').sStarSource, /Chester et al\., JHEP 06 \(2020\) 142 \(value recalled from memory\)/);
  assert.equal(marks(3, '3').sStar, '1.962128');
  assert.match(marks(3, '3').sStarSource, /Phys\. Rev\. D 104 \(2021\) 105013/);
  assert.equal(marks(4, '3').sStar, undefined);
  assert.equal(marks(1, '2.5').sStar, undefined, 'no value for non-integer d');
  const typed = marks(1, '3', { shortRange: { Delta_sigma: '0.52' } });
  assert.deepEqual([typed.sStar, typed.sStarSource], ['1.96', 'Δσ = 0.52 as given']);
});

test('beyond s*: 2D Ising scan points at 7/4 ≤ s < 2 and the exponents job at s = 1.8 carry the notice naming the source; below s* none', () => {
  const scan = run({ job: 'scan', model: { preset: 'on', N: 1 }, d: '2', s: { from: '1.5', to: '2', points: 5 }, quantities: ['nuInv'], digits: 12 });
  assert.deepEqual(scan.points.map((p: Any) => p.s), ['1.5', '1.625', '1.75', '1.875', '2']);
  assert.deepEqual(scan.points.map((p: Any) => (p.notices ?? []).includes('beyond-s-star')), [false, false, true, true, false], 's = 2 is the short-range theory itself');
  const notice = scan.notices.find((n: Any) => n.kind === 'beyond-s-star');
  assert.match(notice.message, /^At s = 1\.75, 1\.875: s ≥ s\* = 1\.75 \(built in: 2D Ising/);
  const beyond = run({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '2', s: '1.8', digits: 12 });
  assert.ok(beyond.notices.some((n: Any) => n.kind === 'beyond-s-star' && n.message.includes('s* = 1.75')), JSON.stringify(beyond.notices));
  assert.equal(beyond.shortRange.sStar, '1.75');
  const below = run({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '2', s: '1.7', digits: 12 });
  assert.ok(!below.notices.some((n: Any) => n.kind === 'beyond-s-star'));
});

test('caveats of the chosen point come first: O(1), d = 3, s = 1.75 is complex at the physical ε at two loops (docs/flows.md), and the result starts with that notice', () => {
  const r = run({ job: 'exponents', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', digits: 12 });
  assert.equal(Object.keys(r)[0], 'notices');
  assert.equal(r.notices[0].kind, 'complex-at-eps');
  const scan = run({ job: 'scan', model: { preset: 'on', N: 1 }, d: '3', s: { from: '1.55', to: '1.75', points: 2 }, quantities: ['nuInv'], digits: 12 });
  assert.equal(Object.keys(scan)[0], 'notices');
  assert.ok(scan.points[1].notices.includes('complex-at-eps'), 'the scan flags the same point');
});

test('φ² mixing without a singlet (decoupled φ1⁴ + φ2⁴ at its "u only" point, d = 3, s = 1.8): no failure — η, Δ_φ, Δ_{φ³}, ω, Δ_{φ⁴}, δ given, the others unavailable with the reason', () => {
  const r = run({ job: 'exponents', model: { preset: 'custom', fields: 2, potential: 'u/24*phi1^4 + v/24*phi2^4' }, d: '3', s: '1.8', fixedPoint: 'u only', digits: 12 });
  assert.equal(r.error, undefined, JSON.stringify(r.error));
  // exact for s < 2: η = 2 − s, Δ_φ = (d − s)/2, Δ_{φ³} = (d + s)/2, δ = (d + s)/(d − s) = 4; the free φ2 direction: ω = −ε = −0.6 (by hand)
  assert.deepEqual([r.values.eta, r.values.Delta_phi, r.values.Delta_phi3, r.values.delta, r.values.omega, r.values.Delta_phi4], ['0.2', '0.6', '2.4', '4', '-0.6', '2.4']);
  for (const k of ['nuInv', 'nu', 'gamma', 'alpha', 'beta', 'Delta_phi2']) {
    assert.equal(r.values[k], null, k);
    assert.match(r.unavailable[k], /not defined for this model/, k);
    assert.equal(r.series[k], undefined, k);
  }
  assert.ok(r.notices.some((n: Any) => n.kind === 'no-singlet'));
  assert.ok(Array.isArray(r.quadraticOperators) && r.quadraticOperators.length > 0, 'the quadratic-operator spectrum is still reported');
});
