/**
 * The family that carries lowercase Greek in the math face. It covers only the Greek code points
 * (unicode-range), so every other character falls through to the text face named after it.
 */
export const GREEK_FACE = 'RungbookGreek';

/** KaTeX's math italic ships with the app (public/katex, copied from the katex package at install). */
const MATH_ITALIC = '/katex/fonts/KaTeX_Math-Italic';

/** α–ω, and the variant forms ϑ ϕ ϖ ϵ. */
const LOWERCASE_GREEK = 'U+03B1-03C9, U+03D1, U+03D5, U+03D6, U+03F5';

export const withGreekFace = (family: string): string => `${GREEK_FACE}, ${family}`;

const STYLE_ID = 'rungbook-greek-face';

export function installGreekFace(): void {
  if (typeof document === 'undefined' || document.getElementById(STYLE_ID)) return;
  const style = document.createElement('style');
  style.id = STYLE_ID;
  style.textContent = `@font-face { font-family: '${GREEK_FACE}'; src: url('${MATH_ITALIC}.woff2') format('woff2'), url('${MATH_ITALIC}.woff') format('woff'); unicode-range: ${LOWERCASE_GREEK}; font-display: block; }`;
  document.head.appendChild(style);
}
