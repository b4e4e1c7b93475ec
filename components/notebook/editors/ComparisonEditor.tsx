import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { AXIS_NAMES, AXIS_TEX, COMPARABLE_X_AXES, COMPARABLE_Y_AXES, DATASET_LIMITS, type AxisSpec, type CellInput, type DatasetView } from '../../../shared/notebook';
import { Formula } from '../../formula';
import { TextField } from '../../ui/TextField';
import { ChipButton } from '../ChipButton';
import { ChoiceRow } from '../ChoiceRow';
import { FieldError, optionalText, type EditorProps } from './fields';

type ComparisonInput = Extract<CellInput, { kind: 'comparison' }>;
type Quantity = (typeof COMPARABLE_Y_AXES)[number];

export interface ComparisonEditorProps extends EditorProps<ComparisonInput> {
  /** Labels of the notebook's scan cells (where the series come from); without them the label is typed. */
  scanLabels?: string[];
  /** The notebook's datasets; without them the labels are typed. */
  datasets?: DatasetView[];
}

const DECIMAL = /^\s*[+-]?(\d+\.?\d*|\.\d+)\s*$/;
const FOLLOW_DATASET = 'dataset';

const axisWords = (axis: AxisSpec) => (axis.kind === 'other' ? axis.label ?? 'its own label' : AXIS_NAMES[axis.kind]);
const isQuantity = (kind: string): kind is Quantity => (COMPARABLE_Y_AXES as readonly string[]).includes(kind);

/** Checks the schema cannot make: references to other cells and datasets, the range's order, a quantity to compare. */
export function comparisonProblems(input: ComparisonInput, scanLabels: string[] | undefined, datasets: DatasetView[] | undefined): Record<string, string> {
  const problems: Record<string, string> = {};
  if (scanLabels && scanLabels.length === 0) problems.uses = 'Add a scan cell first: its series are drawn against the data';
  else if (scanLabels && !scanLabels.includes(input.uses)) problems.uses = `There is no scan cell labelled "${input.uses}"; choose one`;
  const dataset = datasets?.find((candidate) => candidate.label === input.dataset);
  if (datasets && datasets.length === 0) problems.dataset = 'Add a dataset to this notebook first (the Data panel)';
  else if (datasets && !dataset) problems.dataset = `This notebook has no dataset labelled "${input.dataset}"; choose one`;
  else if (dataset && !(COMPARABLE_X_AXES as readonly string[]).includes(dataset.xAxis.kind)) {
    problems.dataset = `The series are functions of s at fixed d: choose a dataset whose x-axis is s or Δφ (this one's is ${axisWords(dataset.xAxis)})`;
  }
  if (dataset && !input.quantity && !isQuantity(dataset.yAxis.kind)) {
    problems.quantity = `The dataset's y-axis (${axisWords(dataset.yAxis)}) is not a series quantity: choose which one the data measures`;
  }
  const from = input.xFrom?.trim();
  const to = input.xTo?.trim();
  if (from !== undefined && !DECIMAL.test(from)) problems.xFrom = 'Enter a number, e.g. 1.6, or leave it empty';
  if (to !== undefined && !DECIMAL.test(to)) problems.xTo = 'Enter a number, e.g. 1.9, or leave it empty';
  if (from !== undefined && to !== undefined && DECIMAL.test(from) && DECIMAL.test(to) && Number(from) >= Number(to)) {
    problems.xTo = 'The end of the range must be larger than its start';
  }
  return problems;
}

export function ComparisonEditor({ input, errors, onChange, scanLabels, datasets, testPrefix }: ComparisonEditorProps) {
  const dataset = datasets?.find((candidate) => candidate.label === input.dataset);
  const problems = { ...comparisonProblems(input, scanLabels, datasets), ...errors };
  const shape = input.show ?? dataset?.shape ?? 'points';
  const xName = dataset ? axisWords(dataset.xAxis) : 'x';
  const tooMany = dataset && dataset.rowCount > DATASET_LIMITS.maxComparedPoints && !input.xFrom && !input.xTo;
  const change = (patch: Partial<ComparisonInput>) => onChange({ ...input, ...patch });
  return (
    <View style={styles.form}>
      <LabelChoice
        label="Series from the scan cell"
        value={input.uses}
        labels={scanLabels?.map((label) => ({ value: label, label }))}
        onChange={(uses) => change({ uses })}
        error={problems.uses}
        testID={`${testPrefix}-uses`}
      />
      <LabelChoice
        label="Dataset"
        value={input.dataset}
        labels={datasets?.map((candidate) => ({ value: candidate.label, label: `${candidate.name} (${candidate.label})` }))}
        onChange={(label) => {
          const chosen = datasets?.find((candidate) => candidate.label === label);
          change({ dataset: label, show: undefined, kinks: chosen ? chosen.shape === 'boundary' : input.kinks });
        }}
        error={problems.dataset}
        testID={`${testPrefix}-dataset`}
      />
      {dataset ? (
        <Text style={styles.hint} testID={`${testPrefix}-dataset-facts`}>
          {axisWords(dataset.yAxis)} against {xName}, {dataset.rowCount.toLocaleString('en')} rows, {xName} from {dataset.xRange[0]} to {dataset.xRange[1]}
          {dataset.source ? ` · ${dataset.source}` : ''}
        </Text>
      ) : null}
      <QuantityChoice input={input} dataset={dataset} onChange={(quantity) => change({ quantity })} error={problems.quantity} testID={`${testPrefix}-quantity`} />
      <ChoiceRow
        label="Draw the data as"
        options={[
          { value: 'points', label: 'points with error bars' },
          { value: 'boundary', label: 'a boundary curve' },
        ]}
        value={shape}
        onChange={(show) => change({ show, kinks: show === 'boundary' ? input.kinks : false })}
        testID={`${testPrefix}-show`}
      />
      {shape === 'boundary' ? (
        <View style={styles.group}>
          <ChipButton label={input.kinks ? 'Find kinks: on' : 'Find kinks: off'} selected={input.kinks} onPress={() => change({ kinks: !input.kinks })} testID={`${testPrefix}-kinks`} />
          <Text style={styles.hint}>Smooths the boundary and marks where it bends sharply, with an uncertainty from resampling.</Text>
        </View>
      ) : null}
      <View style={styles.pair}>
        <View style={styles.half}>
          <TextField label={`Compare from ${xName} =`} value={input.xFrom ?? ''} onChangeText={(value) => change({ xFrom: optionalText(value) })} error={problems.xFrom} hint="Optional" keyboardType="decimal-pad" testID={`${testPrefix}-xFrom`} />
        </View>
        <View style={styles.half}>
          <TextField label={`to ${xName} =`} value={input.xTo ?? ''} onChangeText={(value) => change({ xTo: optionalText(value) })} error={problems.xTo} hint="Optional" keyboardType="decimal-pad" testID={`${testPrefix}-xTo`} />
        </View>
      </View>
      {tooMany ? (
        <Text style={styles.warning} testID={`${testPrefix}-range-needed`}>
          This dataset has {dataset.rowCount.toLocaleString('en')} rows; a comparison takes at most {DATASET_LIMITS.maxComparedPoints.toLocaleString('en')}. Choose a range of {xName}.
        </Text>
      ) : null}
    </View>
  );
}

/** A choice among labels when they are known, a text field when they are not; a missing label stays visible. */
function LabelChoice({ label, value, labels, onChange, error, testID }: {
  label: string;
  value: string;
  labels?: { value: string; label: string }[];
  onChange: (value: string) => void;
  error?: string;
  testID: string;
}) {
  if (!labels || labels.length === 0) return <TextField label={label} value={value} onChangeText={onChange} error={error} testID={testID} />;
  const options = labels.some((option) => option.value === value) || !value ? labels : [...labels, { value, label: `${value} (missing)` }];
  return (
    <View style={styles.group}>
      <ChoiceRow label={label} options={options} value={value} onChange={onChange} testID={testID} />
      {error ? <FieldError message={error} testID={`${testID}-error`} /> : null}
    </View>
  );
}

function QuantityChoice({ input, dataset, onChange, error, testID }: {
  input: ComparisonInput;
  dataset?: DatasetView;
  onChange: (quantity: Quantity | undefined) => void;
  error?: string;
  testID: string;
}) {
  const fromDataset = dataset && isQuantity(dataset.yAxis.kind) ? dataset.yAxis.kind : undefined;
  const options = [
    ...(fromDataset ? [{ value: FOLLOW_DATASET, label: `the dataset's y-axis (${AXIS_NAMES[fromDataset]})` }] : []),
    ...COMPARABLE_Y_AXES.map((quantity) => ({ value: quantity as string, label: AXIS_NAMES[quantity] })),
  ];
  const compared = input.quantity ?? fromDataset;
  return (
    <View style={styles.group}>
      <ChoiceRow
        label="Quantity the data measures"
        options={options}
        value={input.quantity ?? (fromDataset ? FOLLOW_DATASET : '')}
        onChange={(value) => onChange(value === FOLLOW_DATASET ? undefined : (value as Quantity))}
        testID={testID}
      />
      {compared ? (
        <View style={styles.typeset} testID={`${testID}-shown`}>
          <Text style={styles.hint}>Compared:</Text>
          <Formula tex={AXIS_TEX[compared]} label={AXIS_NAMES[compared]} />
        </View>
      ) : null}
      {error ? <FieldError message={error} testID={`${testID}-error`} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  form: { gap: spacing.md },
  group: { gap: spacing.xs, alignItems: 'flex-start' },
  pair: { flexDirection: 'row', gap: spacing.md },
  half: { flex: 1 },
  typeset: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm },
  hint: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  warning: { fontFamily: fonts.medium, fontSize: 13, color: colors.amberDeep },
});
