import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { fetchDatasetCsv, useRemoveDatasetMutation } from '../../hooks/api/datasets';
import { useAddCellMutation } from '../../hooks/api/notebooks';
import type { CellView, NotebookDetail } from '../../shared/notebook';
import { COMPARABLE_X_AXES, type DatasetView } from '../../shared/notebook/datasets';
import { freshLabel } from '../notebook/cellDefaults';
import { ChipButton } from '../notebook/ChipButton';
import { monoFont } from '../notebook/monoFont';
import { saveTextFile } from '../notebook/saveFile';
import { Notice } from '../ui/Notice';
import { AxisName } from './AxisName';

const ERROR_NAMES: Record<DatasetView['hasYErrors'], string> = { none: 'no y-errors', symmetric: '± y-errors', asymmetric: 'lower & upper y-errors' };

export function datasetFacts(dataset: DatasetView): string {
  const rows = `${dataset.rowCount.toLocaleString('en')} ${dataset.rowCount === 1 ? 'row' : 'rows'}`;
  const shape = dataset.shape === 'boundary' ? 'boundary curve' : 'points';
  const xErrors = dataset.hasXErrors ? ', x-errors' : '';
  return `${rows} · x from ${dataset.xRange[0]} to ${dataset.xRange[1]} · ${shape}, ${ERROR_NAMES[dataset.hasYErrors]}${xErrors}`;
}

const addedOn = (iso: string) => iso.slice(0, 10);

/** The scan whose series a new comparison overlays: the first in the notebook. */
export const firstScan = (cells: CellView[]) => cells.find((cell) => cell.kind === 'scan') ?? null;

interface RowProps {
  notebook: NotebookDetail;
  dataset: DatasetView;
  onCellAdded?: (cellId: string) => void;
}

function DatasetRow({ notebook, dataset, onCellAdded }: RowProps) {
  const [confirming, setConfirming] = useState(false);
  const [message, setMessage] = useState<{ tone: 'error' | 'info'; text: string } | null>(null);
  const remove = useRemoveDatasetMutation(notebook.id);
  const addCell = useAddCellMutation(notebook.id);
  const id = `dataset-${dataset.label}`;
  const comparable = (COMPARABLE_X_AXES as readonly string[]).includes(dataset.xAxis.kind);

  const download = async () => {
    setMessage(null);
    try {
      await saveTextFile(`${dataset.label}.csv`, await fetchDatasetCsv(notebook.id, dataset.id), 'text/csv');
    } catch (error) {
      setMessage({ tone: 'error', text: error instanceof Error ? error.message : 'The download failed.' });
    }
  };

  const compare = () => {
    const scan = firstScan(notebook.cells);
    if (!scan) return setMessage({ tone: 'info', text: 'This notebook has no scan over s yet: add one, run it, then compare its series with this dataset.' });
    setMessage(null);
    const label = freshLabel('comparison', notebook.cells);
    addCell.mutate(
      { label, input: { kind: 'comparison', uses: scan.label, dataset: dataset.label, kinks: dataset.shape === 'boundary' } },
      { onSuccess: ({ notebook: updated }) => {
        const created = updated.cells.find((cell) => cell.label === label);
        if (created) onCellAdded?.(created.id);
      } },
    );
  };

  return (
    <View style={styles.row} testID={id}>
      <View style={styles.titleRow}>
        <Text style={styles.name}>{dataset.name}</Text>
        <Text style={styles.label}>{dataset.label}</Text>
      </View>
      <View style={styles.axes} testID={`${id}-axes`}>
        <AxisName axis={dataset.yAxis} style={styles.meta} />
        <Text style={styles.meta}>against</Text>
        <AxisName axis={dataset.xAxis} style={styles.meta} />
      </View>
      <Text style={styles.meta}>{datasetFacts(dataset)}</Text>
      {dataset.source ? <Text style={styles.meta}>Source: {dataset.source}</Text> : null}
      {dataset.note ? <Text style={styles.note}>{dataset.note}</Text> : null}
      <Text style={styles.faint}>Added by {dataset.createdByName} on {addedOn(dataset.createdAt)}{dataset.fileName ? ` from ${dataset.fileName}` : ''}</Text>
      <View style={styles.actions}>
        <ChipButton label="Download CSV" onPress={() => void download()} testID={`${id}-download`} />
        {notebook.canEdit && comparable ? <ChipButton label={addCell.isPending ? 'Adding…' : 'Compare with a scan'} tone="accent" disabled={addCell.isPending} onPress={compare} testID={`${id}-compare`} /> : null}
        {notebook.canEdit && !confirming ? <ChipButton label="Remove" tone="danger" onPress={() => setConfirming(true)} testID={`${id}-remove`} /> : null}
      </View>
      {notebook.canEdit && !comparable ? <Text style={styles.faint}>Series are compared along s or Δφ; this dataset's x-axis is neither.</Text> : null}
      {confirming ? (
        <View style={styles.confirm} testID={`${id}-remove-question`}>
          <Text style={styles.meta}>Remove {dataset.name} from the notebook? Comparison cells that use it stop working; saved versions keep it.</Text>
          <View style={styles.actions}>
            <ChipButton label={remove.isPending ? 'Removing…' : 'Yes, remove'} tone="danger" disabled={remove.isPending} onPress={() => remove.mutate(dataset.id, { onSuccess: () => setConfirming(false) })} testID={`${id}-remove-confirm`} />
            <ChipButton label="Keep it" disabled={remove.isPending} onPress={() => setConfirming(false)} testID={`${id}-remove-cancel`} />
          </View>
        </View>
      ) : null}
      {remove.isError ? <Notice tone="error" message={remove.error.message} /> : null}
      {addCell.isError ? <Notice tone="error" message={addCell.error.message} /> : null}
      {message ? <Notice tone={message.tone} message={message.text} testID={`${id}-message`} /> : null}
    </View>
  );
}

/** The notebook's datasets; everyone with access may download them, editors remove them or compare them with a scan. */
export function DatasetList({ notebook, onCellAdded }: { notebook: NotebookDetail; onCellAdded?: (cellId: string) => void }) {
  const datasets = notebook.datasets ?? [];
  if (datasets.length === 0) return <Text style={styles.faint} testID="dataset-none">No datasets yet.{notebook.canEdit ? ' Add a CSV or TSV file or paste a table below.' : ''}</Text>;
  return (
    <View style={styles.list} testID="dataset-list">
      {datasets.map((dataset) => (
        <DatasetRow key={dataset.id} notebook={notebook} dataset={dataset} onCellAdded={onCellAdded} />
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: spacing.md },
  row: { gap: spacing.xs, paddingBottom: spacing.md, borderBottomWidth: 1, borderBottomColor: colors.rule },
  titleRow: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'baseline', gap: spacing.sm },
  name: { fontFamily: fonts.semibold, fontSize: 15, color: colors.ink, flexShrink: 1 },
  label: { fontFamily: monoFont, fontSize: 13, color: colors.amberDeep },
  axes: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: spacing.xs },
  meta: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkSoft },
  note: { fontFamily: fonts.regular, fontSize: 13, color: colors.ink },
  faint: { fontFamily: fonts.regular, fontSize: 12, color: colors.inkFaint },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm, marginTop: spacing.xs },
  confirm: { gap: spacing.xs },
});
