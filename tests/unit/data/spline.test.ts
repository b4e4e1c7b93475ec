import { test } from 'node:test';
import assert from 'node:assert/strict';
import * as math from 'mathjs';
import { fitSpline, gcvSpline, gcvScore, prepareSpline, evaluateSpline } from '../../../shared/engine/data/spline';
import { mulberry32 } from '../../../shared/engine/data/random';

// Invented test data: 12 unevenly spaced points of a wiggly curve with deterministic noise, and weights.
const random = mulberry32(7);
const X = [0, 0.07, 0.2, 0.26, 0.41, 0.5, 0.63, 0.7, 0.81, 0.88, 0.95, 1.1];
const Y = X.map((x) => Math.sin(3 * x) + 0.3 * x * x + 0.02 * (random() - 0.5));
const W = X.map((_, i) => 0.5 + (i % 3) * 0.75);

/**
 * The penalised least-squares problem written densely, as in Green & Silverman, "Nonparametric
 * Regression and Generalized Linear Models" (1994), §2.1–2.3: ∫ f''² = gᵀ Q R⁻¹ Qᵀ g, and the
 * fitted values solve (W + λ Q R⁻¹ Qᵀ) g = W y. Solved here with mathjs (a reference library).
 */
function denseProblem(x: number[], w: number[], lambda: number) {
  const n = x.length;
  const h = x.slice(1).map((v, i) => v - x[i]);
  const Q = math.zeros(n, n - 2) as math.Matrix;
  const R = math.zeros(n - 2, n - 2) as math.Matrix;
  for (let j = 1; j <= n - 2; j++) {
    Q.set([j - 1, j - 1], 1 / h[j - 1]);
    Q.set([j, j - 1], -1 / h[j - 1] - 1 / h[j]);
    Q.set([j + 1, j - 1], 1 / h[j]);
    R.set([j - 1, j - 1], (h[j - 1] + h[j]) / 3);
    if (j < n - 2) {
      R.set([j - 1, j], h[j] / 6);
      R.set([j, j - 1], h[j] / 6);
    }
  }
  const K = math.multiply(math.multiply(Q, math.inv(R)), math.transpose(Q)) as math.Matrix;
  const Wm = math.diag(w) as math.Matrix;
  const system = math.add(Wm, math.multiply(lambda, K)) as math.Matrix;
  return { system, Wm };
}

function denseFit(x: number[], y: number[], w: number[], lambda: number): number[] {
  const { system, Wm } = denseProblem(x, w, lambda);
  const solution = math.lusolve(system, math.multiply(Wm, math.matrix(y))) as math.Matrix;
  return (solution.toArray() as number[][]).map((row) => row[0]);
}

function denseTrace(x: number[], w: number[], lambda: number): number {
  const { system, Wm } = denseProblem(x, w, lambda);
  return math.trace(math.multiply(math.inv(system), Wm) as math.Matrix) as number;
}

const LAMBDAS = [1e-6, 1e-4, 1e-3, 1e-2, 0.1, 1];

test('fitted values agree with the dense penalised least-squares solution (mathjs.lusolve) to 1e-9', () => {
  const setup = prepareSpline(X, Y, W);
  for (const lambda of LAMBDAS) {
    const banded = fitSpline(setup, lambda).values;
    const dense = denseFit(X, Y, W, lambda);
    dense.forEach((value, i) => assert.ok(Math.abs(banded[i] - value) < 1e-9, `λ=${lambda}, point ${i}: ${banded[i]} vs ${value}`));
  }
});

test('tr A(λ) from the inverse band equals the trace of the dense hat matrix (mathjs.inv)', () => {
  const setup = prepareSpline(X, Y, W);
  for (const lambda of LAMBDAS) {
    const trace = fitSpline(setup, lambda).trace;
    const dense = denseTrace(X, W, lambda);
    assert.ok(Math.abs(trace - dense) < 1e-8, `λ=${lambda}: ${trace} vs ${dense}`);
  }
});

test('the chosen λ has a GCV score no worse than the dense GCV at any λ of a fine grid', () => {
  const setup = prepareSpline(X, Y);
  const chosen = gcvSpline(setup);
  const ones = X.map(() => 1);
  const n = X.length;
  for (let e = -9; e <= 2; e += 0.05) {
    const lambda = 10 ** e;
    const fitted = denseFit(X, Y, ones, lambda);
    const rss = fitted.reduce((sum, g, i) => sum + (Y[i] - g) ** 2, 0);
    const gcv = (n * rss) / (n - denseTrace(X, ones, lambda)) ** 2; // GCV as defined by Craven & Wahba (1979)
    assert.ok(chosen.gcv <= gcv * (1 + 1e-6), `λ=${lambda}: dense GCV ${gcv} below the chosen ${chosen.gcv}`);
  }
  assert.ok(Math.abs(gcvScore(chosen) - chosen.gcv) < 1e-15);
});

test('λ → ∞ gives the weighted least-squares straight line (closed form)', () => {
  const sw = W.reduce((a, b) => a + b, 0);
  const mx = W.reduce((a, w, i) => a + w * X[i], 0) / sw;
  const my = W.reduce((a, w, i) => a + w * Y[i], 0) / sw;
  const sxy = W.reduce((a, w, i) => a + w * (X[i] - mx) * (Y[i] - my), 0);
  const sxx = W.reduce((a, w, i) => a + w * (X[i] - mx) ** 2, 0);
  const slope = sxy / sxx;
  const fit = fitSpline(prepareSpline(X, Y, W), 1e9);
  X.forEach((x, i) => assert.ok(Math.abs(fit.values[i] - (my + slope * (x - mx))) < 1e-7, `point ${i}`));
  assert.ok(Math.abs(fit.trace - 2) < 1e-6, `a line has 2 degrees of freedom, got ${fit.trace}`);
});

test('a straight line is reproduced exactly at every λ, with zero second derivative', () => {
  const line = X.map((x) => 2.5 - 1.75 * x);
  const setup = prepareSpline(X, line, W);
  for (const lambda of [1e-10, ...LAMBDAS, 1e4]) {
    const fit = fitSpline(setup, lambda);
    line.forEach((value, i) => assert.ok(Math.abs(fit.values[i] - value) < 1e-10, `λ=${lambda}, point ${i}`));
    fit.second.forEach((value) => assert.ok(Math.abs(value) < 1e-8, `λ=${lambda}: f'' = ${value}`));
    const [, slope] = evaluateSpline(fit, 0.33);
    assert.ok(Math.abs(slope + 1.75) < 1e-8);
  }
});

test('λ → 0 interpolates the data (n degrees of freedom)', () => {
  const fit = fitSpline(prepareSpline(X, Y, W), 1e-14);
  Y.forEach((value, i) => assert.ok(Math.abs(fit.values[i] - value) < 1e-9, `point ${i}`));
  assert.ok(Math.abs(fit.trace - X.length) < 1e-6, `trace ${fit.trace}`);
});

test('the spline pieces join with continuous value, slope and second derivative at the knots', () => {
  const fit = fitSpline(prepareSpline(X, Y, W), 1e-3);
  for (let i = 1; i < X.length - 1; i++) {
    const left = evaluateSpline(fit, X[i], i - 1);
    const right = evaluateSpline(fit, X[i], i);
    for (let k = 0; k < 3; k++) assert.ok(Math.abs(left[k] - right[k]) < 1e-9, `knot ${i}, derivative ${k}`);
    assert.ok(Math.abs(left[0] - fit.values[i]) < 1e-12);
  }
});
