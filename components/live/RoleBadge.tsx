import { StyleSheet, Text } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import type { NotebookRole } from '../../shared/notebook/sharing';

const explained: Record<NotebookRole, string> = {
  owner: 'You own this notebook',
  editor: 'You can edit and run this notebook',
  commenter: 'You can read and comment on this notebook',
  viewer: 'You can read this notebook',
};

/** The caller's role on the notebook, in the title. */
export function RoleBadge({ role }: { role: NotebookRole }) {
  const strong = role === 'owner' || role === 'editor';
  return (
    <Text style={[styles.badge, strong ? styles.strong : styles.weak]} testID="role-badge" accessibilityLabel={explained[role]}>
      {role}
    </Text>
  );
}

const styles = StyleSheet.create({
  badge: { alignSelf: 'center', fontFamily: fonts.semibold, fontSize: 11, letterSpacing: 0.8, textTransform: 'uppercase', paddingHorizontal: spacing.sm, paddingVertical: 2, borderRadius: 10, overflow: 'hidden', borderWidth: 1 },
  strong: { color: colors.amberDeep, backgroundColor: colors.amberWash, borderColor: colors.amber },
  weak: { color: colors.inkSoft, backgroundColor: colors.surface, borderColor: colors.rule },
});
