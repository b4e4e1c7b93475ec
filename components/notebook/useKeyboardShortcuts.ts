import type { ShortcutHandlers } from './shortcuts';

/** Native: no hardware-keyboard shortcuts; the same actions sit in each cell's menu. */
export function useKeyboardShortcuts(_handlers: ShortcutHandlers, _enabled: boolean) {}
