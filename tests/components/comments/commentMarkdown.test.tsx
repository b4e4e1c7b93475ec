import { screen } from '@testing-library/react-native';
import { render } from '@testing-library/react-native';
import { CommentBody } from '../../../components/comments/CommentBody';
import { commentHtml, commentTextParts } from '../../../components/comments/commentMarkdown';
import { mentionQueryAt } from '../../../components/comments/mentions';

describe('comment Markdown subset', () => {
  it('shows HTML as text instead of building elements from it', () => {
    const html = commentHtml('<img src=x onerror=alert(1)> and <script>alert(2)</script>');
    expect(html).not.toMatch(/<img|<script/);
    expect(html).toContain('&lt;img src=x onerror=alert(1)&gt;');
    expect(html).toContain('&lt;script&gt;alert(2)&lt;/script&gt;');
  });

  it('typesets $…$ with KaTeX and keeps the TeX source in the MathML annotation', () => {
    const html = commentHtml('The correction is $\\varepsilon^2$ here.');
    expect(html).toContain('class="katex"');
    // KaTeX's htmlAndMathml output keeps the source verbatim in <annotation encoding="application/x-tex">.
    expect(html).toContain('<annotation encoding="application/x-tex">\\varepsilon^2</annotation>');
  });

  it('typesets $$…$$ as display maths, also over several lines', () => {
    expect(commentHtml('$$\n\\frac{1}{\\nu} = 2 - \\frac{\\varepsilon}{3}\n$$')).toContain('katex-display');
    expect(commentHtml('so $$x^2$$ inline')).toContain('katex-display');
  });

  it('does not read underscores or stars inside a formula as emphasis', () => {
    const html = commentHtml('$a_1 b_2$ and $x*y*z$');
    expect(html).not.toContain('<em>');
    expect(html).toContain('<annotation encoding="application/x-tex">a_1 b_2</annotation>');
  });

  it('leaves prices and escaped dollars as text', () => {
    expect(commentHtml('costs 5 $ and 6 $ only')).toBe('<p>costs 5 $ and 6 $ only</p>\n');
    expect(commentHtml('a \\$5 fee')).toBe('<p>a $5 fee</p>\n');
  });

  it('renders the subset: emphasis, strong, inline code, code blocks, lists, links, paragraphs', () => {
    expect(commentHtml('*one* **two** `x_1`')).toBe('<p><em>one</em> <strong>two</strong> <code>x_1</code></p>\n');
    expect(commentHtml('- a\n- b')).toBe('<ul>\n<li>a</li>\n<li>b</li>\n</ul>\n');
    expect(commentHtml('```\nif a < b\n```')).toBe('<pre><code>if a &lt; b\n</code></pre>\n');
    expect(commentHtml('[paper](https://example.org/p)')).toBe('<p><a href="https://example.org/p" target="_blank" rel="noopener noreferrer nofollow">paper</a></p>\n');
  });

  it('leaves everything outside the subset as text: headings, quotes, images, script links', () => {
    expect(commentHtml('# Title')).toBe('<p># Title</p>\n');
    expect(commentHtml('> quoted')).toBe('<p>&gt; quoted</p>\n');
    expect(commentHtml('![x](https://example.org/x.png)')).not.toContain('<img');
    expect(commentHtml('[go](javascript:alert(1))')).not.toContain('href');
  });

  it('marks @handle mentions but not addresses', () => {
    expect(commentHtml('thanks @imre.k.')).toBe('<p>thanks <span class="rungbook-mention">@imre.k</span>.</p>\n');
    expect(commentHtml('write to a@b.example')).toBe('<p>write to a@b.example</p>\n');
  });

  it('splits plain text around mentions for native screens', () => {
    expect(commentTextParts('see @sunniva, not x@y')).toEqual([
      { text: 'see ', mention: false },
      { text: '@sunniva', mention: true },
      { text: ', not x@y', mention: false },
    ]);
  });

  it('shows a comment holding HTML as that text on native screens', () => {
    const body = '<img src=x onerror=alert(1)>';
    render(<CommentBody text={body} testID="body" />);
    expect(screen.getByTestId('body')).toHaveTextContent(body);
  });
});

describe('mentions follow the server grammar (handles of letters, digits, ".", "_", "-")', () => {
  // The server reads "@a.b-c_d" as the handle a.b-c_d, stops at any other character and drops a trailing ".", "_" or "-".
  it.each([
    ['ping @a.b-c_d now', '@a.b-c_d'],
    ['ping @anna+lab please', '@anna'],
    ['thanks @imre_', '@imre'],
    ['see @x9', '@x9'],
  ])('%j mentions %j', (text, mention) => {
    expect(commentTextParts(text).filter((part) => part.mention).map((part) => part.text)).toEqual([mention]);
    expect(commentHtml(text)).toContain(`<span class="rungbook-mention">${mention}</span>`);
  });

  // No mention: the @ follows an address character (a "+" or "%" included), or the handle does not start with a letter or digit.
  it.each(['mail a+@b.example', 'x%@y', 'see @_hidden', 'see @-dash', 'a lone @ sign'])('%j mentions nobody', (text) => {
    expect(commentTextParts(text).filter((part) => part.mention)).toEqual([]);
    expect(commentHtml(text)).not.toContain('rungbook-mention');
  });

  it('offers autocomplete only for characters a handle may hold', () => {
    expect(mentionQueryAt('hello @an')).toEqual({ start: 6, search: 'an' });
    expect(mentionQueryAt('hello @an+')).toBeNull();
    expect(mentionQueryAt('a+@an')).toBeNull();
  });
});
