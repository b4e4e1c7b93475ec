import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { spacing } from '../../constants/theme';
import { useSaveVersionMutation } from '../../hooks/api/notebooks';
import { saveVersionInput } from '../../shared/notebook';
import { checkLocally } from '../auth/formErrors';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { ChipButton } from './ChipButton';

export function SaveVersionForm({ notebookId, onSaved }: { notebookId: string; onSaved?: () => void }) {
  const [message, setMessage] = useState('');
  const [error, setError] = useState<string | undefined>();
  const save = useSaveVersionMutation(notebookId);
  const submit = () => {
    const { data, errors } = checkLocally(saveVersionInput, { message });
    setError(errors.fields.message);
    if (!data) return;
    save.mutate(data.message, {
      onSuccess: () => {
        setMessage('');
        onSaved?.();
      },
    });
  };
  return (
    <View style={styles.form}>
      <TextField label="What this version is" value={message} onChangeText={setMessage} error={error} onSubmitEditing={submit} testID="version-message" />
      <View style={styles.row}>
        <ChipButton label={save.isPending ? 'Saving…' : 'Save version'} tone="accent" disabled={save.isPending} onPress={submit} testID="version-save" />
      </View>
      {save.isSuccess ? <Notice tone="success" message={`Saved as version ${save.data.version.number}.`} testID="version-saved" /> : null}
      {save.isError ? <Notice tone="error" message={save.error.message} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  form: { gap: spacing.sm },
  row: { flexDirection: 'row', gap: spacing.sm },
});
