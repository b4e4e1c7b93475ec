import { Link } from 'expo-router';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../constants/theme';

export default function NotFoundRoute() {
  return (
    <View style={styles.page}>
      <Text style={styles.title}>This page does not exist.</Text>
      <Link href="/notebooks" style={styles.link}>Go to your notebooks</Link>
    </View>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, alignItems: 'center', justifyContent: 'center', gap: spacing.md, backgroundColor: colors.paper },
  title: { fontFamily: fonts.semibold, fontSize: 20, color: colors.ink },
  link: { fontFamily: fonts.medium, fontSize: 15, color: colors.amberDeep, textDecorationLine: 'underline' },
});
