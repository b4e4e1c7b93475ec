import { useEffect, useRef, type ReactNode } from 'react';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { router, usePathname } from 'expo-router';
import { useSafeAreaInsets } from 'react-native-safe-area-context';
import { colors, fonts, spacing } from '../../constants/theme';
import { useActivityQuery } from '../../hooks/api/activity';
import { useWideLayout } from '../../hooks/useWideLayout';
import type { PublicUser } from '../../shared/api/schemas';
import { destinationsFor, type Destination } from './destinations';
import { RungMark } from './RungMark';

/** Signed-in frame: a side rail from 1024 px, a bottom bar on phones. */
export function AppShell({ user, children }: { user: PublicUser; children: ReactNode }) {
  const wide = useWideLayout();
  const pathname = usePathname();
  const items = destinationsFor(user.siteRole);
  const isActive = (item: Destination) => pathname === item.href || pathname.startsWith(`${item.href}/`);

  // The presentation view takes the whole screen (projector or phone held up to a group).
  if (pathname.endsWith('/present')) return <View style={styles.main}>{children}</View>;

  if (wide) {
    return (
      <View style={styles.wideRoot}>
        <View style={styles.rail} role="navigation" testID="side-rail">
          <View style={styles.railBrand}>
            <RungMark size={26} />
            <Text style={styles.railBrandName}>Rungbook</Text>
          </View>
          {items.map((item) => (
            <Pressable
              key={item.href}
              accessibilityRole="link"
              accessibilityState={{ selected: isActive(item) }}
              onPress={() => router.navigate(item.href)}
              testID={`nav-${item.label.toLowerCase()}`}
              style={[styles.railItem, isActive(item) && styles.railItemActive]}
            >
              <Text style={styles.railGlyph}>{item.glyph}</Text>
              <Text style={[styles.railLabel, isActive(item) && styles.railLabelActive]}>{item.label}</Text>
              {item.unreadBadge ? <UnreadBadge style={styles.railBadge} /> : null}
            </Pressable>
          ))}
          <View style={styles.railFooter}>
            <Text style={styles.railUser} numberOfLines={1}>
              {user.name}
            </Text>
          </View>
        </View>
        <View style={styles.main}>{children}</View>
      </View>
    );
  }
  return <PhoneShell items={items} isActive={isActive}>{children}</PhoneShell>;
}

function PhoneShell({ items, isActive, children }: { items: Destination[]; isActive: (d: Destination) => boolean; children: ReactNode }) {
  const insets = useSafeAreaInsets();
  return (
    <View style={styles.phoneRoot}>
      <View style={[styles.topBar, { paddingTop: insets.top + spacing.sm }]}>
        <RungMark size={22} />
        <Text style={styles.topBarName}>Rungbook</Text>
      </View>
      <View style={styles.main}>{children}</View>
      <View style={[styles.bottomBar, { paddingBottom: insets.bottom }]} accessibilityRole="tablist" testID="bottom-bar">
        {items.map((item) => (
          <Pressable
            key={item.href}
            accessibilityRole="tab"
            accessibilityState={{ selected: isActive(item) }}
            onPress={() => router.navigate(item.href)}
            testID={`nav-${item.label.toLowerCase()}`}
            style={styles.tab}
          >
            <View style={[styles.tabMarker, isActive(item) && styles.tabMarkerActive]} />
            <View>
              <Text style={[styles.tabGlyph, isActive(item) && styles.tabActiveText]}>{item.glyph}</Text>
              {item.unreadBadge ? <UnreadBadge style={styles.tabBadge} /> : null}
            </View>
            <Text style={[styles.tabLabel, isActive(item) && styles.tabActiveText]}>{item.label}</Text>
          </Pressable>
        ))}
      </View>
    </View>
  );
}

/** Unread activity items, polled and asked for again on every move between screens. */
function UnreadBadge({ style }: { style: object }) {
  const activity = useActivityQuery();
  const pathname = usePathname();
  const firstPath = useRef(pathname);
  const { refetch } = activity;
  useEffect(() => {
    if (pathname !== firstPath.current) void refetch();
  }, [pathname, refetch]);
  const unread = activity.data?.unread ?? 0;
  if (!unread) return null;
  return (
    <View style={[styles.badge, style]} accessibilityLabel={`${unread} unread`} testID="nav-activity-badge">
      <Text style={styles.badgeText}>{unread > 99 ? '99+' : unread}</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  wideRoot: { flex: 1, flexDirection: 'row', backgroundColor: colors.paper },
  rail: { width: 220, backgroundColor: colors.slate, paddingVertical: spacing.xl, paddingHorizontal: spacing.md, gap: spacing.xs },
  railBrand: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm, paddingHorizontal: spacing.sm, marginBottom: spacing.xl },
  railBrandName: { fontFamily: fonts.semibold, fontSize: 20, color: colors.slateText },
  railItem: { flexDirection: 'row', alignItems: 'center', gap: spacing.md, paddingVertical: spacing.md, paddingHorizontal: spacing.sm, borderRadius: 6, borderLeftWidth: 3, borderLeftColor: 'transparent' },
  railItemActive: { backgroundColor: 'rgba(255,255,255,0.07)', borderLeftColor: colors.amber },
  railGlyph: { width: 20, textAlign: 'center', fontSize: 17, color: colors.slateText },
  railLabel: { fontFamily: fonts.medium, fontSize: 15, color: colors.slateText, opacity: 0.8 },
  railLabelActive: { opacity: 1 },
  railFooter: { marginTop: 'auto', paddingHorizontal: spacing.sm },
  railUser: { fontFamily: fonts.regular, fontSize: 13, color: colors.slateText, opacity: 0.7 },
  main: { flex: 1 },
  phoneRoot: { flex: 1, backgroundColor: colors.paper },
  topBar: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm, paddingHorizontal: spacing.lg, paddingBottom: spacing.sm, backgroundColor: colors.slate },
  topBarName: { fontFamily: fonts.semibold, fontSize: 17, color: colors.slateText },
  bottomBar: { flexDirection: 'row', backgroundColor: colors.surface, borderTopWidth: 1, borderTopColor: colors.rule },
  tab: { flex: 1, alignItems: 'center', paddingTop: 0, paddingBottom: spacing.sm, minHeight: 56, gap: 2 },
  tabMarker: { height: 3, width: 28, borderRadius: 2, backgroundColor: 'transparent', marginBottom: spacing.xs },
  tabMarkerActive: { backgroundColor: colors.amber },
  tabGlyph: { fontSize: 18, color: colors.inkFaint },
  tabLabel: { fontFamily: fonts.medium, fontSize: 12, color: colors.inkFaint },
  tabActiveText: { color: colors.ink },
  badge: { minWidth: 18, height: 18, borderRadius: 9, paddingHorizontal: 5, backgroundColor: colors.amber, alignItems: 'center', justifyContent: 'center' },
  badgeText: { fontFamily: fonts.semibold, fontSize: 11, color: colors.surface },
  railBadge: { marginLeft: 'auto' },
  tabBadge: { position: 'absolute', top: -4, left: 12 },
});
