import katex from 'katex';
import { quadraticMatrixTex } from '../../../components/notebook/quadraticMatrix';

describe('anomalous-dimension matrix of quadratic operators', () => {
  const result = {
    operators: ['phi1^2', 'phi1*phi2', 'phi2^2'],
    matrix: [
      [[{ monomial: 'u', coeff: '1' }], [], [{ monomial: 'u', coeff: '0.3333333333' }]],
      [[], [{ monomial: 'u', coeff: '0.6666666667' }], []],
      [[{ monomial: 'u', coeff: '0.3333333333' }], [], [{ monomial: 'u', coeff: '1' }]],
    ],
  };

  it('typesets a labelled matrix with zeros where operators do not mix, and the TeX compiles in KaTeX', () => {
    const tex = quadraticMatrixTex(result)!;
    expect(tex).toContain('\\begin{array}{c|ccc}');
    expect(tex).toContain('\\phi_{1}\\phi_{2}');
    expect(tex).toContain('\\phi_{1}^{2} & u & 0 & 0.3333333333\\,u');
    // KaTeX's own parser is the independent judge of well-formed TeX (throwOnError).
    expect(() => katex.renderToString(tex, { throwOnError: true })).not.toThrow();
  });

  it('declines shapes it does not understand (they fall back to the JSON view)', () => {
    expect(quadraticMatrixTex({ operators: ['phi1^2'], matrix: [[{ nope: 1 }]] })).toBeNull();
    expect(quadraticMatrixTex('nothing')).toBeNull();
  });
});
