/** The arithmetic Faddeev–LeVerrier needs (a coefficient ring or complex numbers over one). */
export interface MatrixArithmetic<T> {
  zero(): T;
  add(a: T, b: T): T;
  mul(a: T, b: T): T;
  /** Multiply by the rational num/den. */
  scale(a: T, num: bigint, den?: bigint): T;
}

/**
 * Characteristic polynomial det(x − A) by Faddeev–LeVerrier: coefficients c_0..c_k (c_k = 1).
 * M_m = A M_{m−1} + c_{k−m+1} I, c_{k−m} = −tr(A M_m)/m (the classical recursion, common practice).
 * Exact over exact rings; O(k⁴) operations, meant for small matrices.
 */
export function characteristicPolynomial<T>(ops: MatrixArithmetic<T> & { one(): T }, a: T[][]): T[] {
  const k = a.length;
  const coeffs: T[] = new Array(k + 1);
  coeffs[k] = ops.one();
  const times = (x: T[][], y: T[][]) => x.map((row) => y[0].map((_, j) => row.reduce((s, v, l) => ops.add(s, ops.mul(v, y[l][j])), ops.zero())));
  let m: T[][] = a.map((row) => row.map(() => ops.zero()));
  for (let step = 1; step <= k; step++) {
    m = times(a, m).map((row, i) => row.map((x, j) => (i === j ? ops.add(x, coeffs[k - step + 1]) : x)));
    const am = times(a, m);
    let trace = ops.zero();
    for (let i = 0; i < k; i++) trace = ops.add(trace, am[i][i]);
    coeffs[k - step] = ops.scale(trace, -1n, BigInt(step));
  }
  return coeffs;
}
