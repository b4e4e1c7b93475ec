import { useMemo, useRef } from 'react';
import { colors, fonts } from '../../constants/theme';
import { fitDisplaysIn, useRefitOnResize } from '../formula/fitWidth';
import { ensureKatexStylesheet } from '../formula/katexStylesheet.web';
import { noteHtml } from './noteMarkdown';

/** The theme's text face, whose Greek comes from the math face (so ν in a note never reads as v). */
const NOTE_STYLE = { fontFamily: `${fonts.regular}, system-ui, sans-serif`, color: colors.ink, lineHeight: 1.6, overflowX: 'auto' as const };

/** Web: the note's Markdown and TeX rendered into the DOM (Markdown-it escapes raw HTML). */
export function NoteView({ text, large = false, testID }: { text: string; large?: boolean; testID?: string }) {
  ensureKatexStylesheet();
  const html = useMemo(() => noteHtml(text), [text]);
  const root = useRef<HTMLDivElement>(null);
  useRefitOnResize(root, html, fitDisplaysIn);
  return <div ref={root} className="rungbook-note" data-testid={testID} style={{ ...NOTE_STYLE, fontSize: large ? 26 : 15 }} dangerouslySetInnerHTML={{ __html: html }} />;
}
