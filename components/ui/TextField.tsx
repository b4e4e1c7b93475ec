import { StyleSheet, Text, TextInput, View, type TextInputProps } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';

interface TextFieldProps extends Pick<TextInputProps, 'autoComplete' | 'keyboardType' | 'secureTextEntry' | 'onSubmitEditing'> {
  label: string;
  value: string;
  onChangeText: (text: string) => void;
  error?: string;
  hint?: string;
  testID?: string;
}

export function TextField({ label, value, onChangeText, error, hint, testID, ...inputProps }: TextFieldProps) {
  return (
    <View style={styles.wrap}>
      <Text style={styles.label}>{label}</Text>
      <TextInput
        accessibilityLabel={label}
        value={value}
        onChangeText={onChangeText}
        autoCapitalize="none"
        autoCorrect={false}
        testID={testID}
        style={[styles.input, error ? styles.inputError : null]}
        placeholderTextColor={colors.inkFaint}
        {...inputProps}
      />
      {error ? (
        <Text style={styles.error} accessibilityRole="alert" testID={testID ? `${testID}-error` : undefined}>
          {error}
        </Text>
      ) : hint ? (
        <Text style={styles.hint}>{hint}</Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.xs },
  label: { fontFamily: fonts.medium, fontSize: 14, color: colors.inkSoft },
  input: {
    minHeight: 44,
    borderWidth: 1,
    borderColor: colors.rule,
    borderRadius: 6,
    paddingHorizontal: spacing.md,
    fontFamily: fonts.regular,
    fontSize: 16,
    color: colors.ink,
    backgroundColor: colors.surface,
  },
  inputError: { borderColor: colors.danger },
  error: { fontFamily: fonts.regular, fontSize: 13, color: colors.danger },
  hint: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
});
