import { test } from 'node:test';
import assert from 'node:assert/strict';
import { type Complex } from '../../../shared/engine/linalg/index';
import { stabilityAt } from '../../../shared/engine/fixedpoints/stability';
import { type Real } from '../../../shared/engine/precision/real';
import { LaurentSeries } from '../../../shared/engine/series/laurent';
import { numericRing } from '../../../shared/engine/series/numeric';
import { runJob } from '../../../shared/jobs/index';

type Any = Record<string, any>;
const ring = numericRing(40);
const half = ring.fromRational(1n, 2n);
const isZero = (x: Real) => x.abs().lte('1e-35');
const series = (a1: number, a2: number) => LaurentSeries.of(ring, 0, [ring.zero(), ring.fromRational(BigInt(a1)), ring.fromRational(BigInt(a2))], 2);
const real = (re: number): Complex => ({ re, im: 0 });

// Hand computation at ε = 1/2: λ = ε − ε² gives 1/4 truncated and ε/(1 + ε) = 1/3 as [1/1] Padé — both
// positive; a root eigenvalue of −1/10 disagrees, so stability is undecided and all three values are named.
test('the eigenvalue at the root disagreeing in sign with the truncated series and its Padé: caveat naming all three, stability undecided', () => {
  const verdict = stabilityAt([series(1, -1), series(2, 1)], [real(1.5), real(-0.1)], half, isZero, 30);
  assert.equal(verdict.stable, null);
  assert.equal(verdict.caveats.length, 1);
  assert.match(verdict.caveats[0].message, /λ1: the truncated series gives 0\.25 at ε = 0\.5, its \[1\/1\] Padé approximant gives 0\.333333, the eigenvalue at the root of the truncated β is -0\.1/);
  // the same series with a positive root eigenvalue: IR-stable, no caveat
  assert.deepEqual(stabilityAt([series(1, -1), series(2, 1)], [real(1.5), real(0.3)], half, isZero, 30), { stable: true, caveats: [] });
});

const job = { model: { preset: 'cubic', N: 3 }, s: '1.75', loops: 2, digits: 15 };
const term = (flow: Any, k: string, m: string) => Number(flow.beta[k].find((t: Any) => t.monomial === m)?.coeff ?? 0);

/** β_u/u and β_v/v of the printed cubic flow at complex (u, v) (both β are divisible by their coupling). */
function reducedBeta(flow: Any, eps: number, u: Complex, v: Complex): Complex[] {
  const mul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
  const monomials: Record<string, Complex> = { u, v, 'u^2': mul(u, u), 'u*v': mul(u, v), 'v^2': mul(v, v) };
  const reduced: Record<string, Record<string, string>> = {
    u: { 'u^2': 'u', 'u*v': 'v', 'u^3': 'u^2', 'u^2*v': 'u*v', 'u*v^2': 'v^2' },
    v: { 'u*v': 'u', 'v^2': 'v', 'u^2*v': 'u^2', 'u*v^2': 'u*v', 'v^3': 'v^2' },
  };
  return ['u', 'v'].map((k) => Object.entries(reduced[k]).reduce((s, [m, r]) => ({ re: s.re + term(flow, k, m) * monomials[r].re, im: s.im + term(flow, k, m) * monomials[r].im }), { re: -eps, im: 0 }));
}

// Cubic N = 3, s = 7/4 at ε = 0.3 (d = 3.2). The reduced equations β_u/u = β_v/v = 0 of the printed β are two
// conics; their resultant in v (numpy.roots of the sympy resultant, computed once) has the roots
// v = 0.18935916 ± 0.10599766i and −0.18935916 ± 0.09087917i: no real point with u, v ≠ 0 at this ε. The
// real cubic branch crosses v = 0 (the O(N) point) near ε ≈ 0.23 and turns complex near ε ≈ 0.293.
test('cubic N = 3 at ε = 0.3: the cubic point is complex (its own root, not a real copy of O(N)); O(N) names the root eigenvalue that disagrees', () => {
  const flow = runJob({ ...job, job: 'flow' }) as Any;
  const r = runJob({ ...job, job: 'fixedpoints', d: '3.2' }) as Any;
  const point = (name: string) => r.fixedPoints.find((p: Any) => p.name === name);
  const cubic = point('cubic');
  assert.equal(cubic.status, 'complex');
  assert.equal(cubic.stable, false);
  assert.equal(cubic.caveats[0].kind, 'complex-at-eps');
  const parse = (text: string): Complex => {
    const m = /^(-?[\d.e-]+) ([+-]) ([\d.e-]+)i$/.exec(text) as RegExpExecArray;
    return { re: Number(m[1]), im: (m[2] === '-' ? -1 : 1) * Number(m[3]) };
  };
  const [u, v] = [parse(cubic.couplings.u.value), parse(cubic.couplings.v.value)];
  assert.ok(Math.abs(v.re - 0.18935916) < 1e-7 && Math.abs(Math.abs(v.im) - 0.10599766) < 1e-7, cubic.couplings.v.value);
  for (const b of reducedBeta(flow, 0.3, u, v)) assert.ok(Math.hypot(b.re, b.im) < 1e-12, `β/g at the printed root: ${JSON.stringify(b)}`);

  // O(N) at (u*, 0): ∂β_v/∂u = 0 there, so the stability matrix is triangular and λ_v = −ε + c_uv u* + c_u²v u*²
  const on = point('O(N)');
  const uStar = Number(on.couplings.u.value);
  const lambdaV = -0.3 + term(flow, 'v', 'u*v') * uStar + term(flow, 'v', 'u^2*v') * uStar ** 2;
  assert.ok(lambdaV < -0.02, `λ_v = ${lambdaV} at the root: negative`);
  // its series (4 − N)/(N + 8) ε + a₂ε² = ε/11 + a₂ε² and [1/1] Padé are both positive at ε = 0.3 (printed)
  const [, a1, a2] = on.stability.series[1].map(Number);
  assert.ok(Math.abs(a1 - 1 / 11) < 1e-14);
  assert.ok(a1 * 0.3 + a2 * 0.09 > 0 && (a1 * 0.3) / (1 - (a2 / a1) * 0.3) > 0);
  assert.equal(on.stable, null);
  assert.ok(on.caveats.some((c: Any) => c.kind === 'stability-sign-disagrees' && c.message.includes(`root of the truncated β is ${Number(lambdaV.toPrecision(6))}`)), JSON.stringify(on.caveats));
});

// Cubic N = 3, s = 7/4, d = 3 (ε = 1/2): O(N) is complex there; its λ₂ = ε/11 + a₂ε² is negative truncated
// but its [1/1] Padé (ε/11)/(1 − 11a₂ε) is positive for a₂ < 0 — said even though the point is complex.
test('a complex point still carries the sign-disagreement caveat, and the exponents job lists it among its notices', () => {
  const r = runJob({ ...job, job: 'exponents', d: '3' }) as Any;
  assert.equal(r.fixedPoint, 'O(N)');
  const [, a1, a2] = r.series.omega.map(Number);
  assert.ok(a1 * 0.5 + a2 * 0.25 < 0 && (a1 * 0.5) / (1 - (a2 / a1) * 0.5) > 0, 'truncated ω < 0 < [1/1] Padé');
  const kinds = r.notices.map((n: Any) => n.kind);
  assert.ok(kinds.includes('complex-at-eps'), kinds.join());
  assert.ok(r.notices.some((n: Any) => n.kind === 'stability-sign-disagrees' && /λ2: the truncated series gives -0\.01072/.test(n.message)), JSON.stringify(r.notices));
});
