import { StyleSheet, Text, TextInput, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import type { CellInput } from '../../../shared/notebook';
import { FieldError, type EditorProps } from './fields';

type NoteInput = Extract<CellInput, { kind: 'note' }>;

export function NoteEditor({ input, errors, onChange, testPrefix }: EditorProps<NoteInput>) {
  return (
    <View style={styles.wrap}>
      <Text style={styles.label}>Text</Text>
      <TextInput
        accessibilityLabel="Note text"
        multiline
        value={input.text}
        onChangeText={(text) => onChange({ ...input, text })}
        placeholder="Markdown, with $inline$ and $$display$$ TeX"
        placeholderTextColor={colors.inkFaint}
        style={styles.input}
        testID={`${testPrefix}-text`}
      />
      {errors.text ? <FieldError message={errors.text} testID={`${testPrefix}-text-error`} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.xs },
  label: { fontFamily: fonts.medium, fontSize: 14, color: colors.inkSoft },
  input: { minHeight: 120, borderWidth: 1, borderColor: colors.rule, borderRadius: 6, padding: spacing.md, fontFamily: fonts.regular, fontSize: 15, lineHeight: 22, color: colors.ink, backgroundColor: colors.surface, textAlignVertical: 'top' },
});
