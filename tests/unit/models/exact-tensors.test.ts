import { test } from 'node:test';
import assert from 'node:assert/strict';
import { customModel } from '../../../shared/engine/models/custom';
import { contract, tensorFrom } from '../../../shared/engine/models/tensor';
import { flowFor } from '../../../shared/engine/flows/index';
import { type DerivedFlow } from '../../../shared/engine/diagrams/index';
import { type Expression } from '../../../shared/engine/symbolic/expression';
import { exactConstant, parseExpression } from '../../../shared/engine/symbolic/parse';
import { type Q, q, qMul } from '../../../shared/engine/symbolic/rational';
import { runJob } from '../../../shared/jobs/index';

/** β_u coefficients of u² and u³ of a one-coupling model, exact and symbolic in s. */
function betaCoefficients(fields: number, potential: string): { oneLoop: Expression; twoLoop: Expression } {
  const flow = flowFor({ model: customModel(fields, potential), s: null, loops: 2, digits: 30 }).flow as DerivedFlow<Expression>;
  const terms = flow.beta[0].terms;
  return { oneLoop: terms.get('2')?.coeff as Expression, twoLoop: terms.get('3')?.coeff as Expression };
}

// V = c·u·φ⁴ is V = (u'/24)·φ⁴ with u' = 24c·u, so β_u = −εu + 3·(24c)·u² + (24c)²·B(s)·u³, where
// 3 and B(s) are the coefficients for V = (u/24)·φ⁴ (N = 1: (N+8)/3 = 3; docs/physics.md §Results; rescaling, common practice).
const reference = betaCoefficients(1, 'u/24*phi1^4');

test('V = u/24·φ⁴ has the one-loop coefficient (N+8)/3 = 3 at N = 1 (docs/physics.md, Wilson–Fisher one loop, common practice)', () => {
  assert.deepEqual(reference.oneLoop.rationalValue(), q(3));
});

test('0.1234567·u·φ1⁴ is accepted and read exactly: one loop 72·0.1234567 = 11111103/1250000, two loops (24·0.1234567)² times the u/24 value', () => {
  const c = q(1234567n, 10n ** 7n);
  const { oneLoop, twoLoop } = betaCoefficients(1, '0.1234567*u*phi1^4');
  assert.deepEqual(oneLoop.rationalValue(), qMul(q(72), c));
  assert.deepEqual(oneLoop.rationalValue(), q(11111103n, 1250000n));
  const scale = qMul(q(24), c);
  assert.ok(twoLoop.equals(reference.twoLoop.scale(qMul(scale, scale))), 'two-loop coefficient scales exactly with (24c)²');
});

test('1.0000000000000000000001·u/24·φ1⁴ keeps every digit: one loop 3·(1 + 10⁻²²), two loops (1 + 10⁻²²)² times the u/24 value', () => {
  const c: Q = q(10n ** 22n + 1n, 10n ** 22n);
  const { oneLoop, twoLoop } = betaCoefficients(1, '1.0000000000000000000001*u/24*phi1^4');
  assert.deepEqual(oneLoop.rationalValue(), q(3n * (10n ** 22n + 1n), 10n ** 22n));
  assert.ok(twoLoop.equals(reference.twoLoop.scale(qMul(c, c))));
  assert.ok(!twoLoop.equals(reference.twoLoop), 'the 10⁻²² is not lost');
});

test('the flow job prints the exact effect of 10⁻²² at 40 digits (3.0000000000000000000003)', () => {
  const result = runJob({ job: 'flow', model: { preset: 'custom', fields: 1, potential: '1.0000000000000000000001*u/24*phi1^4' }, s: '1.5', loops: 1, digits: 40 }) as { beta: Record<string, { monomial: string; coeff: string }[]> };
  assert.equal(result.beta.u.find((t) => t.monomial === 'u^2')?.coeff, '3.0000000000000000000003');
});

test('huge coefficients stay exact through contraction and projection: C·u·(φ1²+φ2²)² has β_u = −εu + 80C·u² (O(2): (N+8)/3 · 24C)', () => {
  const C = 12345678901234567890123456789n;
  const { oneLoop } = betaCoefficients(2, `${C}*u*(phi1^2+phi2^2)^2`);
  assert.deepEqual(oneLoop.rationalValue(), q(80n * C));
});

test('contractions beyond 2^53 are exact (checked against a plain BigInt sum written out here)', () => {
  const big = 2n ** 40n + 12345n;
  const entry = ([a, b]: number[]) => big * BigInt(a + 1) + BigInt(b);
  const m = tensorFrom(3, 2, entry);
  const product = contract([{ tensor: m, labels: ['i', 'k'] }, { tensor: m, labels: ['k', 'j'] }], ['i', 'j']);
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) {
    let expected = 0n;
    for (let k = 0; k < 3; k++) expected += entry([i, k]) * entry([k, j]);
    assert.equal(product.data[i * 3 + j], expected);
  }
  const small = tensorFrom(3, 2, ([a, b]) => a - b);
  const smallProduct = contract([{ tensor: small, labels: ['i', 'k'] }, { tensor: small, labels: ['k', 'j'] }], ['i', 'j']);
  assert.equal(smallProduct.data[0], 0n * 0n + -1n * 1n + -2n * 2n, 'small entries (double path): Σ_k (0−k)(k−0) = −5');
});

test('the shared expression reader turns decimals into exact rationals (0.1 = 1/10, 1e-400 = 10⁻⁴⁰⁰, 70 digits kept)', () => {
  const constant = (text: string) => exactConstant(parseExpression(text, 'test'));
  assert.deepEqual(constant('0.1'), q(1, 10));
  assert.deepEqual(constant('0.1234567'), q(1234567n, 10n ** 7n));
  assert.deepEqual(constant('1e-400'), q(1n, 10n ** 400n));
  const seventy = `1.${'0'.repeat(68)}1`;
  assert.deepEqual(constant(seventy), q(10n ** 69n + 1n, 10n ** 69n));
});

test('Laurent jobs read their numbers through the same exact reader: Γ(1 + 10⁻⁷⁰ + ε) keeps the 10⁻⁷⁰ (value 1 − γ_E·10⁻⁷⁰ + …, γ_E from OEIS A001620)', () => {
  const arg = `1.${'0'.repeat(69)}1`;
  const result = runJob({ job: 'laurent', expr: `gamma(${arg}+eps)`, order: 0, digits: 80, at: {} }) as { coeffs: string[] };
  // Γ(1 + x) = 1 − γ_E x + O(x²) (DLMF 5.7.3); γ_E = 0.57721566490153286060… (OEIS A001620), so at 80 digits
  // the value is 0.(70 nines) followed by 1 − γ_E = 0.42278433509… rounded to ten digits
  assert.equal(result.coeffs[0], `0.${'9'.repeat(70)}4227843351`);
});

test('potential limits still refuse expansions that would blow up (POTENTIAL_LIMITS)', () => {
  assert.throws(() => customModel(6, '((phi1+phi2+phi3+phi4+phi5+phi6)^4)^3*u'), /quartic|limit|degree/);
  assert.throws(() => customModel(1, 'u*phi1^4 + 0.1234567*phi1^3'), /only quartic terms|exactly one coupling/);
});
