import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { estimatedWidthPt, seriesTerms, joinTerms } from '../../../shared/notebook/latex/equations';
import { rationalOf, realTex, valueTex } from '../../../shared/notebook/latex/numbers';
import { relationTex } from '../../../shared/notebook/latex/text';
import { niceTicks } from '../../../shared/notebook/latex/plots';

describe('numbers in the LaTeX export', () => {
  test('a decimal whose 20 digits are those of a small-denominator rational is that rational', () => {
    // hand division: 11/3 = 3.666…67 and 5/11 = 0.4545… at 20 significant digits
    assert.deepEqual(rationalOf('3.6666666666666666667'), { p: 11n, q: 3n });
    assert.deepEqual(rationalOf('-0.45454545454545454545'), { p: -5n, q: 11n });
    assert.deepEqual(rationalOf('1.75'), { p: 7n, q: 4n });
  });

  test('no fraction for a short decimal with a large denominator, a short non-terminating one, or a transcendental coefficient', () => {
    assert.equal(rationalOf('0.142'), null); // 71/500
    assert.equal(rationalOf('0.3333'), null); // too few digits to tell 1/3 from 3333/10000
    // −2(5N + 22)/9 · A(7/4) · … at N = 3 involves ψ values (docs/physics.md §5): not rational
    assert.equal(rationalOf('-10.510392105423690113'), null);
  });

  test('digits round half-even; exact writes fractions; complex values keep their i', () => {
    assert.equal(realTex('0.45454545454545454545', { digits: 6 }), '0.454545');
    assert.equal(realTex('-0.45454545454545454545', { exact: true }), '-\\frac{5}{11}');
    assert.equal(realTex('0.00000012345678', { digits: 3 }), '1.23\\times 10^{-7}');
    assert.equal(valueTex('0.1744305364580333932 + 0.13094255396744499503i', { digits: 4 }), '0.1744 + 0.1309\\,i');
  });
});

describe('equations that fit', () => {
  test('a series drops zero terms, keeps its signs and its truncation order', () => {
    assert.equal(joinTerms(seriesTerms(0, ['1.75', '-0.5', '0'], { exact: true })), '\\frac{7}{4} - \\frac{1}{2}\\,\\varepsilon + O(\\varepsilon^{3})');
  });

  test('the width estimate grows with the characters set (20 digits are wider than 6)', () => {
    assert.ok(estimatedWidthPt('0.45454545454545454545') > 2 * estimatedWidthPt('0.454545'));
  });

  test('relations as the engine states them become formulas with their remark apart', () => {
    assert.deepEqual(relationTex('γ = ν(2 − η) (Fisher)'), { math: '\\gamma = \\nu (2 - \\eta )', remark: 'Fisher' });
    assert.equal(relationTex('1/ν = s − γ_{φ²}(g*)').math, '1/\\nu = s - \\gamma _{\\phi ^{2}}(g^{*})');
  });

  test('plot ticks are 1, 2 or 5 times a power of ten', () => {
    assert.deepEqual(niceTicks(1.55, 1.95), [1.6, 1.7, 1.8, 1.9]);
    assert.deepEqual(niceTicks(0.09, 0.52), [0.1, 0.2, 0.3, 0.4, 0.5]);
  });
});
