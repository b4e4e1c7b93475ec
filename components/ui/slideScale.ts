import { spacing } from '../../constants/theme';

/** Type and spacing of a slide for the screen it is on: large on a wide screen, smaller on a phone either way round. */
export function slideScale(width: number, height: number) {
  if (width >= 1024 && height >= 600) return { type: 26, kind: 34, padding: spacing.xl, compact: false };
  if (height < 500) return { type: 17, kind: 22, padding: spacing.md, compact: true };
  return { type: 16, kind: 24, padding: spacing.md, compact: true };
}
