import { useMemo, useRef } from 'react';
import { colors, fonts } from '../../constants/theme';
import { fitDisplaysIn, useRefitOnResize } from '../formula/fitWidth';
import { ensureKatexStylesheet } from '../formula/katexStylesheet.web';
import { monoFont } from '../notebook/monoFont';
import { commentHtml } from './commentMarkdown';

/** The theme's text face, whose Greek comes from the math face (so ν in a comment never reads as v). */
const BODY_STYLE = { fontFamily: `${fonts.regular}, system-ui, sans-serif`, fontSize: 14, color: colors.ink, lineHeight: 1.5, overflowX: 'auto' as const, overflowWrap: 'anywhere' as const };
const COMMENT_CSS = `
.rungbook-comment > :first-child { margin-top: 0; }
.rungbook-comment > :last-child { margin-bottom: 0; }
.rungbook-comment p, .rungbook-comment ul, .rungbook-comment ol, .rungbook-comment pre { margin: 0.4em 0; }
.rungbook-comment ul, .rungbook-comment ol { padding-left: 1.4em; }
.rungbook-comment code { font-family: ${monoFont}; font-size: 0.92em; background: ${colors.paper}; border-radius: 3px; padding: 0 3px; }
.rungbook-comment pre { background: ${colors.paper}; padding: 8px; border-radius: 6px; overflow-x: auto; }
.rungbook-comment pre code { padding: 0; }
.rungbook-comment a { color: ${colors.amberDeep}; }
.rungbook-mention { font-weight: 600; color: ${colors.amberDeep}; background: ${colors.amberWash}; border-radius: 3px; padding: 0 2px; }
`;

function ensureCommentStyles(): void {
  if (typeof document === 'undefined' || document.querySelector('style[data-rungbook-comments]')) return;
  const style = document.createElement('style');
  style.dataset.rungbookComments = 'true';
  style.textContent = COMMENT_CSS;
  document.head.appendChild(style);
}

/** Web: the comment's Markdown subset and TeX rendered into the DOM (Markdown-it escapes raw HTML). */
export function CommentBody({ text, testID }: { text: string; testID?: string }) {
  ensureKatexStylesheet();
  ensureCommentStyles();
  const html = useMemo(() => commentHtml(text), [text]);
  const root = useRef<HTMLDivElement>(null);
  useRefitOnResize(root, html, fitDisplaysIn);
  return <div ref={root} className="rungbook-comment" data-testid={testID} style={BODY_STYLE} dangerouslySetInnerHTML={{ __html: html }} />;
}
