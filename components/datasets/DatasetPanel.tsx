import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import type { NotebookDetail } from '../../shared/notebook';
import { DatasetList } from './DatasetList';
import { DatasetUploadForm } from './DatasetUploadForm';

/** The notebook's Data panel: its datasets, and for editors the form that adds one. */
export function DatasetPanel({ notebook, onCellAdded }: { notebook: NotebookDetail; onCellAdded?: (cellId: string) => void }) {
  const datasets = notebook.datasets ?? [];
  return (
    <View style={styles.panel} testID="dataset-panel">
      <Text style={styles.title}>Data</Text>
      <DatasetList notebook={notebook} onCellAdded={onCellAdded} />
      {notebook.canEdit ? <DatasetUploadForm notebookId={notebook.id} takenLabels={datasets.map((dataset) => dataset.label)} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  panel: { gap: spacing.md, padding: spacing.lg, borderRadius: 8, borderWidth: 1, borderColor: colors.rule, backgroundColor: colors.surface },
  title: { fontFamily: fonts.semibold, fontSize: 17, color: colors.ink },
});
