import MarkdownIt from 'markdown-it';
import { renderTex } from '../formula/renderTex';

const markdown = new MarkdownIt({ html: false, linkify: true, breaks: false });

// Display $$…$$ first, then inline $…$ (not across lines, not "$ " openings, \$ stays a dollar).
const DISPLAY_TEX = /\$\$([\s\S]+?)\$\$/g;
const INLINE_TEX = /(?<![\\$])\$(?!\s)([^$\n]+?)(?<!\s)\$(?!\$)/g;

/**
 * A note's Markdown as HTML with its TeX typeset by KaTeX. TeX is cut out before Markdown runs, so
 * underscores and asterisks inside formulas are not read as emphasis, and put back as KaTeX markup.
 */
export function noteHtml(text: string): string {
  const formulas: string[] = [];
  const hold = (html: string) => `\uE000${formulas.push(html) - 1}\uE001`;
  const withoutTex = text
    .replace(DISPLAY_TEX, (_, tex: string) => `\n\n${hold(renderTex(tex.trim(), true))}\n\n`)
    .replace(INLINE_TEX, (_, tex: string) => hold(renderTex(tex, false)));
  return markdown.render(withoutTex).replace(/\uE000(\d+)\uE001/g, (_, index: string) => formulas[Number(index)]).replace(/\\\$/g, '$');
}

/** The note as plain text for places without a DOM: formulas keep their TeX source. */
export function notePlainText(text: string): string {
  return text.replace(/\$\$([\s\S]+?)\$\$/g, (_, tex: string) => tex.trim()).replace(/^#+\s*/gm, '');
}
