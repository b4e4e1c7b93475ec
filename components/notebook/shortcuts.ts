export type ShortcutAction = 'runCell' | 'runAll' | 'addCell' | 'help' | 'next' | 'previous';
export type ShortcutHandlers = Partial<Record<ShortcutAction, () => void>>;

export interface KeyPress {
  key: string;
  code?: string;
  altKey: boolean;
  shiftKey: boolean;
  ctrlKey: boolean;
  metaKey: boolean;
}

/** What the help sheet lists; Alt keeps clear of the browser's own Ctrl/⌘ shortcuts. */
export const shortcutList: { action: ShortcutAction; keys: string; what: string }[] = [
  { action: 'runCell', keys: 'Alt + R', what: 'Run the selected cell' },
  { action: 'runAll', keys: 'Alt + Shift + R', what: 'Run every cell that is not up to date' },
  { action: 'addCell', keys: 'Alt + N', what: 'Add a cell after the selected one' },
  { action: 'help', keys: '?  or  Alt + /', what: 'Show or hide this list' },
];

/** The action a key press asks for. `typing` is true inside a text field, where only Alt chords count. */
export function shortcutFor(press: KeyPress, typing: boolean): ShortcutAction | null {
  if (press.ctrlKey || press.metaKey) return null;
  const letter = press.code?.startsWith('Key') ? press.code.slice(3).toLowerCase() : press.key.toLowerCase();
  if (press.altKey) {
    if (letter === 'r') return press.shiftKey ? 'runAll' : 'runCell';
    if (letter === 'n') return 'addCell';
    if (press.code === 'Slash' || press.key === '/') return 'help';
    return null;
  }
  if (typing) return null;
  if (press.key === '?') return 'help';
  if (press.key === 'ArrowRight') return 'next';
  if (press.key === 'ArrowLeft') return 'previous';
  return null;
}
