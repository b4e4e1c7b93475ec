import katex from 'katex';

export interface FormulaProps {
  /** TeX source, e.g. `\varepsilon = 2s - d`. */
  tex: string;
  /** Display (block) style instead of inline. */
  display?: boolean;
  /** What a screen reader says; defaults to the TeX source. */
  label?: string;
  testID?: string;
}

/**
 * Text typed by other people (notes, comments) is typeset too: a rule or box may be at most this many em
 * (KaTeX's maxSize) and macros may expand at most this many times (maxExpand), so nobody can paint a
 * page-sized block or stall a reader's browser with one formula.
 */
export const TEX_LIMITS = { maxSize: 20, maxExpand: 200 } as const;

/** KaTeX markup for `tex`; malformed TeX shows in red in place instead of throwing. */
export function renderTex(tex: string, display = false): string {
  return katex.renderToString(tex, { displayMode: display, throwOnError: false, output: 'htmlAndMathml', strict: 'ignore', ...TEX_LIMITS });
}

/**
 * A display formula that wraps: KaTeX's display mode never breaks a line, but inline math breaks after
 * top-level + − = (KaTeX docs, "Line breaks"); \displaystyle keeps display-size fractions and sums.
 * So a long series reads on a phone without sideways scrolling.
 */
export function renderWrappingDisplay(tex: string): string {
  return renderTex(`\\displaystyle ${tex}`, false);
}

/** Where the shipped KaTeX stylesheet lives (copied into public/ at install). */
export const KATEX_STYLESHEET_PATH = '/katex/katex.min.css';
