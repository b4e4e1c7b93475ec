/**
 * @jest-environment jsdom
 */
import { render } from '@testing-library/react-native';
// The web variant, imported by its file name: the component tests run with the native preset.
import { Formula } from '../../components/formula/index.web';

describe('Formula (web, KaTeX in the DOM)', () => {
  it('typesets TeX into KaTeX markup carrying the source as a MathML annotation', () => {
    const { toJSON } = render(<Formula tex="\varepsilon = 2s - d" display testID="f" />);
    const html = JSON.stringify(toJSON());
    // KaTeX's display mode never breaks a line (KaTeX documentation, "Line breaks": only inline math breaks
    // after top-level relations and binary operators), so a display formula is inline math in display
    // style: no .katex-display wrapper, but MathML's <mstyle displaystyle="true"> and \displaystyle in
    // the source annotation (KaTeX documentation, "output" option: htmlAndMathml keeps the source in
    // <annotation encoding="application/x-tex">). The block itself is marked data-formula="display".
    expect(html).not.toContain('katex-display');
    expect(html).toContain('"data-formula":"display"');
    expect(html).toContain('displaystyle=\\"true\\"');
    expect(html).toContain('application/x-tex');
    expect(html).toContain('\\\\displaystyle \\\\varepsilon = 2s - d');
    // Break opportunities after "=" and "−" split the formula into three unbreakable pieces: "ε =", "2s −", "d".
    expect(html.match(/class=\\"katex-base\\"/g)).toHaveLength(3);
    // ε is U+03B5 in MathML's <mi> (Unicode, Greek small letter epsilon variant used by \varepsilon).
    expect(html).toContain('ε');
  });

  it('shows malformed TeX in place instead of throwing', () => {
    const { toJSON } = render(<Formula tex="\frac{1}{" />);
    expect(JSON.stringify(toJSON())).toContain('katex-error');
  });

  it('adds the shipped KaTeX stylesheet to the page once', () => {
    render(<Formula tex="x" />);
    render(<Formula tex="y" />);
    const links = document.querySelectorAll('link[data-katex]');
    expect(links).toHaveLength(1);
    expect(links[0].getAttribute('href')).toBe('/katex/katex.min.css');
  });
});
