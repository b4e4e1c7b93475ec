import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import type { ViewerPresence } from '../../shared/notebook/sharing';

const SHOWN = 5;

export function initials(name: string): string {
  const words = name.trim().split(/\s+/).filter(Boolean);
  const letters = words.length > 1 ? [words[0], words[words.length - 1]] : words;
  return letters.map((word) => Array.from(word)[0]?.toUpperCase() ?? '').join('') || '?';
}

/** Everyone looking at the notebook except the caller, each person once (several tabs count once). */
export function otherViewers(viewers: ViewerPresence[], myId: string | undefined): ViewerPresence[] {
  const seen = new Map<string, ViewerPresence>();
  for (const viewer of viewers) {
    if (viewer.userId === myId) continue;
    const known = seen.get(viewer.userId);
    seen.set(viewer.userId, known ? { ...known, presenting: known.presenting || viewer.presenting } : viewer);
  }
  return [...seen.values()];
}

/** "Also here:" with initials of the others looking at the notebook now. */
export function PresenceList({ viewers }: { viewers: ViewerPresence[] }) {
  if (viewers.length === 0) return null;
  const names = viewers.map((viewer) => viewer.name).join(', ');
  const extra = viewers.length - SHOWN;
  return (
    <View style={styles.row} testID="presence-list" accessibilityLabel={`Also here: ${names}`}>
      <Text style={styles.lead}>Also here</Text>
      {viewers.slice(0, SHOWN).map((viewer) => (
        <View key={viewer.userId} style={[styles.avatar, viewer.presenting && styles.presenting]} testID={`presence-${viewer.userId}`} accessibilityLabel={viewer.presenting ? `${viewer.name}, presenting` : viewer.name}>
          <Text style={[styles.initials, viewer.presenting && styles.presentingText]}>{initials(viewer.name)}</Text>
        </View>
      ))}
      {extra > 0 ? <Text style={styles.lead}>+{extra}</Text> : null}
      <Text style={styles.names} numberOfLines={1}>{names}</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignItems: 'center', gap: spacing.xs, flexShrink: 1, minWidth: 0 },
  lead: { fontFamily: fonts.medium, fontSize: 12, color: colors.inkFaint, marginRight: spacing.xs },
  avatar: { width: 28, height: 28, borderRadius: 14, backgroundColor: colors.slate, alignItems: 'center', justifyContent: 'center', borderWidth: 2, borderColor: colors.paper },
  presenting: { backgroundColor: colors.amber },
  initials: { fontFamily: fonts.semibold, fontSize: 11, color: colors.slateText },
  presentingText: { color: colors.surface },
  names: { flexShrink: 1, fontFamily: fonts.regular, fontSize: 12, color: colors.inkSoft, marginLeft: spacing.xs },
});
