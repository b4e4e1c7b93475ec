import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useUpdateNotebookMutation } from '../../hooks/api/notebooks';
import { updateNotebookInput, type NotebookDetail } from '../../shared/notebook';
import { checkLocally, errorsFromServer, type FormErrors } from '../auth/formErrors';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { RoleBadge } from '../sharing/RoleBadge';
import { ChipButton } from './ChipButton';

function sharedByWords(sharedBy: NotebookDetail['sharedBy']): string | null {
  if (!sharedBy) return null;
  const via = sharedBy.groupName ? `through ${sharedBy.groupName}` : null;
  const by = sharedBy.personName ? `shared with you by ${sharedBy.personName}` : 'shared with you';
  return [by, via].filter(Boolean).join(' ');
}

/** The notebook's title and summary, editable in place by those who may edit. */
export function NotebookTitle({ notebook }: { notebook: NotebookDetail }) {
  const [editing, setEditing] = useState(false);
  const [title, setTitle] = useState(notebook.title);
  const [summary, setSummary] = useState(notebook.summary);
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const update = useUpdateNotebookMutation(notebook.id);
  const owner = [notebook.ownerName, notebook.groupName, sharedByWords(notebook.sharedBy)].filter(Boolean).join(' · ');
  const save = () => {
    const { data, errors: local } = checkLocally(updateNotebookInput, { title, summary });
    setErrors(local);
    if (!data) return;
    update.mutate(data, { onSuccess: () => setEditing(false), onError: (error) => setErrors(errorsFromServer(error)) });
  };
  if (editing) {
    return (
      <View style={styles.form}>
        {errors.message ? <Notice tone="error" message={errors.message} /> : null}
        <TextField label="Title" value={title} onChangeText={setTitle} error={errors.fields.title} testID="notebook-title-field" />
        <TextField label="Summary" value={summary} onChangeText={setSummary} error={errors.fields.summary} testID="notebook-summary-field" />
        <View style={styles.row}>
          <ChipButton label="Save" tone="accent" onPress={save} testID="notebook-title-save" />
          <ChipButton label="Cancel" onPress={() => setEditing(false)} />
        </View>
      </View>
    );
  }
  return (
    <View style={styles.header}>
      <View style={styles.text}>
        <View style={styles.titleRow}>
          <Text style={styles.title} accessibilityRole="header" testID="notebook-title">{notebook.title}</Text>
          <RoleBadge role={notebook.role} testID="role-badge" />
        </View>
        {notebook.summary ? <Text style={styles.summary}>{notebook.summary}</Text> : null}
        <Text style={styles.meta}>{owner}</Text>
      </View>
      {notebook.canEdit ? (
        <ChipButton label="Rename" onPress={() => { setTitle(notebook.title); setSummary(notebook.summary); setEditing(true); }} testID="notebook-rename" />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  header: { flexDirection: 'row', alignItems: 'flex-start', justifyContent: 'space-between', gap: spacing.md },
  text: { flexShrink: 1, gap: spacing.xs },
  titleRow: { flexDirection: 'row', alignItems: 'center', flexWrap: 'wrap', columnGap: spacing.sm, rowGap: spacing.xs },
  title: { fontFamily: fonts.semibold, fontSize: 26, color: colors.ink },
  summary: { fontFamily: fonts.regular, fontSize: 15, color: colors.inkSoft, lineHeight: 22 },
  meta: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  form: { gap: spacing.md },
  row: { flexDirection: 'row', gap: spacing.sm },
});
