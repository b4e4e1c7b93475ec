import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors } from '../../constants/theme';

const SIZE = 28;

type PointerEvent = { nativeEvent: { clientX?: number; clientY?: number; locationX?: number; locationY?: number } };

/**
 * A laser-pointer-like dot that follows a mouse or pen over a slide (web); touch screens have no hover, so
 * nothing shows there. The handlers go on the slide; `at` is where the dot is drawn, relative to the slide.
 */
export function usePointerHighlight() {
  const [at, setAt] = useState<{ x: number; y: number } | null>(null);
  // RN's types do not list pointer props on View; react-native-web passes them to the DOM.
  const handlers: object = {
    onPointerMove: (event: PointerEvent & { currentTarget?: unknown }) => setAt(slideOffset(event)),
    onPointerLeave: () => setAt(null),
  };
  return { at, handlers };
}

/** The pointer relative to the slide (the DOM's offsetX is relative to whatever element is under the pointer). */
function slideOffset(event: PointerEvent & { currentTarget?: unknown }): { x: number; y: number } {
  const native = event.nativeEvent;
  const slide = event.currentTarget as { getBoundingClientRect?: () => { left: number; top: number } } | undefined;
  if (native.clientX !== undefined && native.clientY !== undefined && slide?.getBoundingClientRect) {
    const box = slide.getBoundingClientRect();
    return { x: native.clientX - box.left, y: native.clientY - box.top };
  }
  return { x: event.nativeEvent.locationX ?? 0, y: event.nativeEvent.locationY ?? 0 };
}

export function PointerHighlight({ at }: { at: { x: number; y: number } | null }) {
  if (!at) return null;
  return <View pointerEvents="none" style={[styles.dot, { left: at.x - SIZE / 2, top: at.y - SIZE / 2 }]} testID="presentation-pointer" />;
}

const styles = StyleSheet.create({
  dot: { position: 'absolute', width: SIZE, height: SIZE, borderRadius: SIZE / 2, borderWidth: 3, borderColor: colors.danger, backgroundColor: 'rgba(178, 58, 58, 0.18)' },
});
