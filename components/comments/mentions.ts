/** The `@word` being typed just before the caret: where its @ sits and the letters after it. */
export interface MentionQuery {
  start: number;
  search: string;
}

/** The same characters as a mention in a saved comment (see mentionAt); an @ after an address character starts none. */
const TYPING_MENTION = /(^|[^A-Za-z0-9._%+-])@([A-Za-z0-9._-]{0,40})$/;

export function mentionQueryAt(text: string, caret = text.length): MentionQuery | null {
  const match = TYPING_MENTION.exec(text.slice(0, caret));
  if (!match) return null;
  return { start: match.index + match[1].length, search: match[2] };
}

/** Replace the `@word` being typed with `@handle ` and give the caret position after it. */
export function insertMention(text: string, query: MentionQuery, handle: string, caret = text.length): { text: string; caret: number } {
  const inserted = `@${handle} `;
  const rest = text.slice(caret).replace(/^ /, '');
  return { text: `${text.slice(0, query.start)}${inserted}${rest}`, caret: query.start + inserted.length };
}
