import { KATEX_STYLESHEET_PATH } from './renderTex';

/** Add the shipped KaTeX stylesheet to the page once (Metro cannot bundle its fonts). */
export function ensureKatexStylesheet(): void {
  if (typeof document === 'undefined' || document.querySelector('link[data-katex]')) return;
  const link = document.createElement('link');
  link.rel = 'stylesheet';
  link.href = KATEX_STYLESHEET_PATH;
  link.dataset.katex = 'true';
  document.head.appendChild(link);
}
