/** One line of a plain-text mail: no control characters or line breaks that could fake further lines, bounded length. */
export function mailSafe(text: string, max = 200): string {
  const flat = text.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]+/g, ' ').replace(/\s+/g, ' ').trim();
  return flat.length > max ? `${flat.slice(0, max - 1)}…` : flat;
}
