/** "just now", "12 min ago", "3 h ago", else the date: enough to place a comment or an activity item. */
export function when(iso: string, now = Date.now()): string {
  const ago = now - Date.parse(iso);
  if (ago < 60_000) return 'just now';
  if (ago < 3_600_000) return `${Math.floor(ago / 60_000)} min ago`;
  if (ago < 86_400_000) return `${Math.floor(ago / 3_600_000)} h ago`;
  return new Date(iso).toISOString().slice(0, 10);
}
