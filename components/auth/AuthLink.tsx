import { Link, type Href } from 'expo-router';
import { StyleSheet, Text } from 'react-native';
import { colors, fonts } from '../../constants/theme';

export function AuthLink({ href, label, testID }: { href: Href; label: string; testID?: string }) {
  return (
    <Link href={href} testID={testID} style={styles.link}>
      <Text style={styles.text}>{label}</Text>
    </Link>
  );
}

const styles = StyleSheet.create({
  link: { alignSelf: 'flex-start' },
  text: { fontFamily: fonts.medium, fontSize: 14, color: colors.amberDeep, textDecorationLine: 'underline' },
});
