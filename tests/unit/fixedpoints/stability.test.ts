import { test } from 'node:test';
import assert from 'node:assert/strict';
import { stabilityAt } from '../../../shared/engine/fixedpoints/stability';
import { findFixedPoints } from '../../../shared/engine/fixedpoints/index';
import { flowFor } from '../../../shared/engine/flows/flow';
import { cubicModel, onModel } from '../../../shared/engine/models/presets';
import { type DerivedFlow } from '../../../shared/engine/diagrams/renormalization';
import { type Real } from '../../../shared/engine/precision/real';
import { LaurentSeries } from '../../../shared/engine/series/laurent';
import { numericRing } from '../../../shared/engine/series/numeric';
import { q } from '../../../shared/engine/symbolic/rational';
import { chooseFixedPoint, runFlowJob } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const ring = numericRing(40);
const series = (a1: number, a2: number) => LaurentSeries.of(ring, 0, [ring.zero(), ring.fromRational(BigInt(a1)), ring.fromRational(BigInt(a2))], 2);
const isZero = (x: Real) => x.abs().lte('1e-35');
const half = ring.fromRational(1n, 2n);

// Hand computation: λ = ε − 3ε² at ε = 1/2 is −1/4 truncated; its [1/1] Padé approximant ε/(1 + 3ε) is 1/5.
test('truncated series and [1/1] Padé disagree on the sign of an eigenvalue: caveat with both values, stability undecided', () => {
  const verdict = stabilityAt([series(1, -3), series(1, 0)], null, half, isZero, 30);
  assert.equal(verdict.stable, null);
  assert.equal(verdict.caveats.length, 1);
  assert.equal(verdict.caveats[0].kind, 'stability-sign-disagrees');
  assert.match(verdict.caveats[0].message, /λ1: the truncated series gives -0\.25 at ε = 0\.5, its \[1\/1\] Padé approximant gives 0\.2/);
  // another eigenvalue negative in both (−ε − ε²: −3/4 and −ε/(1 − ε) = −1): unstable whatever λ1 is
  assert.equal(stabilityAt([series(1, -3), series(-1, -1)], null, half, isZero, 30).stable, false);
  // all positive in both: IR-stable, no caveat
  assert.deepEqual(stabilityAt([series(1, -1), series(2, 1)], null, half, isZero, 30), { stable: true, caveats: [] });
});

test('cubic N = 3 at s = 7/4, d = 3 (ε = 1/2): every non-Gaussian point is complex there — never stable, caveat complex-at-eps', () => {
  const r = runFlowJob({ job: 'fixedpoints', model: { preset: 'cubic', N: 3 }, s: '1.75', d: '3', digits: 15 }) as Any;
  const others = r.fixedPoints.filter((p: Any) => p.name !== 'Gaussian');
  assert.equal(others.length, 3);
  for (const p of others) {
    assert.equal(p.status, 'complex');
    assert.equal(p.stable, false);
    assert.equal(p.caveats[0].kind, 'complex-at-eps');
    assert.ok((Object.values(p.couplings) as Any[]).some((c) => /i$/.test(c.value)), JSON.stringify(p.couplings));
  }
});

test('choosing a point: never a real unstable one; a point complex at ε is chosen only by its ε-series and then says so', () => {
  const { flow } = flowFor({ model: onModel(1), s: q(7, 4), loops: 2, digits: 20 });
  const real = flow as DerivedFlow<Real>;
  const points = findFixedPoints(onModel(1), real, { eps: real.calculus.ctx.ring.fromRational(1n, 2n) });
  const chosen = chooseFixedPoint(points, undefined, false);
  assert.equal(chosen.name, 'Ising');
  assert.equal(chosen.stable, false);
  assert.ok(chosen.caveats?.some((c) => c.kind === 'complex-at-eps' && /chosen as the IR-stable point by its ε-series/.test(c.message)), JSON.stringify(chosen.caveats));

  // cubic N = 4 at s = 2, ε = 0.2: the cubic point is IR-stable (textbook at N = 4, recalled from memory), O(N) is not
  const cubic = flowFor({ model: cubicModel(4), s: q(2), loops: 2, digits: 20 }).flow as DerivedFlow<Real>;
  const cubicPoints = findFixedPoints(cubicModel(4), cubic, { eps: cubic.calculus.ctx.ring.fromRational(1n, 5n) });
  assert.equal(chooseFixedPoint(cubicPoints, undefined, false).name, 'cubic');
  // with only unstable candidates left, no point is chosen
  const unstable = cubicPoints.filter((p) => p.stable === false);
  assert.throws(() => chooseFixedPoint(unstable, undefined, false), /no IR-stable non-Gaussian fixed point/);
});
