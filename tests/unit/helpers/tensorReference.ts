import assert from 'node:assert/strict';
import { type DerivedFlow } from '../../../shared/engine/diagrams/index';
import { type CouplingPolynomial } from '../../../shared/engine/models/couplingPolynomial';
import { type Expression } from '../../../shared/engine/index';
import { type Q, Q0, q, qAdd, qEquals, qMul, qToString } from '../../../shared/engine/symbolic/rational';

/**
 * Independent tensor references for the field-matrix tests (tests/unit/diagrams/fieldMatrix*.test.ts):
 * plain index loops over exact rationals, with no engine code, plus the anisotropic two-field model
 * and its 45° rotation written out by hand.
 */
// ---- reference: plain tensor contraction with exact rationals, entries polynomial in the couplings ----

/** A polynomial in k couplings: monomial powers "a,b,c" → rational coefficient. */
export type P = Map<string, Q>;
export const key = (powers: number[]) => powers.join(',');
export function pAdd(a: P, b: P, scale: Q = q(1)): P {
  const out = new Map(a);
  for (const [k, c] of b) out.set(k, qAdd(out.get(k) ?? Q0, qMul(c, scale)));
  return out;
}
export function pMul(a: P, b: P): P {
  const out: P = new Map();
  for (const [ka, ca] of a) for (const [kb, cb] of b) {
    const k = key(ka.split(',').map((x, i) => Number(x) + Number(kb.split(',')[i])));
    out.set(k, qAdd(out.get(k) ?? Q0, qMul(ca, cb)));
  }
  return out;
}
export const pConst = (k: number, c: Q): P => new Map([[key(new Array(k).fill(0)), c]]);
export const pVar = (k: number, i: number): P => new Map([[key(Array.from({ length: k }, (_, j) => (j === i ? 1 : 0))), q(1)]]);
export function pEqual(a: P, b: P): boolean {
  for (const k of new Set([...a.keys(), ...b.keys()])) if (!qEquals(a.get(k) ?? Q0, b.get(k) ?? Q0)) return false;
  return true;
}
export const pText = (a: P) => [...a].filter(([, c]) => c.num !== 0n).map(([k, c]) => `${qToString(c)}[${k}]`).join(' + ') || '0';

/** Rank-r tensor over n indices with polynomial entries, flat storage. */
export interface PT { n: number; r: number; e: P[] }
export const idx = (n: number, ...i: number[]) => i.reduce((s, x) => s * n + x, 0);

/** λ = Σ_k g_k S_k for rational structures S_k (written out here, independently of the engine's parser). */
export function lambdaOf(n: number, structures: ((i: number[]) => Q)[]): PT {
  const k = structures.length;
  const e: P[] = [];
  for (let f = 0; f < n ** 4; f++) {
    const i = [Math.floor(f / n ** 3) % n, Math.floor(f / n ** 2) % n, Math.floor(f / n) % n, f % n];
    let p: P = pConst(k, Q0);
    structures.forEach((S, c) => (p = pAdd(p, pVar(k, c), S(i))));
    e.push(p);
  }
  return { n, r: 4, e };
}

/** γ_ab = (1/12) λ_acde λ_bcde (two loops, d = 4 − ε, coupling λ/(16π²)). Recalled from memory (standard general-tensor result, e.g. Osborn & Stergiou, JHEP 05 (2018) 051; Kleinert & Schulte-Frohlinde 2001). */
export function gammaRef(l: PT, k: number): P[][] {
  const n = l.n;
  return Array.from({ length: n }, (_, a) => Array.from({ length: n }, (_, b) => {
    let s = pConst(k, Q0);
    for (let c = 0; c < n; c++) for (let d = 0; d < n; d++) for (let e = 0; e < n; e++) s = pAdd(s, pMul(l.e[idx(n, a, c, d, e)], l.e[idx(n, b, c, d, e)]));
    return new Map([...s].map(([m, c]) => [m, qMul(c, q(1, 12))]));
  }));
}

/**
 * β_ijkl + ελ_ijkl at two loops (recalled from memory, same sources as gammaRef):
 *   (λ_ijmn λ_mnkl + 2 perms) − (λ_ijmn λ_kmop λ_lnop + 5 perms) + Σ_legs γ_ie λ_ejkl.
 * Its O(N) reduction is checked against the textbook numbers first.
 */
export function betaRef(l: PT, k: number): PT {
  const n = l.n;
  const L = (a: number, b: number, c: number, d: number) => l.e[idx(n, a, b, c, d)];
  const zero = () => pConst(k, Q0);
  const bubble: P[] = [];
  for (let f = 0; f < n ** 4; f++) {
    const [a, b, c, d] = [Math.floor(f / n ** 3) % n, Math.floor(f / n ** 2) % n, Math.floor(f / n) % n, f % n];
    let s = zero();
    for (let m = 0; m < n; m++) for (let o = 0; o < n; o++) s = pAdd(s, pMul(L(a, b, m, o), L(m, o, c, d)));
    bubble.push(s);
  }
  const A: P[] = []; // A_klmn = Σ_op λ_kmop λ_lnop
  for (let f = 0; f < n ** 4; f++) {
    const [kk, ll, m, nn] = [Math.floor(f / n ** 3) % n, Math.floor(f / n ** 2) % n, Math.floor(f / n) % n, f % n];
    let s = zero();
    for (let o = 0; o < n; o++) for (let p = 0; p < n; p++) s = pAdd(s, pMul(L(kk, m, o, p), L(ll, nn, o, p)));
    A.push(s);
  }
  const T = (i: number, j: number, kk: number, ll: number) => {
    let s = zero();
    for (let m = 0; m < n; m++) for (let nn = 0; nn < n; nn++) s = pAdd(s, pMul(L(i, j, m, nn), A[idx(n, kk, ll, m, nn)]));
    return s;
  };
  const g = gammaRef(l, k);
  const e: P[] = [];
  for (let f = 0; f < n ** 4; f++) {
    const x = [Math.floor(f / n ** 3) % n, Math.floor(f / n ** 2) % n, Math.floor(f / n) % n, f % n];
    const [i, j, kk, ll] = x;
    let s = pAdd(pAdd(bubble[idx(n, i, j, kk, ll)], bubble[idx(n, i, kk, j, ll)]), bubble[idx(n, i, ll, j, kk)]);
    for (const [a, b, c, d] of [[i, j, kk, ll], [i, kk, j, ll], [i, ll, j, kk], [j, kk, i, ll], [j, ll, i, kk], [kk, ll, i, j]]) s = pAdd(s, T(a, b, c, d), q(-1));
    for (let leg = 0; leg < 4; leg++) for (let ee = 0; ee < n; ee++) {
      const y = [...x];
      y[leg] = ee;
      s = pAdd(s, pMul(g[x[leg]][ee], l.e[idx(n, y[0], y[1], y[2], y[3])]));
    }
    e.push(s);
  }
  return { n, r: 4, e };
}

export const exact = (c: Expression): Q => {
  const v = c.rationalValue();
  assert.ok(v, 'exact rational coefficient at s = 2');
  return v;
};
export const toP = (p: CouplingPolynomial<Expression>): P => new Map([...p.terms.values()].map((t) => [key([...t.powers]), exact(t.coeff)]));

/** The engine's β as a tensor Σ_k beta_k(g) S_k with the reference structures S_k. */
export function engineBetaTensor(flow: DerivedFlow<Expression>, n: number, structures: ((i: number[]) => Q)[]): PT {
  const k = structures.length;
  const e: P[] = [];
  for (let f = 0; f < n ** 4; f++) {
    const i = [Math.floor(f / n ** 3) % n, Math.floor(f / n ** 2) % n, Math.floor(f / n) % n, f % n];
    let s = pConst(k, Q0);
    structures.forEach((S, c) => (s = pAdd(s, toP(flow.beta[c]), S(i))));
    e.push(s);
  }
  return { n, r: 4, e };
}


// the anisotropic model u/24 φ1⁴ + v/24 φ2⁴ + w/4 φ1²φ2²: λ_1111 = u, λ_2222 = v, λ_1122 (all orders) = w
export const count = (i: number[], a: number) => i.filter((x) => x === a).length;
export const ANISO = 'u/24*phi1^4 + v/24*phi2^4 + w/4*phi1^2*phi2^2';
export const anisoStructures = [(i: number[]) => q(count(i, 0) === 4 ? 1 : 0), (i: number[]) => q(count(i, 1) === 4 ? 1 : 0), (i: number[]) => q(count(i, 0) === 2 ? 1 : 0)];
// the same model in the fields (φ1 ± φ2)/√2: S'_abcd = Σ S_a'b'c'd' R_a'a R_b'b R_c'c R_d'd, R = [[1,1],[1,−1]]/√2
export const ROTATED = 'u/96*(phi1+phi2)^4 + v/96*(phi1-phi2)^4 + w/16*(phi1^2-phi2^2)^2';
export const R = [[1, 1], [1, -1]];
export const rotated = (S: (i: number[]) => Q) => (i: number[]) => {
  let s = Q0;
  for (let f = 0; f < 16; f++) {
    const j = [(f >> 3) & 1, (f >> 2) & 1, (f >> 1) & 1, f & 1];
    s = qAdd(s, qMul(S(j), q(j.reduce((p, x, t) => p * R[x][i[t]], 1), 4)));
  }
  return s;
};

export function assertTensorsEqual(a: PT, b: PT, label: string) {
  a.e.forEach((p, f) => assert.ok(pEqual(p, b.e[f]), `${label} entry ${f}: ${pText(p)} vs ${pText(b.e[f])}`));
}

