import { fireEvent, screen } from '@testing-library/react-native';
import { CellCard } from '../../../../components/notebook/CellCard';
import type { CellInput, CellView, NotebookDetail } from '../../../../shared/notebook';
import { renderWithQueryClient } from '../../testUtils';

jest.mock('../../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
jest.mock('d3-scale', () => ({ scaleLinear: jest.fn() }));
jest.mock('d3-shape', () => ({ line: jest.fn() }));

function cell(id: string, label: string, input: CellInput, dependents: string[] = []): CellView {
  return { id, position: 0, label, kind: input.kind, input, revision: 1, state: input.kind === 'setup' || input.kind === 'note' ? 'text' : 'never-run', dependents, lastRun: null, updatedAt: '2026-01-01T00:00:00Z' };
}

function notebookWith(cells: CellView[]): NotebookDetail {
  return { id: 'nb1', title: 'Invented check', summary: '', ownerId: 'u1', ownerName: 'Invented Lead', groupId: null, groupName: null, cellCount: cells.length, updatedAt: '2026-01-01T00:00:00Z', role: 'owner', sharedBy: null, canEdit: true, cells, datasets: [] };
}

const setupAt = (d: string) => cell('c1', 'params', { kind: 'setup', model: { preset: 'on', N: 1 }, d, s: '1.75', loops: 2, digits: 30 }, ['scan']);
const scan = cell('c2', 'scan', { kind: 'scan', uses: 'params', from: '1.55', to: '1.95', points: 41, quantities: ['nuInv', 'eta'] });
const integral = cell('c3', 'integral', { kind: 'integral', form: 'bubble', a: 's/2', b: 's/2', d: '2*s - eps', order: 2 });

/** The cell's editor, open as for a cell just added. */
function openEditor(target: CellView, cells: CellView[]) {
  renderWithQueryClient(<CellCard notebook={notebookWith(cells)} cell={target} index={cells.indexOf(target)} wide selected={false} onSelect={jest.fn()} startEditing />);
}

const type = (testID: string, text: string) => fireEvent.changeText(screen.getByTestId(testID), text);
const messageOf = (testID: string) => screen.getByTestId(`${testID}-error`);
const saveButton = (label: string) => screen.getByTestId(`cell-${label}-save`);

/** Wording of the validator itself (e.g. "Too big: expected number to be <=12"), which the fields must never show. */
const RAW_VALIDATOR_TEXT = /Too (small|big)|expected|Invalid input|must be less than or equal/i;

function shownMessages(): string[] {
  return screen.queryAllByRole('alert').map((node) => String(node.props.children));
}

beforeEach(() => {
  global.fetch = jest.fn();
});

describe('a scan range is checked against the window d/2 < s ≤ 2 as it is typed', () => {
  it('states the window of its model & parameters cell beside the start of the range', () => {
    openEditor(scan, [setupAt('3'), scan]);
    // d = 3: d/2 = 3/2 = 1.5 (docs/physics.md §3, long-range window d/2 < s ≤ 2).
    expect(screen.getByText('d = 3: s in (1.5, 2]')).toBeTruthy();
  });

  it('refuses a start at or below d/2, with the reason', () => {
    openEditor(scan, [setupAt('3'), scan]);
    type('cell-scan-field-from', '1.5');
    expect(messageOf('cell-scan-field-from')).toHaveTextContent('s must lie in (d/2, 2] = (1.5, 2]: at s ≤ 1.5 the model is mean-field, with no ε-expansion');
    expect(saveButton('scan')).toBeDisabled();
    type('cell-scan-field-from', '1.51');
    expect(screen.queryByTestId('cell-scan-field-from-error')).toBeNull();
    expect(saveButton('scan')).not.toBeDisabled();
  });

  it('uses the d of the setup it refers to: d = 2.5 puts the window at (1.25, 2]', () => {
    openEditor(scan, [setupAt('2.5'), scan]);
    // 2.5/2 = 1.25, so 1.25 is refused and 1.3 accepted.
    type('cell-scan-field-from', '1.25');
    expect(messageOf('cell-scan-field-from')).toHaveTextContent(/\(1\.25, 2\]/);
    type('cell-scan-field-from', '1.3');
    expect(screen.queryByTestId('cell-scan-field-from-error')).toBeNull();
  });

  it('refuses an end beyond 2', () => {
    openEditor(scan, [setupAt('3'), scan]);
    type('cell-scan-field-to', '2.1');
    expect(messageOf('cell-scan-field-to')).toHaveTextContent('s lies in (0, 2]: s = 2 is the short-range theory');
    type('cell-scan-field-to', '2');
    expect(screen.queryByTestId('cell-scan-field-to-error')).toBeNull();
  });

  it('refuses a reversed range, even while another field is wrong too', () => {
    openEditor(scan, [setupAt('3'), scan]);
    type('cell-scan-field-points', '1');
    type('cell-scan-field-from', '1.9');
    type('cell-scan-field-to', '1.6');
    expect(messageOf('cell-scan-field-to')).toHaveTextContent('The end of the range must be larger than its start');
    expect(messageOf('cell-scan-field-points')).toHaveTextContent('At least 2 points');
    expect(saveButton('scan')).toBeDisabled();
  });

  it('says when d leaves no window at all', () => {
    openEditor(scan, [setupAt('4'), scan]);
    // d = 4: d/2 = 2, so (d/2, 2] is empty.
    expect(messageOf('cell-scan-field-from')).toHaveTextContent('With d = 4 no s is left in (d/2, 2]: the long-range window needs d < 4');
  });

  it('asks for at least one quantity and at most six', () => {
    openEditor(scan, [setupAt('3'), scan]);
    fireEvent.press(screen.getByTestId('cell-scan-field-q-nuInv'));
    fireEvent.press(screen.getByTestId('cell-scan-field-q-eta'));
    expect(screen.getByTestId('cell-scan-field-quantities-error')).toHaveTextContent('Pick at least one quantity');
    for (const quantity of ['nuInv', 'nu', 'eta', 'gamma', 'omega', 'Delta_phi2', 'Delta_phi4']) fireEvent.press(screen.getByTestId(`cell-scan-field-q-${quantity}`));
    expect(screen.getByTestId('cell-scan-field-quantities-error')).toHaveTextContent('Pick at most 6 quantities');
  });
});

describe('field limits speak the product’s words', () => {
  it('the loop integral’s order names its range', () => {
    openEditor(integral, [integral]);
    type('cell-integral-field-order', '13');
    expect(messageOf('cell-integral-field-order')).toHaveTextContent('The order is a whole number from 0 to 12');
    type('cell-integral-field-order', 'two');
    expect(messageOf('cell-integral-field-order')).toHaveTextContent('Enter a whole number');
    type('cell-integral-field-d', '');
    expect(messageOf('cell-integral-field-d')).toHaveTextContent('Give d, e.g. 2*s - eps');
  });

  it('N of O(N) takes a number or N, and says so', () => {
    const setup = setupAt('3');
    openEditor(setup, [setup]);
    type('cell-params-field-N', 'M');
    expect(messageOf('cell-params-field-N')).toHaveTextContent('Enter a number (e.g. 3, 0.5, −1) or N');
    type('cell-params-field-N', 'N');
    expect(screen.queryByTestId('cell-params-field-N-error')).toBeNull();
  });

  it('no message anywhere reads like the validator', () => {
    const setup = setupAt('3');
    openEditor(setup, [setup]);
    type('cell-params-field-digits', '3');
    type('cell-params-field-s', '3');
    type('cell-params-field-d', '-1');
    type('cell-params-field-label', 'Params');
    const messages = shownMessages();
    expect(messages).toEqual(expect.arrayContaining(['At least 5 digits', 's must lie in (0, 2]: s = 2 is the short-range theory', 'd must be positive']));
    for (const message of messages) expect(message).not.toMatch(RAW_VALIDATOR_TEXT);
  });
});
