import { useMemo } from 'react';
import { ensureKatexStylesheet } from '../formula/katexStylesheet.web';
import { noteHtml } from './noteMarkdown';

const NOTE_STYLE = { fontFamily: 'Inter_400Regular, system-ui, sans-serif', color: '#1C2230', lineHeight: 1.6, overflowX: 'auto' as const };

/** Web: the note's Markdown and TeX rendered into the DOM (Markdown-it escapes raw HTML). */
export function NoteView({ text, large = false, testID }: { text: string; large?: boolean; testID?: string }) {
  ensureKatexStylesheet();
  const html = useMemo(() => noteHtml(text), [text]);
  return <div className="rungbook-note" data-testid={testID} style={{ ...NOTE_STYLE, fontSize: large ? 26 : 15 }} dangerouslySetInnerHTML={{ __html: html }} />;
}
