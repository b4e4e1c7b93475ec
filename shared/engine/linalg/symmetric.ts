import { type Real, realContext } from '../precision';

/** Eigenvalues and orthonormal eigenvectors (columns of V) of a real symmetric matrix (cyclic Jacobi). */
export function symmetricEigen(a0: Real[][], digits: number): { values: Real[]; vectors: Real[][] } {
  const R = realContext(digits);
  const n = a0.length;
  const a = a0.map((row) => row.map((x) => new R(x)));
  const v = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => new R(i === j ? 1 : 0)));
  let norm = new R(0);
  for (const row of a) for (const x of row) norm = norm.plus(x.times(x));
  const tol = norm.sqrt().times(new R(10).pow(-(digits - 6)));
  for (let sweep = 0; sweep < 60; sweep++) {
    let off = new R(0);
    for (let p = 0; p < n; p++) for (let q = p + 1; q < n; q++) off = off.plus(a[p][q].abs());
    if (off.lte(tol)) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        if (a[p][q].abs().lte(tol.div(n * n))) continue;
        const theta = a[q][q].minus(a[p][p]).div(a[p][q].times(2));
        const sign = theta.isNegative() ? -1 : 1;
        const t = new R(sign).div(theta.abs().plus(theta.times(theta).plus(1).sqrt()));
        const c = new R(1).div(t.times(t).plus(1).sqrt());
        const s = t.times(c);
        for (let k = 0; k < n; k++) {
          const akp = a[k][p];
          const akq = a[k][q];
          a[k][p] = c.times(akp).minus(s.times(akq));
          a[k][q] = s.times(akp).plus(c.times(akq));
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p][k];
          const aqk = a[q][k];
          a[p][k] = c.times(apk).minus(s.times(aqk));
          a[q][k] = s.times(apk).plus(c.times(aqk));
        }
        for (let k = 0; k < n; k++) {
          const vkp = v[k][p];
          const vkq = v[k][q];
          v[k][p] = c.times(vkp).minus(s.times(vkq));
          v[k][q] = s.times(vkp).plus(c.times(vkq));
        }
      }
    }
  }
  return { values: a.map((row, i) => row[i]), vectors: v };
}
