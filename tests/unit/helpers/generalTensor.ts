/**
 * Test-side, independent of the engine's diagrams: the two-loop β of a general quartic tensor
 * λ_abcd, evaluated by plain contraction in exact rational arithmetic, and fixed points of two
 * couplings solved by series in ε.
 *
 * Normalisation as in docs/physics.md (u = λ μ^{−ε}/((4π)^{d/2} Γ(s)), minimal subtraction at fixed
 * s, d = 2s − ε): the one-loop bubble has the pole 2/ε, so ½ Σ_ch (λλ) B gives Σ_ch λλ in β; the
 * vertex-corrected bubble ½ Σ_6 (λλλ) I₂, after subtraction, gives −A(s) Σ_6 (λλλ); at s = 2 the
 * field renormalization adds Σ_4 legs γλ. Altogether
 *   β_abcd = −ε λ_abcd + Σ_3 channels λ_abef λ_efcd − A(s) Σ_6 λ_abef λ_ecgh λ_fdgh
 *            [+ at s = 2: Σ_4 legs γ_am λ_mbcd, γ_ab = (1/12) λ_acde λ_bcde],
 * A(s) = ψ(1) − 2ψ(s/2) + ψ(s), A(2) = 1. For O(N) this is β = −εu + (N+8)/3 u² − 2(5N+22)/9 A u³
 * (checked in the tests), and at s = 2 it reproduces the textbook cubic β. */

export class Fraction {
  readonly num: bigint;
  readonly den: bigint;
  constructor(num: bigint | number, den: bigint | number = 1n) {
    let n = BigInt(num);
    let d = BigInt(den);
    if (d < 0n) [n, d] = [-n, -d];
    const g = gcd(n < 0n ? -n : n, d);
    this.num = g === 0n ? 0n : n / g;
    this.den = g === 0n ? 1n : d / g;
  }
  add(o: Fraction): Fraction { return new Fraction(this.num * o.den + o.num * this.den, this.den * o.den); }
  sub(o: Fraction): Fraction { return new Fraction(this.num * o.den - o.num * this.den, this.den * o.den); }
  mul(o: Fraction): Fraction { return new Fraction(this.num * o.num, this.den * o.den); }
  div(o: Fraction): Fraction { return new Fraction(this.num * o.den, this.den * o.num); }
  neg(): Fraction { return new Fraction(-this.num, this.den); }
  isZero(): boolean { return this.num === 0n; }
  toNumber(): number { return Number(this.num) / Number(this.den); }
  toString(): string { return this.den === 1n ? `${this.num}` : `${this.num}/${this.den}`; }
}
function gcd(a: bigint, b: bigint): bigint {
  while (b) [a, b] = [b, a % b];
  return a;
}
export const fr = (n: number, d = 1) => new Fraction(n, d);
const ZERO = fr(0);

/** A rank-4 tensor on n fields, flat index ((a·n + b)·n + c)·n + d. */
export type Tensor4 = Fraction[];

export function tensorOf(n: number, entry: (a: number, b: number, c: number, d: number) => Fraction): Tensor4 {
  const t: Tensor4 = [];
  for (let a = 0; a < n; a++) for (let b = 0; b < n; b++) for (let c = 0; c < n; c++) for (let d = 0; d < n; d++) t.push(entry(a, b, c, d));
  return t;
}

const at = (t: Tensor4, n: number, a: number, b: number, c: number, d: number) => t[((a * n + b) * n + c) * n + d];

/** (X Y)_{(ab),(cd)} = Σ_ef X_abef Y_efcd: tensors as n²×n² matrices. */
function pairProduct(x: Tensor4, y: Tensor4, n: number): Tensor4 {
  const m = n * n;
  const out: Tensor4 = new Array(m * m).fill(ZERO);
  for (let i = 0; i < m; i++) for (let k = 0; k < m; k++) {
    const xik = x[i * m + k];
    if (xik.isZero()) continue;
    for (let j = 0; j < m; j++) out[i * m + j] = out[i * m + j].add(xik.mul(y[k * m + j]));
  }
  return out;
}

/** Σ over the three channels of λ_abef λ_efcd. */
export function oneLoop(l: Tensor4, n: number): Tensor4 {
  const p = pairProduct(l, l, n);
  return tensorOf(n, (a, b, c, d) => at(p, n, a, b, c, d).add(at(p, n, a, c, b, d)).add(at(p, n, a, d, b, c)));
}

/** Σ over the six ways to put two legs on the outer vertex of λ_abef λ_ecgh λ_fdgh. */
export function vertexCorrected(l: Tensor4, n: number): Tensor4 {
  const x = pairProduct(l, l, n); // X_{ec,fd} = Σ_gh λ_ecgh λ_ghfd
  const eye = tensorOf(n, (a, b, c, d) => {
    let s = ZERO;
    for (let e = 0; e < n; e++) for (let f = 0; f < n; f++) {
      const lab = at(l, n, a, b, e, f);
      if (!lab.isZero()) s = s.add(lab.mul(at(x, n, e, c, f, d)));
    }
    return s;
  });
  return tensorOf(n, (a, b, c, d) => [[a, b, c, d], [c, d, a, b], [a, c, b, d], [b, d, a, c], [a, d, b, c], [b, c, a, d]].reduce((s, [p, q, r, t]) => s.add(at(eye, n, p, q, r, t)), ZERO));
}

/** Σ over the four legs of γ_am λ_mbcd with γ_ab = (1/12) λ_acde λ_bcde (s = 2 only). */
export function legCorrections(l: Tensor4, n: number): Tensor4 {
  const gamma: Fraction[][] = Array.from({ length: n }, (_, a) => Array.from({ length: n }, (_, b) => {
    let s = ZERO;
    for (let c = 0; c < n; c++) for (let d = 0; d < n; d++) for (let e = 0; e < n; e++) s = s.add(at(l, n, a, c, d, e).mul(at(l, n, b, c, d, e)));
    return s.mul(fr(1, 12));
  }));
  return tensorOf(n, (a, b, c, d) => {
    let s = ZERO;
    for (let m = 0; m < n; m++) {
      s = s.add(gamma[a][m].mul(at(l, n, m, b, c, d))).add(gamma[b][m].mul(at(l, n, a, m, c, d)));
      s = s.add(gamma[c][m].mul(at(l, n, a, b, m, d))).add(gamma[d][m].mul(at(l, n, a, b, c, m)));
    }
    return s;
  });
}

/** A homogeneous polynomial in two couplings: coefficient of u^i v^(deg−i) at index i. */
export type Binary = Fraction[];

/**
 * The β of two couplings (u, v) from a tensor λ(u, v) = u·U + v·V, projected by `project` (tensor →
 * [β_u, β_v], checked to reproduce the tensor). `aTimesEye` multiplies the vertex-corrected part
 * (−A(s)); `withLegs` adds the s = 2 field renormalization.
 */
export function twoCouplingBeta(n: number, U: Tensor4, V: Tensor4, project: (t: Tensor4) => [Fraction, Fraction], aValue: Fraction, withLegs: boolean): { b2: [Binary, Binary]; b3: [Binary, Binary] } {
  const lambda = (u: Fraction, v: Fraction) => U.map((x, i) => x.mul(u).add(V[i].mul(v)));
  const second = (u: Fraction, v: Fraction) => project(oneLoop(lambda(u, v), n));
  const third = (u: Fraction, v: Fraction) => {
    const l = lambda(u, v);
    const eye = vertexCorrected(l, n).map((x) => x.mul(aValue).neg());
    const total = withLegs ? eye.map((x, i) => x.add(legCorrections(l, n)[i])) : eye;
    return project(total);
  };
  // recover homogeneous coefficients from values at a few points (exact)
  const quad = (f: typeof second, k: 0 | 1): Binary => {
    const [p10, p01, p11] = [f(fr(1), fr(0))[k], f(fr(0), fr(1))[k], f(fr(1), fr(1))[k]];
    return [p01, p11.sub(p10).sub(p01), p10]; // v², uv, u²
  };
  const cubic = (f: typeof third, k: 0 | 1): Binary => {
    const [p10, p01, p11, p1m] = [f(fr(1), fr(0))[k], f(fr(0), fr(1))[k], f(fr(1), fr(1))[k], f(fr(1), fr(-1))[k]];
    const even = p11.add(p1m).mul(fr(1, 2)); // c(u³) + c(u v²)
    const odd = p11.sub(p1m).mul(fr(1, 2)); // c(u² v) + c(v³)
    return [p01, even.sub(p10), odd.sub(p01), p10]; // v³, u v², u² v, u³
  };
  return { b2: [quad(second, 0), quad(second, 1)], b3: [cubic(third, 0), cubic(third, 1)] };
}

/** p(u, v) for a homogeneous binary form (index i = power of u). */
export function evalBinary(p: Binary, u: Fraction, v: Fraction): Fraction {
  const deg = p.length - 1;
  return p.reduce((s, c, i) => s.add(c.mul(pow(u, i)).mul(pow(v, deg - i))), ZERO);
}
const pow = (x: Fraction, k: number) => Array.from({ length: k }, () => x).reduce((s, y) => s.mul(y), fr(1));

/** ∂p/∂u and ∂p/∂v. */
export function gradBinary(p: Binary): [Binary, Binary] {
  const deg = p.length - 1;
  const du = p.slice(1).map((c, i) => c.mul(fr(i + 1)));
  const dv = p.slice(0, deg).map((c, i) => c.mul(fr(deg - i)));
  return [du, dv];
}

export interface SeriesPoint {
  g1: [Fraction, Fraction];
  g2: [Fraction, Fraction];
  /** Eigenvalue series coefficients [ε¹, ε²] of the stability matrix, larger ε¹ coefficient first. */
  eigen: [Fraction, Fraction][];
}

/**
 * A fixed point given by its one-loop couplings, solved by series in ε on the equations divided by
 * the couplings that do not vanish (β_u/u = 0 and/or β_v/v = 0, regular where the full system is
 * degenerate) and with v ≡ 0 (or u ≡ 0) on the invariant line. Eigenvalues of the 2×2 stability
 * matrix from its trace and determinant as series.
 */
export function seriesFixedPoint(beta: { b2: [Binary, Binary]; b3: [Binary, Binary] }, which: 'u-only' | 'v-only' | 'both'): SeriesPoint {
  const { b2, b3 } = beta;
  // β_u/u = −ε + L_uu u + L_uv v + (cubic part)/u, etc. (both β's divisible by their coupling)
  const divided = (p: Binary, k: 0 | 1): Binary => (k === 0 ? p.slice(1) : p.slice(0, p.length - 1)); // β_u / u or β_v / v
  const lin = [divided(b2[0], 0), divided(b2[1], 1)]; // [v, u] coefficients
  const quad = [divided(b3[0], 0), divided(b3[1], 1)]; // [v², uv, u²]
  const rows = which === 'both' ? [0, 1] : which === 'u-only' ? [0] : [1];
  const vars = rows;
  const L = rows.map((r) => vars.map((c) => (c === 0 ? lin[r][1] : lin[r][0])));
  const solve = (rhs: Fraction[]): Fraction[] => {
    if (L.length === 1) return [rhs[0].div(L[0][0])];
    const det = L[0][0].mul(L[1][1]).sub(L[0][1].mul(L[1][0]));
    return [rhs[0].mul(L[1][1]).sub(L[0][1].mul(rhs[1])).div(det), L[0][0].mul(rhs[1]).sub(L[1][0].mul(rhs[0])).div(det)];
  };
  const embed = (x: Fraction[]): [Fraction, Fraction] => [vars.includes(0) ? x[0] : fr(0), vars.includes(1) ? x[vars.indexOf(1)] : fr(0)];
  const g1 = embed(solve(rows.map(() => fr(1))));
  const g2 = embed(solve(rows.map((r) => evalBinary(quad[r], g1[0], g1[1]).neg())));
  // M(ε) = ε M1 + ε² M2, M_ij = ∂_j β_i at g(ε), minus ε δ_ij
  const grads2 = b2.map(gradBinary);
  const grads3 = b3.map(gradBinary);
  const M1 = [0, 1].map((i) => [0, 1].map((j) => evalBinary(grads2[i][j], g1[0], g1[1]).sub(fr(i === j ? 1 : 0))));
  // ∂_j b2_i is linear and ∂_j b3_i quadratic: M2 = ∂_j b2_i(g2) + ∂_j b3_i(g1)
  const M2 = [0, 1].map((i) => [0, 1].map((j) => evalBinary(grads2[i][j], g2[0], g2[1]).add(evalBinary(grads3[i][j], g1[0], g1[1]))));
  const t1 = M1[0][0].add(M1[1][1]);
  const t2 = M2[0][0].add(M2[1][1]);
  const D2 = M1[0][0].mul(M1[1][1]).sub(M1[0][1].mul(M1[1][0]));
  const D3 = M1[0][0].mul(M2[1][1]).add(M2[0][0].mul(M1[1][1])).sub(M1[0][1].mul(M2[1][0])).sub(M2[0][1].mul(M1[1][0]));
  const disc1 = t1.mul(t1).sub(D2.mul(fr(4)));
  const r1 = rationalSqrt(disc1);
  const shift = t1.mul(t2).mul(fr(2)).sub(D3.mul(fr(4))).div(r1.mul(fr(2)));
  const eigen: [Fraction, Fraction][] = [
    [t1.add(r1).mul(fr(1, 2)), t2.add(shift).mul(fr(1, 2))],
    [t1.sub(r1).mul(fr(1, 2)), t2.sub(shift).mul(fr(1, 2))],
  ];
  return { g1, g2, eigen };
}

function rationalSqrt(x: Fraction): Fraction {
  const root = (n: bigint) => {
    let r = BigInt(Math.round(Math.sqrt(Number(n))));
    while (r * r > n) r--;
    while ((r + 1n) * (r + 1n) <= n) r++;
    if (r * r !== n) throw new Error(`${n} is not a square`);
    return r;
  };
  return new Fraction(root(x.num), root(x.den));
}
