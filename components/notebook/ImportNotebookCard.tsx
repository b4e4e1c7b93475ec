import { useState } from 'react';
import { StyleSheet, Text, TextInput } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useImportNotebookMutation } from '../../hooks/api/notebooks';
import { Button } from '../ui/Button';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { monoFont } from './monoFont';

/** Paste a notebook exported as Rungbook JSON; the server checks it and says what is wrong. */
export function ImportNotebookCard({ onImported }: { onImported: (notebookId: string) => void }) {
  const [text, setText] = useState('');
  const [parseError, setParseError] = useState<string | null>(null);
  const importing = useImportNotebookMutation();
  const submit = () => {
    let parsed: unknown;
    try {
      parsed = JSON.parse(text);
    } catch (error) {
      return setParseError(`This is not JSON: ${error instanceof Error ? error.message : 'it does not parse'}.`);
    }
    setParseError(null);
    importing.mutate(parsed, { onSuccess: ({ notebook }) => onImported(notebook.id) });
  };
  const fieldProblems = importing.error && 'fields' in importing.error ? Object.entries((importing.error as { fields: Record<string, string> }).fields) : [];
  return (
    <Card testID="import-card">
      <Text style={styles.title}>Import a notebook</Text>
      <Text style={styles.body}>Paste the contents of a .json file exported from Rungbook.</Text>
      <TextInput multiline value={text} onChangeText={setText} accessibilityLabel="Exported notebook JSON" style={styles.input} testID="import-text" />
      {parseError ? <Notice tone="error" message={parseError} testID="import-error" /> : null}
      {importing.error ? <Notice tone="error" message={[importing.error.message, ...fieldProblems.map(([path, message]) => `${path}: ${message}`)].join('\n')} testID="import-error" /> : null}
      <Button label="Import" onPress={submit} busy={importing.isPending} disabled={!text.trim()} testID="import-submit" />
    </Card>
  );
}

const styles = StyleSheet.create({
  title: { fontFamily: fonts.semibold, fontSize: 17, color: colors.ink },
  body: { fontFamily: fonts.regular, fontSize: 14, color: colors.inkSoft },
  input: { minHeight: 140, borderWidth: 1, borderColor: colors.rule, borderRadius: 6, padding: spacing.md, fontFamily: monoFont, fontSize: 12, color: colors.ink, textAlignVertical: 'top' },
});
