import { StyleSheet, Text } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import type { NotebookRole } from '../../shared/notebook/sharing';
import { roleLabels } from './roles';

/** The caller's or a member's role on a notebook; owner and editor in ink, the read-side roles quieter. */
export function RoleBadge({ role, testID }: { role: NotebookRole; testID?: string }) {
  const strong = role === 'owner' || role === 'editor';
  return (
    <Text style={[styles.badge, strong ? styles.strong : styles.quiet]} testID={testID} accessibilityLabel={`Role: ${roleLabels[role]}`}>
      {roleLabels[role]}
    </Text>
  );
}

const styles = StyleSheet.create({
  badge: { fontFamily: fonts.medium, fontSize: 12, paddingHorizontal: spacing.sm, paddingVertical: 2, borderRadius: 10, overflow: 'hidden', alignSelf: 'flex-start' },
  strong: { backgroundColor: colors.slate, color: colors.slateText },
  quiet: { backgroundColor: colors.amberWash, color: colors.amberDeep },
});
