import { test } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import Decimal from 'decimal.js';
import stdlibDigamma from '@stdlib/math-base-special-digamma';
import stdlibGamma from '@stdlib/math-base-special-gamma';
import stdlibGammaln from '@stdlib/math-base-special-gammaln';
import stdlibZeta from '@stdlib/math-base-special-riemann-zeta';
import stdlibTrigamma from '@stdlib/math-base-special-trigamma';
import { EngineError, special } from '../../../shared/engine/index';
import { assertDigits, decimalText, relativeDifference, wide } from '../helpers/engine';
import { MPMATH } from '../helpers/reference-values';

const D = 100;
const RUNS = 25;

test('closed forms at 100 digits: ψ(1/4) = −γ − π/2 − 3 ln 2, ψ(1/3) = −γ − π/(2√3) − (3/2) ln 3, ψ′(1/4) = π² + 8G (DLMF 5.4.19, 5.15; docs/physics.md §10)', () => {
  const g = wide(special.eulerGamma(D + 10));
  const pi = wide(special.pi(D + 10));
  const l2 = wide(special.ln2(D + 10));
  const G = wide(special.catalan(D + 10));
  assertDigits(special.digamma('0.25', D), g.neg().minus(pi.div(2)).minus(l2.times(3)).toString(), D, 'psi(1/4)');
  const ln3 = wide(3).ln();
  assertDigits(special.digamma({ num: 1n, den: 3n }, D), g.neg().minus(pi.div(wide(3).sqrt().times(2))).minus(ln3.times(1.5)).toString(), D, 'psi(1/3)');
  assertDigits(special.trigamma('0.25', D), pi.pow(2).plus(G.times(8)).toString(), D, "psi'(1/4)");
});

test('values at 100–500 digits against mpmath (reference library)', () => {
  assertDigits(special.digamma('0.25', 100), MPMATH['psi_1/4'], 100, 'psi(1/4)');
  assertDigits(special.digamma({ num: 1n, den: 3n }, 100), MPMATH['psi_1/3'], 100, 'psi(1/3)');
  assertDigits(special.trigamma('0.25', 100), MPMATH['psi1_1/4'], 100, "psi'(1/4)");
  assertDigits(special.gamma('-3.7', 100), MPMATH['gamma_-3.7'], 100, 'Gamma(-3.7)');
  assertDigits(special.gamma('-18.1017323942078', 100), MPMATH['gamma_-18.1017323942078'], 100, 'Gamma(-18.10…)');
  assertDigits(special.gamma('-60.25', 100), MPMATH['gamma_-60.25'], 100, 'Gamma(-60.25)');
  assertDigits(special.digamma('-60.25', 100), MPMATH['psi_-60.25'], 100, 'psi(-60.25)');
  assertDigits(special.polygamma(2, '-30.7', 100), MPMATH['psi2_-30.7'], 100, 'psi2(-30.7)');
  assertDigits(special.polygamma(3, '-1.25', 100), MPMATH['psi3_-1.25'], 100, 'psi3(-1.25)');
  assertDigits(special.polygamma(5, '0.1', 100), MPMATH['psi5_0.1'], 100, 'psi5(0.1)');
  assertDigits(special.zeta('2.5', 100), MPMATH['zeta_2.5'], 100, 'zeta(2.5)');
  assertDigits(special.zeta('1.1', 100), MPMATH['zeta_1.1'], 100, 'zeta(1.1)');
  assertDigits(special.gamma('1000.5', 100), MPMATH['gamma_1000.5'], 100, 'Gamma(1000.5)');
  assertDigits(special.lnGamma('1e10', 100), MPMATH['lngamma_1e10'], 100, 'lnGamma(1e10)');
  assertDigits(special.gamma('0.3', 500), MPMATH['gamma_0.3_500'], 500, 'Gamma(0.3) at 500');
  assertDigits(special.digamma('2.7', 500), MPMATH['psi_2.7_500'], 500, 'psi(2.7) at 500');
  assertDigits(special.trigamma('2.7', 500), MPMATH['psi1_2.7_500'], 500, "psi'(2.7) at 500");
  assertDigits(special.lnGamma('123.4', 500), MPMATH['lngamma_123.4_500'], 500, 'lnGamma(123.4) at 500');
});

const point = fc.double({ min: -20, max: 20, noNaN: true }).filter((x) => Math.abs(x - Math.round(x)) > 1e-6);
const positive = fc.double({ min: 0.01, max: 60, noNaN: true });

test('reflection Γ(x)Γ(1−x) = π/sin(πx) at 100 digits (DLMF 5.5.3)', () => {
  fc.assert(
    fc.property(point, (x) => {
      const t = decimalText(x);
      const lhs = wide(special.gamma(t, D + 5)).times(special.gamma(wide(1).minus(t).toString(), D + 5));
      const pi = wide(special.pi(D + 10));
      const rhs = pi.div(pi.times(t).sin());
      assertDigits(lhs.toSignificantDigits(D + 5), rhs.toSignificantDigits(D + 5).toString(), D - 2, `x=${t}`);
    }),
    { numRuns: RUNS },
  );
});

test('duplication Γ(x)Γ(x+1/2) = 2^{1−2x} √π Γ(2x) at 100 digits (DLMF 5.5.5)', () => {
  fc.assert(
    fc.property(positive, (x) => {
      const t = decimalText(x);
      const lhs = wide(special.gamma(t, D + 5)).times(special.gamma(wide(t).plus(0.5).toString(), D + 5));
      const rhs = wide(2).pow(wide(1).minus(wide(t).times(2))).times(wide(special.pi(D + 10)).sqrt()).times(special.gamma(wide(t).times(2).toString(), D + 5));
      assertDigits(lhs.toSignificantDigits(D + 5), rhs.toSignificantDigits(D + 5).toString(), D - 2, `x=${t}`);
    }),
    { numRuns: RUNS },
  );
});

test('recurrences ψ^(n)(x+1) = ψ^(n)(x) + (−1)^n n!/x^{n+1}, Γ(x+1) = xΓ(x) at 100 digits (DLMF 5.15.5, 5.5.1)', () => {
  fc.assert(
    fc.property(point, fc.integer({ min: 0, max: 4 }), (x, n) => {
      const t = decimalText(x);
      const next = wide(t).plus(1).toString();
      let factorial = 1;
      for (let i = 2; i <= n; i++) factorial *= i;
      const expected = wide(special.polygamma(n, t, D + 10)).plus(wide((-1) ** n * factorial).div(wide(t).pow(n + 1)));
      const actual = special.polygamma(n, next, D);
      // compare absolutely relative to the larger of the two terms (cancellation between them is not the subject)
      const scale = wide(special.polygamma(n, t, D + 10)).abs().plus(wide(factorial).div(wide(t).abs().pow(n + 1)));
      assert.ok(wide(actual).minus(expected).abs().lte(scale.times(wide(10).pow(-D + 1))), `n=${n} x=${t}`);
      assertDigits(special.gamma(next, D), wide(special.gamma(t, D + 10)).times(t).toString(), D, `Gamma recurrence x=${t}`);
    }),
    { numRuns: RUNS },
  );
});

test('printed digits are correct: results at D digits agree with results at D+25 digits (every-digit rule)', () => {
  fc.assert(
    fc.property(fc.double({ min: -15, max: 90, noNaN: true }), fc.constantFrom(20, 45, 110), (x, digits) => {
      const t = decimalText(x);
      if (Math.abs(x - Math.round(x)) < 1e-9) return;
      assertDigits(special.gamma(t, digits), special.gamma(t, digits + 25).toString(), digits, `Gamma(${t})`);
      assertDigits(special.digamma(t, digits), special.digamma(t, digits + 25).toString(), digits, `psi(${t})`);
      assertDigits(special.trigamma(t, digits), special.trigamma(t, digits + 25).toString(), digits, `psi1(${t})`);
      if (x > 0) assertDigits(special.lnGamma(t, digits), special.lnGamma(t, digits + 25).toString(), digits, `lnGamma(${t})`);
      if (x > 1.01) assertDigits(special.zeta(t, digits), special.zeta(t, digits + 25).toString(), digits, `zeta(${t})`);
    }),
    { numRuns: RUNS },
  );
});

test('near the zero of ψ and near Γ poles the relative accuracy holds (DLMF 5.4.iii: x₀ = 1.4616…)', () => {
  const nearZero = '1.4616321449683623412626595423257213284681962040064463512959884085987864403538018102430749927337255';
  assertDigits(special.digamma(nearZero, 30), special.digamma(nearZero, 60).toString(), 30, 'psi near x0');
  assertDigits(special.gamma('-3.0000000000000000000001', 40), special.gamma('-3.0000000000000000000001', 80).toString(), 40, 'Gamma near pole');
  // residue (−1)^n/n! at −n (DLMF 5.2.1): Γ(−3+δ) ≈ −1/(6δ)
  assertDigits(wide(special.gamma('-2.9999999999999999999999999999999999999999', 20)).times('1e-40').toString(), wide(-1).div(6).toString(), 15, 'residue');
});

test('poles and domain errors are typed EngineErrors', () => {
  assert.throws(() => special.gamma('-2', 20), (e: unknown) => e instanceof EngineError && e.code === 'pole');
  assert.throws(() => special.gamma('0', 20), (e: unknown) => e instanceof EngineError && e.code === 'pole');
  assert.throws(() => special.digamma('-1', 20), (e: unknown) => e instanceof EngineError && e.code === 'pole');
  assert.throws(() => special.lnGamma('-2', 20), (e: unknown) => e instanceof EngineError && e.code === 'pole');
  assert.throws(() => special.zeta('1', 20), (e: unknown) => e instanceof EngineError && e.code === 'pole');
});

test('double-precision agreement with @stdlib/math-base-special-* on random points (general-purpose reference library)', () => {
  fc.assert(
    fc.property(fc.double({ min: -12, max: 30, noNaN: true }), (x) => {
      if (Math.abs(x - Math.round(x)) < 1e-3) return;
      const t = decimalText(x);
      const xv = Number(t);
      assert.ok(relativeDifference(Number(special.gamma(t, 20)), stdlibGamma(xv)) < 1e-12, `gamma ${t}`);
      if (xv > 0) {
        assert.ok(Math.abs(Number(special.lnGamma(t, 20)) - stdlibGammaln(xv)) < 1e-12 * Math.max(1, Math.abs(stdlibGammaln(xv))), `gammaln ${t}`);
        assert.ok(Math.abs(Number(special.digamma(t, 20)) - stdlibDigamma(xv)) < 1e-12 * Math.max(1, Math.abs(stdlibDigamma(xv))), `digamma ${t}`);
        assert.ok(relativeDifference(Number(special.trigamma(t, 20)), stdlibTrigamma(xv)) < 1e-12, `trigamma ${t}`);
      }
      if (xv > 1.05) assert.ok(relativeDifference(Number(special.zeta(t, 20)), stdlibZeta(xv)) < 1e-12, `zeta ${t}`);
    }),
    { numRuns: 200 },
  );
});

test("ψ′(1/2) = π²/2 and ψ(1/2) = −γ − 2 ln 2 across 250–420 digits, where the working precision crosses 1024 bits (DLMF 5.15.3, 5.4.13)", () => {
  const Deep = Decimal.clone({ precision: 460 });
  const deep = (x: { toString(): string }) => new Deep(x.toString());
  for (const digits of [250, 290, 300, 310, 320, 350, 420]) {
    const pi = deep(special.pi(digits + 10));
    assertDigits(special.trigamma('0.5', digits), pi.pow(2).div(2).toString(), digits, `psi'(1/2) at ${digits} digits`);
    const g = deep(special.eulerGamma(digits + 10));
    const l2 = deep(special.ln2(digits + 10));
    assertDigits(special.digamma('0.5', digits), g.neg().minus(l2.times(2)).toString(), digits, `psi(1/2) at ${digits} digits`);
  }
});
