import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';

interface NoticeProps {
  tone: 'error' | 'success' | 'info';
  message: string;
  testID?: string;
}

/** A message box for the outcome of an action: what went wrong, or what happened. */
export function Notice({ tone, message, testID }: NoticeProps) {
  return (
    <View style={[styles.box, styles[tone]]} accessibilityRole={tone === 'error' ? 'alert' : 'text'} testID={testID}>
      <Text style={[styles.text, tone === 'error' && styles.errorText]}>{message}</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { borderRadius: 6, padding: spacing.md, borderLeftWidth: 4 },
  error: { backgroundColor: colors.dangerWash, borderLeftColor: colors.danger },
  success: { backgroundColor: colors.successWash, borderLeftColor: colors.success },
  info: { backgroundColor: colors.amberWash, borderLeftColor: colors.amber },
  text: { fontFamily: fonts.regular, fontSize: 14, color: colors.ink, lineHeight: 20 },
  errorText: { color: colors.danger },
});
