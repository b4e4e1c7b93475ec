import { test } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { evaluate } from 'mathjs';
import {
  Expression,
  affine,
  affineParameter,
  bubbleSeries,
  eulerGammaExpr,
  evaluateExpression,
  expressionToLatex,
  expressionToString,
  fourierPowerFactors,
  gammaExpr,
  gammaProductSeries,
  gammaSeries,
  log2Expr,
  numericContext,
  piExpr,
  psiExpr,
  q,
  special,
  starTriangleFactors,
  symbolicContext,
} from '../../../shared/engine/index';
import { assertDigits, wide } from '../helpers/engine';

const s = affineParameter('s');
const aHalfS = affine(q(0), { s: q(1, 2) });
const dLongRange = affine(q(0), { s: q(2), eps: q(-1) }); // d = 2s − ε (docs/physics.md §1)

test('G(1,1) in d = 3 gives 1/(8|p|): G/(4π)^{3/2} = 1/8 (docs/physics.md §4)', () => {
  const series = bubbleSeries(numericContext({}, 40), affine(q(1)), affine(q(1)), affine(q(3)), 2);
  assert.equal(series.lowest, 0);
  const pi = wide(special.pi(45));
  assertDigits(wide(series.coefficient(0)).div(pi.times(4).pow(1.5)), '0.125', 38, 'G(1,1)/(4pi)^(3/2)');
  assert.ok(wide(series.coefficient(1)).isZero() && wide(series.coefficient(2)).isZero(), 'no eps dependence');
});

test('Fourier transform of a power, d = 3, a = 1: π^{3/2}·2·Γ(1/2)/Γ(1) = 2π² (docs/physics.md §4)', () => {
  const { factors, piExponent, twoExponent } = fourierPowerFactors(affine(q(1)), affine(q(3)));
  const series = gammaProductSeries(numericContext({}, 40), factors, 0);
  const pi = wide(special.pi(45));
  const value = wide(series.coefficient(0)).times(pi.pow(wide(piExponent.constant.num.toString()).div(piExponent.constant.den.toString()))).times(wide(2).pow(Number(twoExponent.constant.num)));
  assertDigits(value, pi.pow(2).times(2).toString(), 38, '2 pi^2');
});

test('G(s/2,s/2) in d = 2s−ε, symbolic: pole 2/(εΓ(s)), finite part (−2ψ(s/2)+2ψ(s)−γ_E)/Γ(s) (docs/physics.md §4 check)', () => {
  const series = bubbleSeries(symbolicContext(), aHalfS, aHalfS, dLongRange, 0);
  assert.equal(series.lowest, -1);
  assert.equal(series.order, 0);
  const inverseGammaS = gammaExpr(s).inverse();
  const expectedPole = inverseGammaS.scale(q(2));
  const expectedFinite = psiExpr(0, aHalfS).scale(q(-2)).add(psiExpr(0, s).scale(q(2))).sub(eulerGammaExpr()).mul(inverseGammaS);
  assert.ok(series.coefficient(-1).equals(expectedPole), expressionToString(series.coefficient(-1)));
  assert.ok(series.coefficient(0).equals(expectedFinite), expressionToString(series.coefficient(0)));
  assert.equal(expressionToString(series.coefficient(-1)), '2/gamma(s)');
  assert.equal(expressionToLatex(series.coefficient(-1)), '\\frac{2}{\\Gamma\\left(s\\right)}');
});

test('G(s/2,s/2) numeric at random s ∈ (1, 2) matches 2/Γ(s) and (−2ψ(s/2)+2ψ(s)−γ_E)/Γ(s) to 30 digits (docs/physics.md §4)', () => {
  fc.assert(
    fc.property(fc.integer({ min: 1001, max: 1999 }), (k) => {
      const sv = q(k, 1000);
      const text = (k / 1000).toFixed(3);
      const series = bubbleSeries(numericContext({ s: sv }, 45), aHalfS, aHalfS, dLongRange, 0);
      const g = wide(special.gamma(text, 40));
      assertDigits(series.coefficient(-1), wide(2).div(g).toString(), 30, `pole at s=${text}`);
      const finite = wide(special.digamma(wide(text).div(2).toString(), 40)).times(-2).plus(wide(special.digamma(text, 40)).times(2)).minus(special.eulerGamma(40)).div(g);
      assertDigits(series.coefficient(0), finite.toString(), 30, `finite part at s=${text}`);
    }),
    { numRuns: 10 },
  );
});

test('symbolic output parses back with mathjs and evaluates to the numeric coefficients (issue 3 check)', () => {
  const symbolic = bubbleSeries(symbolicContext(), aHalfS, aHalfS, dLongRange, 2);
  for (const sv of ['1.3', '1.5', '1.75']) {
    const numeric = bubbleSeries(numericContext({ s: { num: BigInt(Math.round(Number(sv) * 100)), den: 100n } }, 40), aHalfS, aHalfS, dLongRange, 2);
    for (let k = -1; k <= 2; k++) {
      const text = expressionToString(symbolic.coefficient(k));
      const scope = {
        s: Number(sv),
        psi: (order: number, x: number) => Number(special.polygamma(order, x.toPrecision(17), 20)),
        eulergamma: 0.5772156649015329, // OEIS A001620
      };
      const viaMathjs = evaluate(text, scope) as number;
      const exact = Number(numeric.coefficient(k));
      assert.ok(Math.abs(viaMathjs - exact) <= 1e-11 * Math.max(1, Math.abs(exact)), `eps^${k} at s=${sv}: ${viaMathjs} vs ${exact} (${text})`);
      // and at full precision through the engine's own evaluation of the symbols
      assertDigits(evaluateExpression(symbolic.coefficient(k), { s: q(BigInt(Math.round(Number(sv) * 100)), 100n) }, 35), numeric.coefficient(k).toString(), 30, `eps^${k}`);
    }
  }
});

test('Γ(x+cε) at a pole: Γ(−n+ε) has residue (−1)^n/n! and the next coefficient (−1)^n/n!·(ψ(n+1)) (DLMF 5.2.1, 5.7.1)', () => {
  for (const n of [0, 1, 2, 3]) {
    const series = gammaSeries(symbolicContext(), { x: affine(q(-n)), c: q(1) }, 2);
    assert.equal(series.lowest, -1);
    let factorial = 1n;
    for (let i = 2n; i <= BigInt(n); i++) factorial *= i;
    const sign = n % 2 === 0 ? 1n : -1n;
    assert.ok(series.coefficient(-1).equals(Expression.rational(q(sign, factorial))), `residue n=${n}`);
    // Γ(−n+ε) = (−1)^n/n! [1/ε + ψ(n+1) + O(ε)]
    const expected = psiExpr(0, affine(q(n + 1))).scale(q(sign, factorial));
    assert.ok(series.coefficient(0).equals(expected), `n=${n}: ${expressionToString(series.coefficient(0))}`);
  }
  const reciprocal = gammaSeries(symbolicContext(), { x: affine(q(0)), c: q(1) }, 2, true);
  assert.equal(reciprocal.lowest, 1);
  assert.equal(expressionToString(reciprocal.coefficient(1)), '1');
  assert.equal(expressionToString(reciprocal.coefficient(2)), 'eulergamma'); // 1/Γ(ε) = ε + γε² + … (DLMF 5.7.1)
});

test('canonical forms: ψ(1) = −γ_E, ψ(s+1) = ψ(s) + 1/s, A(1) = 4 ln 2, A(2) = 1 (docs/physics.md §5 check values)', () => {
  assert.equal(expressionToString(psiExpr(0, affine(q(1)))), '-eulergamma');
  assert.equal(expressionToString(psiExpr(0, affine(q(1), { s: q(1) }))), '1/s + psi(0, s)');
  const at = (c: bigint) => affine(q(c));
  const A1 = psiExpr(0, at(1n)).sub(psiExpr(0, affine(q(1, 2))).scale(q(2))).add(psiExpr(0, at(1n)));
  assert.ok(A1.equals(log2Expr().scale(q(4))), expressionToString(A1));
  const A2 = psiExpr(0, at(1n)).sub(psiExpr(0, at(1n)).scale(q(2))).add(psiExpr(0, at(2n)));
  assert.equal(expressionToString(A2), '1');
  // A(3/2) = 2 − π + 4 ln 2 numerically (docs/physics.md §5)
  const A32 = psiExpr(0, at(1n)).sub(psiExpr(0, affine(q(3, 4))).scale(q(2))).add(psiExpr(0, affine(q(3, 2))));
  const pi = wide(special.pi(45));
  assertDigits(evaluateExpression(A32, {}, 40), wide(2).minus(pi).plus(wide(special.ln2(45)).times(4)).toString(), 40, 'A(3/2)');
  // ζ(2) reduces to π²/6, Γ(1/2) to √π
  assert.equal(expressionToString(psiExpr(1, affine(q(1)))), 'pi^2/6');
  assert.ok(gammaExpr(affine(q(1, 2))).equals(piExpr().pow(q(1, 2))));
  // equal coefficients print equally whatever the construction order
  const x = psiExpr(0, s).mul(gammaExpr(s)).add(eulerGammaExpr());
  const y = eulerGammaExpr().add(gammaExpr(s).mul(psiExpr(0, s)));
  assert.equal(expressionToString(x), expressionToString(y));
});

test('star–triangle prefactor needs δ1+δ2+δ3 = d, and its Γ-series is exact to the requested order (docs/physics.md §4)', () => {
  const d = affine(q(3));
  assert.throws(() => starTriangleFactors([affine(q(1)), affine(q(1)), affine(q(1, 2))], d), /star-triangle/);
  const { factors } = starTriangleFactors([affine(q(1)), affine(q(1)), affine(q(1))], d);
  // Π Γ(1/2)/Γ(1) = π^{3/2}
  const series = gammaProductSeries(numericContext({}, 40), factors, 0);
  assertDigits(series.coefficient(0), wide(special.pi(45)).pow(1.5).toString(), 38, 'pi^(3/2)');
});

test('the vertex-corrected bubble I2 = G(a,a)·G(a+s−d/2, a) has a double pole (docs/physics.md §4)', () => {
  const a = aHalfS;
  const first = bubbleSeries(symbolicContext(), a, a, dLongRange, 1);
  const shifted = affine(q(0), { s: q(1, 2), eps: q(1, 2) }); // a + s − d/2 = s/2 + ε/2
  const second = bubbleSeries(symbolicContext(), shifted, a, dLongRange, 0);
  const product = first.mul(second);
  assert.equal(product.lowest, -2);
  assert.equal(product.order, -1);
});
