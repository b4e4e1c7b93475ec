import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import type { NotificationView } from '../../shared/notebook/sharing';
import { when } from '../comments/when';
import { activityHref, notificationKindTitles } from './activityLinks';

/** One entry of my activity list; unread ones stand out. */
export function ActivityItem({ item, onOpen }: { item: NotificationView; onOpen: (item: NotificationView, href: string) => void }) {
  const href = activityHref(item);
  return (
    <Pressable
      accessibilityRole={href ? 'link' : undefined}
      accessibilityState={{ disabled: !href }}
      accessibilityLabel={`${item.read ? '' : 'Unread. '}${item.text}`}
      disabled={!href}
      onPress={() => href && onOpen(item, href)}
      style={({ pressed }) => [styles.item, !item.read && styles.unread, pressed && styles.pressed]}
      testID={`activity-item-${item.id}`}
    >
      <View style={styles.head}>
        <Text style={[styles.kind, !item.read && styles.kindUnread]}>{notificationKindTitles[item.kind]}</Text>
        {item.notebookTitle ? <Text style={styles.notebook} numberOfLines={1}>{item.notebookTitle}</Text> : null}
        {!item.read ? <View style={styles.dot} testID={`activity-item-${item.id}-unread`} /> : null}
      </View>
      <Text style={[styles.text, !item.read && styles.textUnread]}>{item.text}</Text>
      <Text style={styles.time}>{when(item.createdAt)}</Text>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  item: { gap: spacing.xs, padding: spacing.md, borderRadius: 8, borderWidth: 1, borderColor: colors.rule, backgroundColor: colors.surface, borderLeftWidth: 4, borderLeftColor: colors.rule },
  unread: { backgroundColor: colors.amberWash, borderLeftColor: colors.amber },
  pressed: { opacity: 0.85 },
  head: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm },
  kind: { fontFamily: fonts.medium, fontSize: 12, color: colors.inkFaint, textTransform: 'uppercase', letterSpacing: 0.5 },
  kindUnread: { color: colors.amberDeep },
  notebook: { flexShrink: 1, fontFamily: fonts.regular, fontSize: 13, color: colors.inkSoft },
  dot: { width: 8, height: 8, borderRadius: 4, backgroundColor: colors.amber, marginLeft: 'auto' },
  text: { fontFamily: fonts.regular, fontSize: 15, lineHeight: 21, color: colors.inkSoft },
  textUnread: { fontFamily: fonts.medium, color: colors.ink },
  time: { fontFamily: fonts.regular, fontSize: 12, color: colors.inkFaint },
});
