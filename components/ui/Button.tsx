import { ActivityIndicator, Pressable, StyleSheet, Text } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';

interface ButtonProps {
  label: string;
  onPress: () => void;
  variant?: 'primary' | 'quiet' | 'danger';
  busy?: boolean;
  disabled?: boolean;
  testID?: string;
}

export function Button({ label, onPress, variant = 'primary', busy = false, disabled = false, testID }: ButtonProps) {
  const inactive = disabled || busy;
  return (
    <Pressable
      accessibilityRole="button"
      accessibilityState={{ disabled: inactive, busy }}
      onPress={onPress}
      disabled={inactive}
      testID={testID}
      style={({ pressed }) => [styles.base, styles[variant], pressed && styles.pressed, inactive && styles.inactive]}
    >
      {busy ? <ActivityIndicator color={variant === 'primary' ? colors.surface : colors.ink} size="small" /> : null}
      <Text style={[styles.label, variant === 'primary' ? styles.labelOnAmber : variant === 'danger' ? styles.labelDanger : null]}>
        {label}
      </Text>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  base: {
    minHeight: 44,
    paddingHorizontal: spacing.lg,
    borderRadius: 6,
    alignItems: 'center',
    justifyContent: 'center',
    flexDirection: 'row',
    gap: spacing.sm,
  },
  primary: { backgroundColor: colors.amber },
  quiet: { backgroundColor: 'transparent', borderWidth: 1, borderColor: colors.rule },
  danger: { backgroundColor: 'transparent', borderWidth: 1, borderColor: colors.danger },
  pressed: { opacity: 0.85 },
  inactive: { opacity: 0.55 },
  label: { fontFamily: fonts.semibold, fontSize: 15, color: colors.ink },
  labelOnAmber: { color: colors.surface },
  labelDanger: { color: colors.danger },
});
