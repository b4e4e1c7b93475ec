import { test } from 'node:test';
import assert from 'node:assert/strict';
import { special } from '../../../shared/engine/index';
import { assertDigits } from '../helpers/engine';
import { MPMATH } from '../helpers/reference-values';

// docs/physics.md §10 values, each with its OEIS entry
const OEIS_40 = {
  zeta3: '1.2020569031595942853997381615114499907650', // OEIS A002117
  zeta5: '1.0369277551433699263313654864570341680570', // OEIS A013663
  euler: '0.5772156649015328606065120900824024310422', // OEIS A001620
  catalan: '0.9159655941772190150546035149323841107741', // OEIS A006752
  gammaQuarter: '3.6256099082219083119306851558676720029951', // cf. OEIS A068466
  gammaThird: '2.6789385347077476336556929409746776441287', // cf. OEIS A073005
};

test('ζ(3), ζ(5) at 40 digits (OEIS A002117, A013663 via docs/physics.md §10)', () => {
  assertDigits(special.zetaInteger(3, 40), OEIS_40.zeta3, 40, 'zeta(3)');
  assertDigits(special.zetaInteger(5, 40), OEIS_40.zeta5, 40, 'zeta(5)');
  assertDigits(special.zeta('3', 40), OEIS_40.zeta3, 40, 'zeta(x=3)');
});

test('Euler γ and Catalan G at 40 digits (OEIS A001620, A006752)', () => {
  assertDigits(special.eulerGamma(40), OEIS_40.euler, 40, 'euler gamma');
  assertDigits(special.catalan(40), OEIS_40.catalan, 40, 'catalan');
});

test('Γ(1/4), Γ(1/3) at 40 digits (cf. OEIS A068466, A073005)', () => {
  assertDigits(special.gamma('0.25', 40), OEIS_40.gammaQuarter, 40, 'Gamma(1/4)');
  assertDigits(special.gamma({ num: 1n, den: 3n }, 40), OEIS_40.gammaThird, 40, 'Gamma(1/3)');
});

test('π, γ, ln 2 at 1000 digits (mpmath reference library)', () => {
  assertDigits(special.pi(1000), MPMATH.pi1000, 1000, 'pi');
  assertDigits(special.eulerGamma(1000), MPMATH.euler1000, 1000, 'euler gamma');
  assertDigits(special.ln2(1000), MPMATH.ln2_1000, 1000, 'ln 2');
  assertDigits(special.catalan(100), MPMATH.catalan, 100, 'catalan');
});

test('Bernoulli numbers (DLMF Table 24.2.1)', () => {
  const expected: Array<[number, bigint, bigint]> = [
    [0, 1n, 1n],
    [1, -1n, 2n],
    [2, 1n, 6n],
    [4, -1n, 30n],
    [6, 1n, 42n],
    [12, -691n, 2730n],
    [20, -174611n, 330n],
    [3, 0n, 1n],
  ];
  for (const [n, num, den] of expected) assert.deepEqual(special.bernoulliExact(n), { num, den }, `B_${n}`);
});

test('ζ(2n) = (−1)^{n+1} B_{2n} (2π)^{2n}/(2(2n)!) agrees with direct summation (docs/physics.md §10; Euler–Maclaurin tail, common practice)', () => {
  for (const s of [6, 12, 20]) {
    // Σ_{k<K} k^{-s} + K^{1−s}/(s−1) + K^{−s}/2 + s K^{−s−1}/12 − s(s+1)(s+2) K^{−s−3}/720
    //   + s(s+1)(s+2)(s+3)(s+4) K^{−s−5}/30240
    const D = special.pi(5).constructor as unknown as typeof import('decimal.js').default;
    const R = D.clone({ precision: 60 });
    const K = 3000;
    let sum = new R(0);
    for (let k = 1; k < K; k++) sum = sum.plus(new R(k).pow(-s));
    const k = new R(K);
    sum = sum
      .plus(k.pow(1 - s).div(s - 1))
      .plus(k.pow(-s).div(2))
      .plus(k.pow(-s - 1).times(s).div(12))
      .minus(k.pow(-s - 3).times(s * (s + 1) * (s + 2)).div(720))
      .plus(k.pow(-s - 5).times(s * (s + 1) * (s + 2) * (s + 3) * (s + 4)).div(30240));
    assertDigits(special.zetaInteger(s, 40), sum.toString(), 40, `zeta(${s})`);
  }
});
