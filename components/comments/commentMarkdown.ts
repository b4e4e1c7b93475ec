import MarkdownItFactory, { type MarkdownIt, type StateBlock, type StateInline } from 'markdown-it';
import { renderTex } from '../formula/renderTex';

/**
 * Comment text: a small Markdown subset (paragraphs, emphasis, strong, inline code, code blocks, lists,
 * links) with TeX between $…$ (inline) or $$…$$ (display) and `@handle` mentions. Raw HTML is escaped.
 */
const COMMENT_RULES = ['emphasis', 'backticks', 'escape', 'newline', 'link', 'autolink', 'fence', 'code', 'list'];

const DOLLAR = 0x24;
const BACKSLASH = 0x5c;
/**
 * The server's mention grammar: a handle is a letter or digit followed by letters, digits, `.`, `_` or `-`;
 * trailing `.`, `_`, `-` end the sentence, not the handle; an @ right after an address character is not a mention.
 */
const MENTION_PATTERN = /@([A-Za-z0-9][A-Za-z0-9._-]*)/y;
const ADDRESS_CHAR = /[A-Za-z0-9._%+-]/;

/** The handle mentioned by the `@` at `at`, or null when that @ is no mention. */
export function mentionAt(text: string, at: number): string | null {
  if (text[at] !== '@' || (at > 0 && ADDRESS_CHAR.test(text[at - 1]))) return null;
  MENTION_PATTERN.lastIndex = at;
  const match = MENTION_PATTERN.exec(text);
  const handle = match ? match[1].replace(/[._-]+$/, '') : '';
  return handle || null;
}

const isSpace = (code: number) => code === 0x20 || code === 0x09 || code === 0x0a;

/** `$$…$$` (display) or `$…$` (inline) inside a paragraph; a `$ ` opening or a `\$` is a plain dollar. */
function inlineTex(state: StateInline, silent: boolean): boolean {
  const { src, pos, posMax } = state;
  if (src.charCodeAt(pos) !== DOLLAR) return false;
  const display = src.charCodeAt(pos + 1) === DOLLAR;
  const open = display ? 2 : 1;
  const start = pos + open;
  if (start >= posMax || isSpace(src.charCodeAt(start))) return false;
  let end = start;
  while (end < posMax) {
    const code = src.charCodeAt(end);
    if (code === BACKSLASH) end += 2;
    else if (code === DOLLAR) break;
    else if (code === 0x0a && !display) return false;
    else end += 1;
  }
  if (end >= posMax) return false;
  if (display ? src.charCodeAt(end + 1) !== DOLLAR : isSpace(src.charCodeAt(end - 1)) || src.charCodeAt(end + 1) === DOLLAR) return false;
  if (!silent) {
    const token = state.push(display ? 'tex_display' : 'tex_inline', 'math', 0);
    token.content = src.slice(start, end).trim();
  }
  state.pos = end + open;
  return true;
}

/** A paragraph made of one `$$ … $$` formula, possibly over several lines. */
function blockTex(state: StateBlock, startLine: number, endLine: number, silent: boolean): boolean {
  const begin = state.bMarks[startLine] + state.tShift[startLine];
  if (state.sCount[startLine] - state.blkIndent >= 4 || !state.src.startsWith('$$', begin)) return false;
  const firstLine = state.src.slice(begin + 2, state.eMarks[startLine]);
  let body: string;
  let lastLine = startLine;
  if (firstLine.trimEnd().endsWith('$$') && firstLine.trim().length > 2) {
    body = firstLine.trimEnd().slice(0, -2);
  } else {
    const lines = [firstLine];
    for (lastLine = startLine + 1; lastLine < endLine; lastLine += 1) {
      const text = state.src.slice(state.bMarks[lastLine] + state.tShift[lastLine], state.eMarks[lastLine]);
      if (text.trimEnd().endsWith('$$')) {
        lines.push(text.trimEnd().slice(0, -2));
        break;
      }
      lines.push(text);
    }
    if (lastLine >= endLine) return false;
    body = lines.join('\n');
  }
  if (silent) return true;
  const token = state.push('tex_block', 'math', 0);
  token.content = body.trim();
  token.map = [startLine, lastLine + 1];
  state.line = lastLine + 1;
  return true;
}

/** `@handle`, not inside an address (`a@b.org` stays text). */
function mention(state: StateInline, silent: boolean): boolean {
  const handle = mentionAt(state.src, state.pos);
  if (!handle || state.pos + 1 + handle.length > state.posMax) return false;
  if (!silent) state.push('mention', 'span', 0).content = handle;
  state.pos += 1 + handle.length;
  return true;
}

function commentMarkdown(): MarkdownIt {
  const markdown = new MarkdownItFactory('zero', { html: false, breaks: true, linkify: false }).enable(COMMENT_RULES);
  markdown.inline.ruler.before('emphasis', 'tex_inline', inlineTex);
  markdown.inline.ruler.before('emphasis', 'mention', mention);
  markdown.block.ruler.before('paragraph', 'tex_block', blockTex, { alt: ['paragraph', 'list'] });
  const { escapeHtml } = markdown.utils;
  markdown.renderer.rules.tex_inline = (tokens, index) => renderTex(tokens[index].content, false);
  markdown.renderer.rules.tex_display = (tokens, index) => renderTex(tokens[index].content, true);
  markdown.renderer.rules.tex_block = (tokens, index) => `<div class="rungbook-comment-math">${renderTex(tokens[index].content, true)}</div>\n`;
  markdown.renderer.rules.mention = (tokens, index) => `<span class="rungbook-mention">@${escapeHtml(tokens[index].content)}</span>`;
  markdown.renderer.rules.link_open = (tokens, index, options, _env, self) => {
    tokens[index].attrSet('target', '_blank');
    tokens[index].attrSet('rel', 'noopener noreferrer nofollow');
    return self.renderToken(tokens, index, options);
  };
  return markdown;
}

const markdown = commentMarkdown();

/** The comment as HTML: the Markdown subset, TeX typeset by KaTeX, mentions marked; raw HTML shown as text. */
export function commentHtml(text: string): string {
  return markdown.render(text);
}

/** A piece of a comment for places without a DOM: plain text, or a mention to highlight. */
export interface CommentTextPart {
  text: string;
  mention: boolean;
}

/** The comment as plain text split around its mentions; formulas and Markdown keep their source. */
export function commentTextParts(text: string): CommentTextPart[] {
  const parts: CommentTextPart[] = [];
  let plainFrom = 0;
  for (let at = text.indexOf('@'); at >= 0; at = text.indexOf('@', at + 1)) {
    const handle = mentionAt(text, at);
    if (!handle) continue;
    if (at > plainFrom) parts.push({ text: text.slice(plainFrom, at), mention: false });
    parts.push({ text: `@${handle}`, mention: true });
    plainFrom = at + 1 + handle.length;
    at = plainFrom - 1;
  }
  if (plainFrom < text.length) parts.push({ text: text.slice(plainFrom), mention: false });
  return parts;
}
