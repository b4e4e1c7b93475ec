import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runFlowJob } from '../../../shared/jobs/flowJobs';

type Any = Record<string, any>;
const run = (job: object) => runFlowJob(job) as Any;

/** "a + bi" / "a - bi" / "a" → [re, im]. */
function parseComplex(text: string): [number, number] {
  const m = /^(-?[\d.e+-]+?)(?: ([+-]) ([\d.e+-]+)i)?$/.exec(text);
  assert.ok(m, `complex string: ${text}`);
  return [Number(m[1]), m[2] ? (m[2] === '-' ? -1 : 1) * Number(m[3]) : 0];
}

const close = (a: number, b: number, label: string) => assert.ok(Math.abs(a - b) <= 1e-12 * (1 + Math.abs(b)), `${label}: ${a} vs ${b}`);

for (const N of [1, 3]) {
  test(`complex fixed point: O(${N}), s = 1.75, d = 3, two loops — root and eigenvalue match the quadratic formula on the printed β coefficients`, () => {
    const job = { model: { preset: 'on', N }, s: '1.75', loops: 2, digits: 20 };
    const flow = run({ ...job, job: 'flow' });
    const coeff = (m: string) => Number(flow.beta.u.find((t: Any) => t.monomial === m).coeff);
    const c2 = coeff('u^2');
    const c3 = coeff('u^3');
    const eps = 0.5;
    // Independent: β(u)/u = −ε + c₂u + c₃u² = 0 by the quadratic formula in plain doubles
    const disc = c2 * c2 + 4 * c3 * eps;
    assert.ok(disc < 0, 'the truncated β has complex non-trivial roots here');
    const re = -c2 / (2 * c3);
    const im = Math.abs(Math.sqrt(-disc) / (2 * c3));
    // β'(u) = −ε + 2c₂u + 3c₃u² at u = re + i·im
    const u2 = [re * re - im * im, 2 * re * im];
    const lambda = [-eps + 2 * c2 * re + 3 * c3 * u2[0], 2 * c2 * im + 3 * c3 * u2[1]];

    const r = run({ ...job, job: 'fixedpoints', d: '3' });
    const point = r.fixedPoints.find((p: Any) => p.name !== 'Gaussian');
    assert.equal(point.status, 'complex');
    // complex at the physical ε: never IR-stable, and the result says so
    assert.equal(point.stable, false);
    assert.equal(point.caveats[0].kind, 'complex-at-eps');
    const [gRe, gIm] = parseComplex(point.couplings.u.value);
    close(gRe, re, 'Re u*');
    close(gIm, im, 'Im u*');
    const [lRe, lIm] = parseComplex(point.stability.values[0]);
    close(lRe, lambda[0], 'Re λ');
    close(lIm, lambda[1], 'Im λ');
    // the ε-series is kept (its ε¹ coefficient is 1/c₂ by one-loop reversion)
    close(Number(point.couplings.u.series[1]), 1 / c2, 'series ε¹');
    // the requested digits: 20 significant digits in the real part
    assert.ok(point.couplings.u.value.split(' ')[0].replace(/^-?0\.0*/, '').length >= 18, point.couplings.u.value);
    // exponents still come from the (real) ε-series at this point
    const e = run({ ...job, job: 'exponents', d: '3' });
    assert.equal(e.fixedPoint, point.name);
  });
}

test('complex fixed point with two couplings (complex-ε continuation): the decoupled-Ising point of u/24(φ1⁴+φ2⁴) + v/4 φ1²φ2² at s = 1.75, d = 3 has v = 0 and u from the quadratic formula on its β_u(u, 0)', () => {
  const job = { model: { preset: 'custom', fields: 2, potential: 'u/24*(phi1^4+phi2^4) + v/4*phi1^2*phi2^2' }, s: '1.75', loops: 2, digits: 20 };
  const flow = run({ ...job, job: 'flow' });
  const coeff = (m: string) => Number(flow.beta.u.find((t: Any) => t.monomial === m).coeff);
  const [c2, c3, eps] = [coeff('u^2'), coeff('u^3'), 0.5];
  const disc = c2 * c2 + 4 * c3 * eps;
  assert.ok(disc < 0);
  const [re, im] = [-c2 / (2 * c3), Math.abs(Math.sqrt(-disc) / (2 * c3))];
  const r = run({ ...job, job: 'fixedpoints', d: '3' });
  const point = r.fixedPoints.find((p: Any) => p.name === 'u only');
  assert.equal(point.status, 'complex');
  const [gRe, gIm] = parseComplex(point.couplings.u.value);
  close(gRe, re, 'Re u*');
  close(gIm, im, 'Im u*');
  assert.equal(point.couplings.v.value, '0');
});
