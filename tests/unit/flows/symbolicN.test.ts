import { test } from 'node:test';
import assert from 'node:assert/strict';
import { cubicFamily, cubicModel } from '../../../shared/engine/models/index';
import { flowFor } from '../../../shared/engine/flows/index';
import { findFixedPoints } from '../../../shared/engine/fixedpoints/index';
import { exponentSeries } from '../../../shared/engine/exponents/index';
import { type DerivedFlow } from '../../../shared/engine/diagrams/index';
import { type Expression, evaluateExpression } from '../../../shared/engine/index';
import { type Real } from '../../../shared/engine/precision/real';
import { q } from '../../../shared/engine/symbolic/rational';
import { runFlowJob } from '../../../shared/jobs/flowJobs';
import { assertExprEqual, lin, ratio } from '../helpers/flow';

type Any = Record<string, any>;
const NAMES = ['O(N)', 'decoupled Ising', 'cubic'];

test('cubic model, symbolic N (s = 7/4): fixed-point couplings, stability eigenvalues and exponents as ε-series agree at N = 3 and N = 5 with the numeric-N computation (independent: numeric-N flow)', () => {
  const symbolic = flowFor({ model: cubicFamily, s: q(7, 4), loops: 2, digits: 30 }).flow as DerivedFlow<Expression>;
  const points = findFixedPoints(cubicFamily, symbolic, { eps: null });
  assert.deepEqual(points.map((p) => p.name).sort(), ['Gaussian', ...NAMES].sort());
  for (const N of [3, 5]) {
    const model = cubicModel(N);
    const numeric = flowFor({ model, s: q(7, 4), loops: 2, digits: 30 }).flow as DerivedFlow<Real>;
    const numericPoints = findFixedPoints(model, numeric, { eps: null });
    const at = (e: Expression) => Number(evaluateExpression(e, { N: q(N) }, 30).toString());
    const close = (a: number, b: number, label: string) => assert.ok(Math.abs(a - b) < 1e-20 * (1 + Math.abs(b)), `N=${N} ${label}: ${a} vs ${b}`);
    for (const name of NAMES) {
      const p = points.find((x) => x.name === name);
      const r = numericPoints.find((x) => x.name === name);
      assert.ok(p && r && p.couplingSeries && r.couplingSeries, `${name} exists`);
      p.couplingSeries.forEach((s, k) => s.coefficients().forEach((c, m) => close(at(c), Number(String(r.couplingSeries?.[k].coefficient(m))), `${name} g${k} ε^${m}`)));
      const sym = (p.eigenvalueSeries ?? []).map((e) => e?.coefficients().map(at) ?? []).sort((a, b) => a[1] - b[1]);
      const num = (r.eigenvalueSeries ?? []).map((e) => e?.coefficients().map((c) => Number(String(c))) ?? []).sort((a, b) => a[1] - b[1]);
      assert.equal(sym.length, 2, `${name}: two exact eigenvalue series`);
      sym.forEach((e, i) => e.forEach((c, m) => close(c, num[i][m], `${name} eigenvalue ${i} ε^${m}`)));
      const se = exponentSeries(symbolic, p);
      const ne = exponentSeries(numeric, r);
      for (const key of ['nuInv', 'eta', 'Delta_phi2', 'omega'] as const) {
        // ω at symbolic N is the non-radial eigenvalue; at numeric N the smallest one — compare where they coincide
        if (key === 'omega' && Math.abs(sym[0][1] - 1) < 1e-12) continue;
        se[key].coefficients().forEach((c, m) => close(at(c), Number(String(ne[key].coefficient(m))), `${name} ${key} ε^${m}`));
      }
    }
  }
});

test('cubic point at one loop, symbolic N and s: stability eigenvalues ε and (N − 4)ε/(3N) (Aharony 1973; recalled from memory), exchange with O(N) at N = 4', () => {
  const flow = flowFor({ model: cubicFamily, s: null, loops: 1, digits: 30 }).flow as DerivedFlow<Expression>;
  const cubic = findFixedPoints(cubicFamily, flow, { eps: null }).find((p) => p.name === 'cubic');
  assert.ok(cubic?.eigenvalueSeries);
  const leading = cubic.eigenvalueSeries.map((e) => e?.coefficient(1) as Expression);
  assertExprEqual(leading[0], ratio(lin(0, 1)), 'radial eigenvalue 1');
  assertExprEqual(leading[1], ratio(lin(1, -4), lin(3, 0)), '(N − 4)/(3N)');
});

test('exponents job with symbolic N for the cubic model: a named fixed point gives {expr, latex} series; without a name the error says what to give', () => {
  const r = runFlowJob({ job: 'exponents', model: { preset: 'cubic', N: 'N' }, fixedPoint: 'cubic' }) as Any;
  assert.equal(r.error, undefined, JSON.stringify(r.error));
  assert.equal(r.series.nuInv[0].expr, 's');
  assert.equal(typeof r.series.omega[2].latex, 'string');
  const unnamed = runFlowJob({ job: 'exponents', model: { preset: 'cubic', N: 'N' } }) as Any;
  assert.equal(unnamed.error.code, 'not-representable');
  assert.match(unnamed.error.message, /"fixedPoint" \(O\(N\), decoupled Ising, cubic\) or give N and s as numbers/);
});

test('fixed points that are not rational in the symbolic parameters keep the not-representable error, naming the numeric input to give', () => {
  const r = runFlowJob({ job: 'exponents', model: { preset: 'custom', fields: 2, potential: 'u/24*(phi1^4+phi2^4) + v/4*phi1^2*phi2^2' } }) as Any;
  assert.equal(r.error.code, 'not-representable');
  assert.match(r.error.message, /give N as a number \(e\.g\. "N":3\) and s as a number/);
});
