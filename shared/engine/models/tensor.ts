import { fail } from '../precision';

/**
 * A dense tensor with exact integer entries over n index values. Model tensors are scaled to
 * integers (the rational scale is kept beside them), so every contraction is exact.
 */
export interface Tensor {
  readonly n: number;
  readonly rank: number;
  readonly data: bigint[];
}

export function zeroTensor(n: number, rank: number): Tensor {
  return { n, rank, data: new Array<bigint>(n ** rank).fill(0n) };
}

export function tensorIndex(n: number, indices: readonly number[]): number {
  let k = 0;
  for (const i of indices) k = k * n + i;
  return k;
}

export function tensorFrom(n: number, rank: number, entry: (indices: number[]) => bigint | number): Tensor {
  const t = zeroTensor(n, rank);
  forEachIndex(n, rank, (indices, k) => {
    t.data[k] = BigInt(entry(indices));
  });
  return t;
}

/** Visit every multi-index of the given rank in storage order. */
export function forEachIndex(n: number, rank: number, visit: (indices: number[], flat: number) => void): void {
  const indices = new Array<number>(rank).fill(0);
  const total = n ** rank;
  for (let flat = 0; flat < total; flat++) {
    visit(indices, flat);
    for (let p = rank - 1; p >= 0; p--) {
      if (++indices[p] < n) break;
      indices[p] = 0;
    }
  }
}

export const kronecker = (n: number): Tensor => tensorFrom(n, 2, ([a, b]) => (a === b ? 1 : 0));

export function addTensors(a: Tensor, b: Tensor, scaleB = 1n): Tensor {
  const out = zeroTensor(a.n, a.rank);
  for (let k = 0; k < out.data.length; k++) out.data[k] = a.data[k] + scaleB * b.data[k];
  return out;
}

export function innerProduct(a: Tensor, b: Tensor): bigint {
  let s = 0n;
  for (let k = 0; k < a.data.length; k++) if (a.data[k] !== 0n && b.data[k] !== 0n) s += a.data[k] * b.data[k];
  return s;
}

/** out[i_0..i_r] = t[i_{perm[0]}..]: the tensor with its slots relabelled by perm. */
export function permuteSlots(t: Tensor, perm: readonly number[]): Tensor {
  const out = zeroTensor(t.n, t.rank);
  const source = new Array<number>(t.rank);
  forEachIndex(t.n, t.rank, (indices, flat) => {
    for (let p = 0; p < t.rank; p++) source[perm[p]] = indices[p];
    out.data[flat] = t.data[tensorIndex(t.n, source)];
  });
  return out;
}

export function isFullySymmetric(t: Tensor): boolean {
  for (const perm of permutations(t.rank)) {
    const p = permuteSlots(t, perm);
    for (let k = 0; k < t.data.length; k++) if (p.data[k] !== t.data[k]) return false;
  }
  return true;
}

export function permutations(m: number): number[][] {
  if (m === 0) return [[]];
  const out: number[][] = [];
  for (const rest of permutations(m - 1)) for (let pos = 0; pos <= rest.length; pos++) out.push([...rest.slice(0, pos), m - 1, ...rest.slice(pos)]);
  return out;
}

/** One factor of a contraction: a tensor whose slots carry index labels. */
export interface LabelledTensor {
  tensor: Tensor;
  labels: readonly string[];
}

/** Integer arithmetic for a contraction: doubles while every partial sum stays below 2^53, BigInt beyond. */
interface Arithmetic<T> {
  zero: T;
  one: T;
  of(x: bigint): T;
  entry(x: T): bigint;
  isZero(x: T): boolean;
  /** out[k] += a·b */
  addProduct(out: T[], k: number, a: T, b: T): void;
}

const DOUBLE: Arithmetic<number> = {
  zero: 0,
  one: 1,
  of: Number,
  entry: BigInt,
  isZero: (x) => x === 0,
  addProduct: (out, k, a, b) => {
    out[k] += a * b;
  },
};

const BIG: Arithmetic<bigint> = {
  zero: 0n,
  one: 1n,
  of: (x) => x,
  entry: (x) => x,
  isZero: (x) => x === 0n,
  addProduct: (out, k, a, b) => {
    out[k] += a * b;
  },
};

interface Partial<T> {
  labels: string[];
  data: T[];
}

const EXACT_DOUBLE = 2n ** 53n;

function maxAbs(t: Tensor): bigint {
  let m = 0n;
  for (const x of t.data) if ((x < 0n ? -x : x) > m) m = x < 0n ? -x : x;
  return m;
}

/** Π max|factor| · n^(summed labels) bounds every partial sum of the contraction. */
function fitsInDoubles(factors: readonly LabelledTensor[], open: readonly string[], n: number): boolean {
  const summed = new Set(factors.flatMap((f) => f.labels).filter((l) => !open.includes(l))).size;
  let bound = BigInt(n) ** BigInt(summed);
  for (const f of factors) bound *= maxAbs(f.tensor);
  return bound < EXACT_DOUBLE;
}

/**
 * Σ over every label that is not in `open` of the product of the factors (an einsum), exactly.
 * Factors are multiplied in order; a label is summed as soon as no later factor uses it,
 * which keeps intermediate tensors small for the graphs we contract.
 */
export function contract(factors: readonly LabelledTensor[], open: readonly string[]): Tensor {
  if (factors.length === 0) fail('invalid', 'contraction of no tensors');
  const n = factors[0].tensor.n;
  const ordered = cheapestOrder(factors, open, n);
  return fitsInDoubles(ordered, open, n) ? contractWith(DOUBLE, ordered, open, n) : contractWith(BIG, ordered, open, n);
}

/** Cost of multiplying in this order: Σ n^(labels in play at each step) (each step loops over them). */
function orderCost(factors: readonly LabelledTensor[], open: readonly string[], n: number): number {
  let live: string[] = [];
  let cost = 0;
  factors.forEach((f, i) => {
    const all = new Set([...live, ...f.labels]);
    cost += n ** all.size;
    const later = new Set([...open, ...factors.slice(i + 1).flatMap((g) => g.labels)]);
    live = [...all].filter((l) => later.has(l));
  });
  return cost;
}

/** The cheapest order of up to six factors (tried exhaustively; more keep their order). */
function cheapestOrder(factors: readonly LabelledTensor[], open: readonly string[], n: number): readonly LabelledTensor[] {
  if (factors.length < 3 || factors.length > 6) return factors;
  let best = factors;
  let bestCost = orderCost(factors, open, n);
  for (const perm of permutations(factors.length)) {
    const candidate = perm.map((i) => factors[i]);
    const cost = orderCost(candidate, open, n);
    if (cost < bestCost) {
      best = candidate;
      bestCost = cost;
    }
  }
  return best;
}

function contractWith<T>(arith: Arithmetic<T>, factors: readonly LabelledTensor[], open: readonly string[], n: number): Tensor {
  let acc: Partial<T> = { labels: [], data: [arith.one] };
  factors.forEach((factor, i) => {
    const later = new Set([...open, ...factors.slice(i + 1).flatMap((f) => f.labels)]);
    acc = multiplyAndSum(arith, acc, { labels: factor.labels, data: factor.tensor.data.map(arith.of) }, later, n);
  });
  const order = open.map((label) => acc.labels.indexOf(label));
  if (order.some((p) => p < 0)) fail('invalid', `open label missing from the contraction: ${open.join(',')}`);
  const out = zeroTensor(n, open.length);
  const source = new Array<number>(acc.labels.length);
  forEachIndex(n, open.length, (indices, flat) => {
    order.forEach((p, j) => (source[p] = indices[j]));
    out.data[flat] = arith.entry(acc.data[tensorIndex(n, source)]);
  });
  return out;
}

function multiplyAndSum<T>(arith: Arithmetic<T>, acc: Partial<T>, factor: { labels: readonly string[]; data: T[] }, keep: ReadonlySet<string>, n: number): Partial<T> {
  const all = [...new Set([...acc.labels, ...factor.labels])];
  const kept = all.filter((l) => keep.has(l));
  const position = (l: string) => all.indexOf(l);
  const accSlots = acc.labels.map(position);
  const factorSlots = factor.labels.map(position);
  const keptSlots = kept.map(position);
  const out = new Array<T>(n ** kept.length).fill(arith.zero);
  const accIdx = new Array<number>(accSlots.length);
  const facIdx = new Array<number>(factorSlots.length);
  const keptIdx = new Array<number>(keptSlots.length);
  forEachIndex(n, all.length, (indices) => {
    for (let j = 0; j < factorSlots.length; j++) facIdx[j] = indices[factorSlots[j]];
    const f = factor.data[tensorIndex(n, facIdx)];
    if (arith.isZero(f)) return;
    for (let j = 0; j < accSlots.length; j++) accIdx[j] = indices[accSlots[j]];
    const a = acc.data[tensorIndex(n, accIdx)];
    if (arith.isZero(a)) return;
    for (let j = 0; j < keptSlots.length; j++) keptIdx[j] = indices[keptSlots[j]];
    arith.addProduct(out, tensorIndex(n, keptIdx), a, f);
  });
  return { labels: kept, data: out };
}
