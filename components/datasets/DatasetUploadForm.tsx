import { useEffect, useMemo, useRef, useState } from 'react';
import { StyleSheet, Text, TextInput, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { DatasetRequestError, usePasteDatasetMutation, useUploadDatasetMutation } from '../../hooks/api/datasets';
import { DATASET_LIMITS } from '../../shared/notebook/datasets';
import { ChipButton } from '../notebook/ChipButton';
import { ChoiceRow } from '../notebook/ChoiceRow';
import { monoFont } from '../notebook/monoFont';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { AxisPicker } from './AxisPicker';
import type { ChosenFile } from './chosenFile';
import { ColumnMapping } from './ColumnMapping';
import { descriptionOf, draftForColumns, mappingOf, emptyDraft, labelFromFileName, nameFromFileName, validate, type DatasetDraft, type HeaderChoice } from './draft';
import { FileChooser } from './FileChooser';
import { checkPoints, readPreview, type TableProblems } from './readPreview';
import { RowProblems } from './RowProblems';
import { TablePreviewView } from './TablePreviewView';

const HEADER_CHOICES: { value: HeaderChoice; label: string }[] = [
  { value: 'guess', label: 'Guess' },
  { value: 'yes', label: 'Names the columns' },
  { value: 'no', label: 'Is data' },
];

const SHAPES: { value: DatasetDraft['shape']; label: string }[] = [
  { value: 'points', label: 'Points with error bars' },
  { value: 'boundary', label: 'Boundary curve' },
];

/** Server field names may come prefixed with the form part they were in. */
const fieldKey = (key: string) => key.replace(/^description\./, '');

function serverFieldErrors(error: unknown): Record<string, string> {
  if (!(error instanceof DatasetRequestError)) return {};
  return Object.fromEntries(Object.entries(error.fields).map(([key, message]) => [fieldKey(key), message]));
}

/** The file's text once read; a new file starts a new read and an old read that finishes late is dropped. */
function useFileContent(file: ChosenFile | null) {
  const [state, setState] = useState<{ file: ChosenFile; bytes: Uint8Array | null; error: string | null } | null>(null);
  useEffect(() => {
    if (!file) return setState(null);
    let current = true;
    setState({ file, bytes: null, error: null });
    file.read().then(
      (bytes) => current && setState({ file, bytes, error: null }),
      () => current && setState({ file, bytes: null, error: `${file.name} could not be read.` }),
    );
    return () => {
      current = false;
    };
  }, [file]);
  return state?.file === file ? state : null;
}

function TableProblemsView({ problems }: { problems: TableProblems }) {
  if (problems.problems.length === 0) return <Notice tone="error" message={problems.message} testID="dataset-problems" />;
  return <RowProblems title={problems.message} problems={problems.problems} problemCount={problems.problemCount} />;
}

/** Add a dataset from a file or a pasted table: preview, column mapping, axes, source and note, then one all-or-nothing upload. */
export function DatasetUploadForm({ notebookId, takenLabels }: { notebookId: string; takenLabels: string[] }) {
  const [file, setFile] = useState<ChosenFile | null>(null);
  const [pasted, setPasted] = useState('');
  const [draft, setDraft] = useState<DatasetDraft>(emptyDraft);
  const [attempted, setAttempted] = useState(false);
  const [refusal, setRefusal] = useState<string | null>(null);
  const [added, setAdded] = useState<string | null>(null);
  // What the last file's name filled in: replaced by the next file's, unless the person typed something else.
  const filledIn = useRef({ label: '', name: '' });
  const upload = useUploadDatasetMutation(notebookId);
  const paste = usePasteDatasetMutation(notebookId);
  const sending = upload.isPending || paste.isPending;
  const failure = upload.error ?? paste.error;

  const fileContent = useFileContent(file);
  const pastedTooLong = !file && pasted.length > DATASET_LIMITS.maxPastedChars;
  const content = file ? fileContent?.bytes ?? null : pasted.trim() && !pastedTooLong ? pasted : null;
  const outcome = useMemo(() => (content ? readPreview(content, draft.header, file?.name) : null), [content, draft.header, file]);
  const table = outcome && 'table' in outcome ? outcome.table : null;
  const preview = outcome && 'preview' in outcome ? outcome.preview : null;
  const points = useMemo(() => (table ? checkPoints(table, { mapping: mappingOf(draft.mapping), shape: draft.shape }) : null), [table, draft.mapping, draft.shape]);
  const columnsKey = preview ? `${file?.name ?? ''}\u0001${preview.columns.join('\u0001')}` : '';

  // A table with other columns gets a fresh guess of mapping and axes; the same table keeps what was chosen.
  useEffect(() => {
    if (preview) setDraft((current) => draftForColumns(current, preview.columns));
    // Only a change of the columns themselves re-guesses; preview is a new object on every read.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [columnsKey]);

  const description = descriptionOf(draft, preview);
  const problems = { ...(attempted ? validate(description) : {}), ...serverFieldErrors(failure) };
  const set = (change: Partial<DatasetDraft>) => setDraft((current) => ({ ...current, ...change }));
  const edited = () => {
    setAdded(null);
    upload.reset();
    paste.reset();
  };

  const chosen = (picked: ChosenFile) => {
    edited();
    setRefusal(null);
    setFile(picked);
    const fill = { label: labelFromFileName(picked.name, takenLabels), name: nameFromFileName(picked.name) };
    const previous = filledIn.current;
    setDraft((current) => ({
      ...current,
      label: current.label === previous.label ? fill.label : current.label,
      name: current.name === previous.name ? fill.name : current.name,
    }));
    filledIn.current = fill;
  };

  const submit = () => {
    setAttempted(true);
    edited();
    if (!preview || !points || 'problems' in points || Object.keys(validate(description)).length) return;
    const done = () => {
      setAdded(`Added ${description.name} (${description.label}).`);
      setFile(null);
      setPasted('');
      setDraft(emptyDraft());
      setAttempted(false);
      filledIn.current = { label: '', name: '' };
    };
    if (file) upload.mutate({ file, description }, { onSuccess: done });
    else paste.mutate({ ...description, text: pasted }, { onSuccess: done });
  };

  const tableColumn = (
    <View style={styles.column}>
      <View style={styles.sourceRow}>
        <FileChooser onChosen={chosen} onRefused={setRefusal} disabled={sending} />
        {file ? (
          <>
            <Text style={styles.fileName} testID="dataset-file-name">{file.name}</Text>
            <ChipButton label="Use a pasted table instead" onPress={() => setFile(null)} testID="dataset-file-clear" />
          </>
        ) : (
          <Text style={styles.hint}>CSV or TSV, up to {DATASET_LIMITS.maxFileBytes / (1024 * 1024)} MB and {DATASET_LIMITS.maxRows.toLocaleString('en')} rows</Text>
        )}
      </View>
      {refusal ? <Notice tone="error" message={refusal} testID="dataset-file-refused" /> : null}
      {fileContent?.error ? <Notice tone="error" message={fileContent.error} /> : null}
      {file ? null : (
        <View style={styles.field}>
          <Text style={styles.label}>…or paste a table</Text>
          <TextInput
            accessibilityLabel="Paste a table"
            multiline
            value={pasted}
            onChangeText={(value) => {
              edited();
              setPasted(value);
            }}
            placeholder={'s,nu_inv,err\n1.60,1.412,0.010\n1.70,1.331,0.012'}
            placeholderTextColor={colors.inkFaint}
            autoCapitalize="none"
            autoCorrect={false}
            style={[styles.input, styles.paste]}
            testID="dataset-paste"
          />
          {pastedTooLong ? <Text style={styles.error} testID="dataset-paste-too-long">{pasted.length.toLocaleString('en')} characters: at most {DATASET_LIMITS.maxPastedChars.toLocaleString('en')} can be pasted. Save the table as a file and choose it instead.</Text> : null}
        </View>
      )}
      {outcome ? <ChoiceRow label="First row" options={HEADER_CHOICES} value={draft.header} onChange={(header) => set({ header })} testID="dataset-header" /> : null}
      {preview ? <TablePreviewView preview={preview} /> : null}
      {outcome && 'message' in outcome ? <TableProblemsView problems={outcome} /> : null}
    </View>
  );

  const describeColumn = preview ? (
    <View style={styles.column}>
      <ColumnMapping columns={preview.columns} mapping={draft.mapping} onChange={(mapping) => set({ mapping })} errors={problems} />
      {points && 'message' in points ? <TableProblemsView problems={points} /> : null}
      {points && 'rowCount' in points ? <Text style={styles.hint} testID="dataset-points">{points.rowCount.toLocaleString('en')} points, x from {points.xRange[0]} to {points.xRange[1]}</Text> : null}
      <AxisPicker title="x-axis is" axis={draft.xAxis} onChange={(xAxis) => set({ xAxis })} error={problems['xAxis.label']} testID="dataset-x-axis" />
      <AxisPicker title="y-axis is" axis={draft.yAxis} onChange={(yAxis) => set({ yAxis })} error={problems['yAxis.label']} testID="dataset-y-axis" />
      <View testID="dataset-shape">
        <ChoiceRow label="Draw as" options={SHAPES} value={draft.shape} onChange={(shape) => set({ shape })} testID="dataset-shape" />
      </View>
      <TextField label="Label (a lower-case word cells refer to)" value={draft.label} onChangeText={(label) => set({ label })} error={problems.label} testID="dataset-label" />
      <TextField label="Name" value={draft.name} onChangeText={(name) => set({ name })} error={problems.name} testID="dataset-name" />
      <TextField label="Source (reference, method)" value={draft.source} onChangeText={(source) => set({ source })} error={problems.source} testID="dataset-source" />
      <View style={styles.field}>
        <Text style={styles.label}>Note</Text>
        <TextInput accessibilityLabel="Note" multiline value={draft.note} onChangeText={(note) => set({ note })} style={[styles.input, styles.note]} testID="dataset-note" />
        {problems.note ? <Text style={styles.error}>{problems.note}</Text> : null}
      </View>
    </View>
  ) : null;

  const serverProblems = failure instanceof DatasetRequestError && failure.problems.length ? failure : null;
  return (
    <View style={styles.form} testID="dataset-form">
      <Text style={styles.title}>Add a dataset</Text>
      <View style={styles.columns}>
        {tableColumn}
        {describeColumn}
      </View>
      {serverProblems ? <RowProblems title={`${serverProblems.message} Nothing was stored; fix the file and upload again.`} problems={serverProblems.problems} problemCount={serverProblems.problemCount} /> : null}
      {failure && !serverProblems ? <Notice tone="error" message={failure.message} testID="dataset-error" /> : null}
      {attempted && (!preview || (points && 'message' in points)) && !sending ? <Notice tone="error" message={content || pastedTooLong ? 'Nothing was sent: fix what is listed above first.' : 'Choose a file or paste a table first.'} testID="dataset-no-table" /> : null}
      {added ? <Notice tone="success" message={added} testID="dataset-added" /> : null}
      <Button label={sending ? 'Adding…' : 'Add dataset'} onPress={submit} busy={sending} disabled={file !== null && !fileContent?.bytes} testID="dataset-submit" />
    </View>
  );
}

const styles = StyleSheet.create({
  form: { gap: spacing.md },
  title: { fontFamily: fonts.semibold, fontSize: 15, color: colors.ink },
  columns: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.lg },
  column: { flexGrow: 1, flexShrink: 1, flexBasis: 300, minWidth: 0, gap: spacing.md },
  sourceRow: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: spacing.sm },
  fileName: { fontFamily: fonts.medium, fontSize: 14, color: colors.ink, flexShrink: 1 },
  hint: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint, flexShrink: 1 },
  field: { gap: spacing.xs },
  label: { fontFamily: fonts.medium, fontSize: 14, color: colors.inkSoft },
  input: { borderWidth: 1, borderColor: colors.rule, borderRadius: 6, padding: spacing.md, fontFamily: fonts.regular, fontSize: 15, color: colors.ink, backgroundColor: colors.surface, textAlignVertical: 'top' },
  paste: { minHeight: 120, fontFamily: monoFont, fontSize: 13 },
  note: { minHeight: 72 },
  error: { fontFamily: fonts.regular, fontSize: 13, color: colors.danger },
});
