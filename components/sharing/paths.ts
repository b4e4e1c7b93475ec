/** The sharing panel of a notebook (the editor's Share / People button links here). */
export const sharingHref = (notebookId: string) => `/notebooks/${notebookId}/sharing` as const;

/** The read-only page a share link opens (path only, for coming back to it after signing in). */
export const sharedPagePath = (token: string) => `/shared/${encodeURIComponent(token)}`;

/** Sign in, then come back to `next` (a path of this site). */
export const signInHref = (next: string) => `/sign-in?next=${encodeURIComponent(next)}`;

/**
 * Where to go after signing in: `next` when it is a path of this site (one leading '/', not '//' nor a slash and backslash,
 * which browsers read as another host), else the notebook list.
 */
export function safeNextPath(next: string | string[] | undefined): string {
  const candidate = Array.isArray(next) ? next[0] : next;
  if (!candidate || !candidate.startsWith('/') || candidate.startsWith('//') || candidate.startsWith('/\\')) return '/notebooks';
  // Control characters (tabs, newlines) are dropped by URL parsers and could turn the path into '//host'.
  if (/[\u0000-\u001f\u007f]/.test(candidate)) return '/notebooks';
  return candidate;
}
