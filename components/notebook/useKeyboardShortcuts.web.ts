import { useEffect, useRef } from 'react';
import type { ShortcutHandlers } from './shortcuts';
import { shortcutFor } from './shortcuts';

/** Web: listens on the window while `enabled`; handlers may change every render without re-subscribing. */
export function useKeyboardShortcuts(handlers: ShortcutHandlers, enabled: boolean) {
  const latest = useRef(handlers);
  latest.current = handlers;
  useEffect(() => {
    if (!enabled) return;
    const onKeyDown = (event: KeyboardEvent) => {
      const target = event.target as HTMLElement | null;
      const typing = !!target && (target.tagName === 'INPUT' || target.tagName === 'TEXTAREA' || target.isContentEditable);
      const action = shortcutFor(event, typing);
      const handler = action ? latest.current[action] : undefined;
      if (!handler) return;
      event.preventDefault();
      handler();
    };
    window.addEventListener('keydown', onKeyDown);
    return () => window.removeEventListener('keydown', onKeyDown);
  }, [enabled]);
}
