import { useMemo } from 'react';
import { KATEX_STYLESHEET_PATH } from '../formula/renderTex';
import { noteHtml } from './noteMarkdown';

function ensureKatexStylesheet() {
  if (typeof document === 'undefined' || document.querySelector('link[data-katex]')) return;
  const link = document.createElement('link');
  link.rel = 'stylesheet';
  link.href = KATEX_STYLESHEET_PATH;
  link.dataset.katex = 'true';
  document.head.appendChild(link);
}

const NOTE_STYLE = { fontFamily: 'Inter_400Regular, system-ui, sans-serif', color: '#1C2230', lineHeight: 1.6, overflowX: 'auto' as const };

/** Web: the note's Markdown and TeX rendered into the DOM (Markdown-it escapes raw HTML). */
export function NoteView({ text, large = false, testID }: { text: string; large?: boolean; testID?: string }) {
  ensureKatexStylesheet();
  const html = useMemo(() => noteHtml(text), [text]);
  return <div className="rungbook-note" data-testid={testID} style={{ ...NOTE_STYLE, fontSize: large ? 26 : 15 }} dangerouslySetInnerHTML={{ __html: html }} />;
}
