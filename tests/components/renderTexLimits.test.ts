import { renderTex, TEX_LIMITS } from '../../components/formula/renderTex';

// KaTeX documentation, options "maxSize" (largest width/height of a rule or box, in em; larger ones are
// clamped to it) and "maxExpand" (macro expansions allowed; past it KaTeX reports an error).
describe('renderTex bounds what other people typed', () => {
  it('clamps a huge rule to maxSize em', () => {
    const html = renderTex('\\rule{100000em}{100000em}');
    // the source stays in the MathML annotation; only the drawn sizes are clamped
    const drawn = html.match(/style="[^"]*"/g) ?? [];
    expect(drawn.join(' ')).not.toContain('100000em');
    expect(drawn.join(' ')).toContain(`border-top-width:${TEX_LIMITS.maxSize}em`);
  });

  it('refuses a macro that expands without end, in place', () => {
    const html = renderTex('\\def\\a{\\a\\a}\\a');
    expect(html).toContain('katex-error');
  });

  it('still typesets ordinary formulas', () => {
    expect(renderTex('\\varepsilon^2')).not.toContain('katex-error');
  });
});
