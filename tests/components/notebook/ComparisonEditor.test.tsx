import { useState } from 'react';
import { fireEvent, render, screen } from '@testing-library/react-native';
import { defaultInput } from '../../../components/notebook/cellDefaults';
import { cellSummary } from '../../../components/notebook/cellSummary';
import { CellEditor } from '../../../components/notebook/editors/CellEditor';
import { cellFieldErrors } from '../../../components/notebook/fieldErrors';
import type { CellInput, DatasetView } from '../../../shared/notebook';

jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});

type ComparisonInput = Extract<CellInput, { kind: 'comparison' }>;

/** Invented datasets: names, sources and ranges made up for the test. */
function dataset(overrides: Partial<DatasetView>): DatasetView {
  return {
    id: 'd1', label: 'lattice', name: 'Invented lattice exponents', source: 'invented Monte Carlo', note: '', shape: 'points',
    xAxis: { kind: 's' }, yAxis: { kind: 'eta' }, hasYErrors: 'symmetric', hasXErrors: false, rowCount: 12,
    xRange: ['1.55', '1.95'], yRange: ['0.05', '0.45'], fileName: 'lattice.csv', contentHash: 'h1',
    createdAt: '2026-01-01T00:00:00Z', createdByName: 'Invented Lead', ...overrides,
  };
}

const lattice = dataset({});
const bound = dataset({ id: 'd2', label: 'bound', name: 'Invented bound', shape: 'boundary', xAxis: { kind: 'Delta_phi' }, yAxis: { kind: 'Delta_phi2' }, hasYErrors: 'none', rowCount: 120 });
const tabulated = dataset({ id: 'd3', label: 'other_y', name: 'Invented other', yAxis: { kind: 'other', label: 'energy gap' } });
const inD = dataset({ id: 'd4', label: 'in_d', name: 'Invented against d', xAxis: { kind: 'd' } });
const huge = dataset({ id: 'd5', label: 'huge', name: 'Invented large', rowCount: 80_000 });

const start: ComparisonInput = { kind: 'comparison', uses: 'scan', dataset: 'lattice', kinks: false };

/** The editor as a cell card holds it: the draft in state, field errors from the cell schema. */
function Harness({ initial, scanLabels = ['scan', 'scan2'], datasets = [lattice, bound, tabulated, inD, huge], onInput }: {
  initial: ComparisonInput;
  scanLabels?: string[];
  datasets?: DatasetView[];
  onInput?: (input: CellInput) => void;
}) {
  const [input, setInput] = useState<CellInput>(initial);
  return (
    <CellEditor
      input={input}
      errors={cellFieldErrors('cmp', input)}
      onChange={(next) => {
        setInput(next);
        onInput?.(next);
      }}
      setupLabels={['setup']}
      scanLabels={scanLabels}
      datasets={datasets}
      testPrefix="cell-cmp-field"
    />
  );
}

describe('ComparisonEditor', () => {
  it('picks the scan cell and the dataset; a boundary dataset turns the kink locator on', () => {
    const onInput = jest.fn();
    render(<Harness initial={start} onInput={onInput} />);
    fireEvent.press(screen.getByTestId('cell-cmp-field-uses-scan2'));
    expect(onInput).toHaveBeenLastCalledWith({ ...start, uses: 'scan2' });
    fireEvent.press(screen.getByTestId('cell-cmp-field-dataset-bound'));
    expect(onInput).toHaveBeenLastCalledWith({ ...start, uses: 'scan2', dataset: 'bound', show: undefined, kinks: true });
    expect(screen.getByTestId('cell-cmp-field-kinks')).toHaveTextContent('Find kinks: on');
    expect(screen.getByTestId('cell-cmp-field-dataset-facts')).toHaveTextContent('Δφ² against Δφ, 120 rows, Δφ from 1.55 to 1.95', { exact: false });
  });

  it('offers kinks only for a boundary, and drawing a boundary as points turns them off', () => {
    const onInput = jest.fn();
    render(<Harness initial={{ ...start, dataset: 'bound', kinks: true }} onInput={onInput} />);
    expect(screen.getByTestId('cell-cmp-field-kinks')).toBeTruthy();
    fireEvent.press(screen.getByTestId('cell-cmp-field-show-points'));
    expect(onInput).toHaveBeenLastCalledWith({ ...start, dataset: 'bound', show: 'points', kinks: false });
    expect(screen.queryByTestId('cell-cmp-field-kinks')).toBeNull();
  });

  it("defaults the quantity to the dataset's y-axis and shows it typeset", () => {
    const onInput = jest.fn();
    render(<Harness initial={start} onInput={onInput} />);
    expect(screen.getByTestId('cell-cmp-field-quantity-dataset')).toHaveTextContent("the dataset's y-axis (η)");
    expect(screen.getByTestId('cell-cmp-field-quantity-dataset').props.accessibilityState.selected).toBe(true);
    // AXIS_TEX of eta (shared/notebook/datasets.ts).
    expect(screen.getByTestId('cell-cmp-field-quantity-shown')).toHaveTextContent('Compared:\\eta');
    fireEvent.press(screen.getByTestId('cell-cmp-field-quantity-nuInv'));
    expect(onInput).toHaveBeenLastCalledWith({ ...start, quantity: 'nuInv' });
    expect(screen.getByTestId('cell-cmp-field-quantity-shown')).toHaveTextContent('Compared:1/\\nu');
  });

  it('asks for a quantity when the y-axis is not a series quantity, and refuses an x-axis other than s or Δφ', () => {
    const first = render(<Harness initial={{ ...start, dataset: 'other_y' }} />);
    expect(screen.getByTestId('cell-cmp-field-quantity-error')).toHaveTextContent("The dataset's y-axis (energy gap) is not a series quantity: choose which one the data measures");
    first.unmount();
    render(<Harness initial={{ ...start, dataset: 'in_d' }} />);
    expect(screen.getByTestId('cell-cmp-field-dataset-error')).toHaveTextContent(/x-axis is s or Δφ \(this one's is d\)/);
  });

  it('checks the x-range as it is typed: numbers, and the start below the end', () => {
    render(<Harness initial={start} />);
    fireEvent.changeText(screen.getByTestId('cell-cmp-field-xFrom'), '1.9x');
    expect(screen.getByTestId('cell-cmp-field-xFrom-error')).toHaveTextContent('Enter a decimal number, e.g. 1.75');
    fireEvent.changeText(screen.getByTestId('cell-cmp-field-xFrom'), '1.9');
    expect(screen.queryByTestId('cell-cmp-field-xFrom-error')).toBeNull();
    fireEvent.changeText(screen.getByTestId('cell-cmp-field-xTo'), '1.6');
    expect(screen.getByTestId('cell-cmp-field-xTo-error')).toHaveTextContent('The end of the range must be larger than its start');
    fireEvent.changeText(screen.getByTestId('cell-cmp-field-xTo'), '1.95');
    expect(screen.queryByTestId('cell-cmp-field-xTo-error')).toBeNull();
    fireEvent.changeText(screen.getByTestId('cell-cmp-field-xTo'), '');
    expect(screen.queryByTestId('cell-cmp-field-xTo-error')).toBeNull();
  });

  it('asks for a range when the dataset is larger than a comparison takes', () => {
    render(<Harness initial={{ ...start, dataset: 'huge' }} />);
    // DATASET_LIMITS.maxComparedPoints is 5000 (shared/notebook/datasets.ts).
    expect(screen.getByTestId('cell-cmp-field-range-needed')).toHaveTextContent('This dataset has 80,000 rows; a comparison takes at most 5,000. Choose a range of s.');
    fireEvent.changeText(screen.getByTestId('cell-cmp-field-xFrom'), '1.6');
    expect(screen.queryByTestId('cell-cmp-field-range-needed')).toBeNull();
  });

  it('says what is missing when there is no scan cell and names a dataset that is gone', () => {
    render(<Harness initial={{ ...start, dataset: 'removed' }} scanLabels={[]} />);
    expect(screen.getByTestId('cell-cmp-field-uses-error')).toHaveTextContent('Add a scan cell first: its series are drawn against the data');
    expect(screen.getByTestId('cell-cmp-field-dataset-removed')).toHaveTextContent('removed (missing)');
    expect(screen.getByTestId('cell-cmp-field-dataset-error')).toHaveTextContent('This notebook has no dataset labelled "removed"; choose one');
  });

  it('starts a new comparison on the last scan cell and dataset above it, with kinks for a boundary', () => {
    const cells = [{ label: 'setup', kind: 'setup' as const }, { label: 'scan', kind: 'scan' as const }, { label: 'scan2', kind: 'scan' as const }];
    const input = defaultInput('comparison', cells, [lattice, bound]);
    expect(input).toEqual({ kind: 'comparison', uses: 'scan2', dataset: 'bound', kinks: true });
    expect(cellFieldErrors('comparison', input)).toEqual({});
    expect(cellSummary({ ...start, quantity: 'eta', xFrom: '1.6', kinks: true })).toBe('η of scan against dataset lattice, x from 1.6 to end, with kinks');
  });

  it('falls back to typed labels, without claiming anything is missing, when the notebook lists are not given', () => {
    const onChange = jest.fn();
    render(<CellEditor input={start} errors={{}} onChange={onChange} setupLabels={[]} testPrefix="cell-cmp-field" />);
    expect(screen.getByTestId('cell-cmp-field-uses').props.value).toBe('scan');
    expect(screen.getByTestId('cell-cmp-field-dataset').props.value).toBe('lattice');
    expect(screen.queryByTestId('cell-cmp-field-uses-error')).toBeNull();
    expect(screen.queryByTestId('cell-cmp-field-dataset-error')).toBeNull();
    fireEvent.changeText(screen.getByTestId('cell-cmp-field-dataset'), 'bound');
    expect(onChange).toHaveBeenLastCalledWith({ ...start, dataset: 'bound', show: undefined, kinks: false });
  });
});
