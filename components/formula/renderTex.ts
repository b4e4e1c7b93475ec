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

/** KaTeX markup for `tex`; malformed TeX shows in red in place instead of throwing. */
export function renderTex(tex: string, display = false): string {
  return katex.renderToString(tex, { displayMode: display, throwOnError: false, output: 'htmlAndMathml', strict: 'ignore' });
}

/** Where the shipped KaTeX stylesheet lives (copied into public/ at install). */
export const KATEX_STYLESHEET_PATH = '/katex/katex.min.css';
