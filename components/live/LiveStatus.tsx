import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { LIVE_POLL_MS, type LiveConnection } from '../../hooks/api/live';

const words: Record<LiveConnection, string> = {
  connecting: 'Connecting…',
  live: 'Live',
  reconnecting: 'Reconnecting…',
  polling: `Updates every ${LIVE_POLL_MS / 1000} s`,
  revoked: 'No access',
};

const dot: Record<LiveConnection, string> = {
  connecting: colors.inkFaint,
  live: colors.success,
  reconnecting: colors.amber,
  polling: colors.inkFaint,
  revoked: colors.danger,
};

/** Whether others' edits arrive by themselves right now. */
export function LiveStatus({ connection }: { connection: LiveConnection }) {
  return (
    <View style={styles.row} testID="live-status" accessibilityLiveRegion="polite" accessibilityLabel={`Live updates: ${words[connection]}`}>
      <View style={[styles.dot, { backgroundColor: dot[connection] }]} />
      <Text style={styles.text}>{words[connection]}</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignItems: 'center', gap: spacing.xs },
  dot: { width: 8, height: 8, borderRadius: 4 },
  text: { fontFamily: fonts.medium, fontSize: 12, color: colors.inkSoft },
});
