import { Pressable, StyleSheet, Text } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';

interface ChipButtonProps {
  label: string;
  onPress: () => void;
  selected?: boolean;
  disabled?: boolean;
  tone?: 'plain' | 'accent' | 'danger';
  accessibilityLabel?: string;
  testID?: string;
}

/** A compact action for the dense places of a notebook: cell headers, output toolbars, choices. */
export function ChipButton({ label, onPress, selected = false, disabled = false, tone = 'plain', accessibilityLabel, testID }: ChipButtonProps) {
  return (
    <Pressable
      accessibilityRole="button"
      accessibilityLabel={accessibilityLabel}
      accessibilityState={{ selected, disabled }}
      onPress={onPress}
      disabled={disabled}
      testID={testID}
      style={({ pressed }) => [styles.chip, tone === 'accent' && styles.accent, tone === 'danger' && styles.danger, selected && styles.selected, pressed && styles.pressed, disabled && styles.disabled]}
    >
      <Text style={[styles.label, tone === 'accent' && styles.accentLabel, tone === 'danger' && styles.dangerLabel, selected && styles.selectedLabel]}>{label}</Text>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  // maxWidth: a long label (a research group's name) wraps inside its row instead of running off a phone screen.
  chip: { minHeight: 32, maxWidth: '100%', paddingHorizontal: spacing.md, paddingVertical: 2, borderRadius: 16, borderWidth: 1, borderColor: colors.rule, backgroundColor: colors.surface, alignItems: 'center', justifyContent: 'center' },
  accent: { backgroundColor: colors.amber, borderColor: colors.amber },
  danger: { borderColor: colors.danger },
  selected: { backgroundColor: colors.slate, borderColor: colors.slate },
  pressed: { opacity: 0.8 },
  disabled: { opacity: 0.5 },
  label: { fontFamily: fonts.medium, fontSize: 13, color: colors.ink },
  accentLabel: { color: colors.surface },
  dangerLabel: { color: colors.danger },
  selectedLabel: { color: colors.slateText },
});
