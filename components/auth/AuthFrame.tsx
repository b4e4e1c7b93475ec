import type { ReactNode } from 'react';
import { ScrollView, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { RungMark } from '../navigation/RungMark';

/** The frame around the sign-in pages: brand on the ink band, the form on paper. */
export function AuthFrame({ title, children }: { title: string; children: ReactNode }) {
  return (
    <ScrollView style={styles.page} contentContainerStyle={styles.content}>
      <View style={styles.brand}>
        <RungMark size={30} />
        <Text style={styles.brandName}>Rungbook</Text>
      </View>
      <Text style={styles.tagline}>ε-expansions, rung by rung, checked together.</Text>
      <View style={styles.card}>
        <Text style={styles.title} accessibilityRole="header">
          {title}
        </Text>
        {children}
      </View>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, backgroundColor: colors.slate },
  content: { flexGrow: 1, alignItems: 'center', justifyContent: 'center', padding: spacing.lg, gap: spacing.md },
  brand: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm },
  brandName: { fontFamily: fonts.semibold, fontSize: 28, color: colors.slateText, letterSpacing: 0.5 },
  tagline: { fontFamily: fonts.regular, fontSize: 15, color: colors.slateText, opacity: 0.8, marginBottom: spacing.sm },
  card: {
    width: '100%',
    maxWidth: 420,
    backgroundColor: colors.paper,
    borderRadius: 10,
    padding: spacing.xl,
    gap: spacing.lg,
  },
  title: { fontFamily: fonts.semibold, fontSize: 22, color: colors.ink },
});
