import { test } from 'node:test';
import assert from 'node:assert/strict';
import { type DerivedFlow, deriveFlow, symbolicCalculus } from '../../../shared/engine/diagrams/index';
import { cubicModel, customModel } from '../../../shared/engine/models/index';
import { type CouplingPolynomial } from '../../../shared/engine/models/couplingPolynomial';
import { type Expression } from '../../../shared/engine/symbolic/index';
import { Expression as ExpressionClass } from '../../../shared/engine/symbolic/expression';
import { type Q, Q0, q, qMul } from '../../../shared/engine/symbolic/rational';
import { ANISO, ROTATED, type P, type PT, anisoStructures, idx, lambdaOf, pAdd, pConst, pEqual, pMul, pText, rotated } from '../helpers/tensorReference';

/**
 * The ζ(3) part of the three-loop β at s = 2, for any quartic tensor, against an index-loop reference.
 * Common practice: in minimal subtraction ζ(3) first appears at three loops and only through the
 * non-planar (tetrahedron) graph, whose tensor T_ijkl = λ_imnp λ_jmqr λ_knqs λ_lprs is already symmetric
 * in ijkl. Its coefficient, 12ζ(3), is the single-component one (β ∋ (145/8 + 12ζ(3)) u⁴; Kleinert &
 * Schulte-Frohlinde 2001, recalled from memory), and it reproduces the O(N) term 4(5N+22)ζ(3)/9 u⁴
 * (checked below on the O(N) tensor). The rational three-loop terms have several tensor structures and
 * are not checked here term by term.
 */

const cache = new Map<string, DerivedFlow<Expression>>();
function flowOf(key: string, make: () => DerivedFlow<Expression>) {
  if (!cache.has(key)) cache.set(key, make());
  return cache.get(key) as DerivedFlow<Expression>;
}

/** Splits a coefficient r + z ζ(3) (nothing else allowed) and returns z. */
function zeta3Part(e: Expression): Q {
  let z = Q0;
  for (const t of e.terms.values()) {
    if (t.monomial.length === 0) continue;
    const [power] = t.monomial;
    assert.ok(t.monomial.length === 1 && power.atom.kind === 'zeta' && (power.atom as { n: number }).n === 3 && power.exponent.num === 1n && power.exponent.den === 1n, 'only ζ(3) at s = 2, three loops');
    const value = new ExpressionClass([{ coeff: t.coeff, monomial: [] }]).rationalValue();
    assert.ok(value);
    z = value;
  }
  return z;
}

const zeta3Polynomial = (p: CouplingPolynomial<Expression>): P => new Map([...p.terms.values()].map((t) => [t.powers.join(','), zeta3Part(t.coeff)]));

function tetrahedronTensor(l: PT, k: number): PT {
  const n = l.n;
  const L = (a: number, b: number, c: number, d: number) => l.e[idx(n, a, b, c, d)];
  const e: P[] = [];
  for (let f = 0; f < n ** 4; f++) {
    const [i, j, kk, ll] = [Math.floor(f / n ** 3) % n, Math.floor(f / n ** 2) % n, Math.floor(f / n) % n, f % n];
    let s = pConst(k, Q0);
    for (let m = 0; m < n; m++) for (let nn = 0; nn < n; nn++) for (let p = 0; p < n; p++) for (let qq = 0; qq < n; qq++) for (let r = 0; r < n; r++) for (let t = 0; t < n; t++) {
      s = pAdd(s, pMul(pMul(L(i, m, nn, p), L(j, m, qq, r)), pMul(L(kk, nn, qq, t), L(ll, p, r, t))));
    }
    e.push(s);
  }
  return { n, r: 4, e };
}

function assertZeta3Part(flow: DerivedFlow<Expression>, n: number, structures: ((i: number[]) => Q)[], label: string) {
  const k = structures.length;
  const reference = tetrahedronTensor(lambdaOf(n, structures), k);
  for (let f = 0; f < n ** 4; f++) {
    const i = [Math.floor(f / n ** 3) % n, Math.floor(f / n ** 2) % n, Math.floor(f / n) % n, f % n];
    let engine = pConst(k, Q0);
    structures.forEach((S, c) => (engine = pAdd(engine, zeta3Polynomial(flow.beta[c]), S(i))));
    const expected = new Map([...reference.e[f]].map(([m, c]) => [m, qMul(c, q(12))]));
    assert.ok(pEqual(engine, expected), `${label} entry ${i.join('')}: ${pText(engine)} vs ${pText(expected)}`);
  }
}

const count = (i: number[], a: number) => i.filter((x) => x === a).length;
const pairing = (i: number[]) => q((i[0] === i[1] && i[2] === i[3] ? 1 : 0) + (i[0] === i[2] && i[1] === i[3] ? 1 : 0) + (i[0] === i[3] && i[1] === i[2] ? 1 : 0), 3);
const diagonal = (i: number[]) => q(i.every((x) => x === i[0]) ? 1 : 0);

test('the reference coefficient: 12 T_ijkl on the O(N) tensor λ = u/3(δδ + δδ + δδ) gives 4(5N+22)/9 u⁴ at entry 1111 (N = 3), the O(N) ζ(3) term (Kleinert & Schulte-Frohlinde 2001, recalled from memory)', () => {
  const N = 3;
  const t = tetrahedronTensor(lambdaOf(N, [pairing]), 1);
  const entry = t.e[0].get('4') ?? Q0;
  assert.equal(Number(entry.num * 12n) / Number(entry.den), (4 * (5 * N + 22)) / 9);
});

test('three loops at s = 2: the ζ(3) part of β equals 12ζ(3) T_ijkl for cubic(3) (mixed u^a v^b terms included), exactly', () => {
  const flow = flowOf('cubic3', () => deriveFlow(cubicModel(3), symbolicCalculus(q(2)), 3));
  assertZeta3Part(flow, 3, [pairing, diagonal], 'cubic(3)');
});

test('three loops at s = 2: the ζ(3) part of β equals 12ζ(3) T_ijkl for the anisotropic two-field model, its rotation and the general two-field quartic (matrix field renormalization; ζ(3) does not enter γ_φ)', () => {
  const general = `${ANISO} + x/6*phi1^3*phi2 + y/6*phi1*phi2^3`;
  const generalStructures = [...anisoStructures, (i: number[]) => q(count(i, 0) === 3 ? 1 : 0), (i: number[]) => q(count(i, 0) === 1 ? 1 : 0)];
  for (const [potential, structures] of [[ANISO, anisoStructures], [ROTATED, anisoStructures.map(rotated)], [general, generalStructures]] as const) {
    const flow = flowOf(potential, () => deriveFlow(customModel(2, potential), symbolicCalculus(q(2)), 3));
    assertZeta3Part(flow, 2, [...structures], potential);
  }
});
