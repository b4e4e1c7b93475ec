import { noteHtml, notePlainText } from '../../../components/notebook/noteMarkdown';

describe('note Markdown with TeX', () => {
  it('typesets inline and display TeX with KaTeX and leaves underscores in formulas alone', () => {
    const html = noteHtml('The **two-loop** check of $\\Delta_{\\phi^2}$:\n\n$$\\frac{1}{\\nu} = s - \\frac{\\varepsilon}{3}$$');
    expect(html).toContain('<strong>two-loop</strong>');
    // KaTeX keeps the source in a MathML annotation and marks display maths with .katex-display.
    expect(html).toContain('<annotation encoding="application/x-tex">\\Delta_{\\phi^2}</annotation>');
    expect(html).toContain('katex-display');
    expect(html).not.toContain('<em>');
  });

  it('escapes raw HTML instead of rendering it', () => {
    expect(noteHtml('<script>alert(1)</script>')).toContain('&lt;script&gt;');
  });

  it('keeps a lone dollar amount as text', () => {
    expect(noteHtml('costs 5 \\$ only')).toContain('5 $ only');
  });

  it('gives plain text for native screens', () => {
    expect(notePlainText('# Title\n$$x^2$$')).toBe('Title\nx^2');
  });
});
