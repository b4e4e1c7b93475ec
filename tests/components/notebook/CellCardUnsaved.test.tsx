import { QueryClientProvider } from '@tanstack/react-query';
import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import type { ReactElement } from 'react';
import { SafeAreaProvider } from 'react-native-safe-area-context';
import { Text } from 'react-native';
import { CellCard } from '../../../components/notebook/CellCard';
import { ChipButton } from '../../../components/notebook/ChipButton';
import { UnsavedEdits, UnsavedEditsProvider, useUnsavedEdits, useUnsavedPrompt } from '../../../components/notebook/unsavedEdits';
import type { CellView, NotebookDetail } from '../../../shared/notebook';
import { mockFetchOnce, renderWithQueryClient } from '../testUtils';

jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
jest.mock('d3-scale', () => ({ scaleLinear: jest.fn() }));
jest.mock('d3-shape', () => ({ line: jest.fn() }));

const setupInput = { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 30 } as const;

function cell(overrides: Partial<CellView>): CellView {
  return { id: 'c1', position: 0, label: 'params', kind: 'setup', input: setupInput, revision: 1, state: 'text', dependents: ['exponents'], lastRun: null, updatedAt: '2026-01-01T00:00:00Z', ...overrides };
}

function notebookWith(cells: CellView[]): NotebookDetail {
  return { id: 'nb1', title: 'Invented check', summary: '', ownerId: 'u1', ownerName: 'Invented Lead', groupId: null, groupName: null, cellCount: cells.length, updatedAt: '2026-01-01T00:00:00Z', role: 'owner', sharedBy: null, canEdit: true, cells, datasets: [] };
}

const setup = cell({});
const exponents = cell({ id: 'c2', position: 1, label: 'exponents', kind: 'exponents', input: { kind: 'exponents', uses: 'params' }, state: 'never-run', dependents: [] });
const queuedRun = { id: 'run1', status: 'queued', progress: 0, cached: false, engineVersion: 'engine-test', durationMs: null, result: null, error: null, startedAt: null, finishedAt: null, queue: null };

/** Both cards of a two-cell notebook, sharing one registry of unsaved edits as on the notebook screen. */
function renderNotebook(extra?: React.ReactNode) {
  const notebook = notebookWith([setup, exponents]);
  return renderWithQueryClient(
    <UnsavedEditsProvider value={new UnsavedEdits()}>
      {notebook.cells.map((target, index) => (
        <CellCard key={target.id} notebook={notebook} cell={target} index={index} wide selected={false} onSelect={jest.fn()} />
      ))}
      {extra}
    </UnsavedEditsProvider>,
  );
}

const requests = () => (global.fetch as jest.Mock).mock.calls.map(([url, init]: [string, RequestInit]) => `${init.method} ${url}`);

function editSetupN(value: string) {
  fireEvent.press(screen.getByTestId('cell-params-edit'));
  fireEvent.changeText(screen.getByTestId('cell-params-field-N'), value);
}

const PHONE_METRICS = { frame: { x: 0, y: 0, width: 390, height: 844 }, insets: { top: 0, left: 0, right: 0, bottom: 0 } };

/** New props for the same card: rerender replaces the whole tree, so the providers of renderWithQueryClient are repeated. */
function rerender(view: ReturnType<typeof renderWithQueryClient>, ui: ReactElement) {
  view.rerender(
    <SafeAreaProvider initialMetrics={PHONE_METRICS}>
      <QueryClientProvider client={view.client}>{ui}</QueryClientProvider>
    </SafeAreaProvider>,
  );
}

beforeEach(() => {
  global.fetch = jest.fn();
});

describe('running a cell while the setup it uses has unsaved changes', () => {
  it('asks first instead of running the saved setup silently', () => {
    renderNotebook();
    editSetupN('3');
    fireEvent.press(screen.getByTestId('cell-exponents-run'));
    expect(screen.getByTestId('cell-exponents-unsaved-question')).toHaveTextContent('The model & parameters cell "params" has unsaved changes. This run would use its saved version.');
    expect(screen.getByTestId('cell-exponents-unsaved-save-and-run')).toHaveTextContent('Save and run');
    expect(screen.getByTestId('cell-exponents-unsaved-run-saved')).toHaveTextContent('Run the saved setup');
    expect(screen.getByTestId('cell-exponents-unsaved-cancel')).toHaveTextContent('Cancel');
    expect(global.fetch).not.toHaveBeenCalled();
  });

  it('"Save and run" saves the setup, then runs the cell', async () => {
    renderNotebook();
    editSetupN('3');
    fireEvent.press(screen.getByTestId('cell-exponents-run'));
    const saved = { ...setup, revision: 2, input: { ...setupInput, model: { preset: 'on', N: 3 } } } as CellView;
    mockFetchOnce(200, { notebook: notebookWith([saved, exponents]) });
    mockFetchOnce(200, { run: queuedRun });
    fireEvent.press(screen.getByTestId('cell-exponents-unsaved-save-and-run'));
    await waitFor(() => expect(requests()).toEqual(['PATCH /api/notebooks/nb1/cells/c1', 'POST /api/notebooks/nb1/cells/c2/run']));
    expect(JSON.parse((global.fetch as jest.Mock).mock.calls[0][1].body)).toMatchObject({ revision: 1, input: { model: { preset: 'on', N: 3 } } });
    await waitFor(() => expect(screen.queryByTestId('cell-exponents-unsaved')).toBeNull());
  });

  it('"Run the saved setup" runs without saving and keeps the edits in the editor', async () => {
    renderNotebook();
    editSetupN('3');
    fireEvent.press(screen.getByTestId('cell-exponents-run'));
    mockFetchOnce(200, { run: queuedRun });
    fireEvent.press(screen.getByTestId('cell-exponents-unsaved-run-saved'));
    await waitFor(() => expect(requests()).toEqual(['POST /api/notebooks/nb1/cells/c2/run']));
    expect(screen.getByTestId('cell-params-field-N').props.value).toBe('3');
    expect(screen.getByTestId('cell-params-save')).toHaveTextContent('Save');
  });

  it('"Cancel" neither saves nor runs', () => {
    renderNotebook();
    editSetupN('3');
    fireEvent.press(screen.getByTestId('cell-exponents-run'));
    fireEvent.press(screen.getByTestId('cell-exponents-unsaved-cancel'));
    expect(screen.queryByTestId('cell-exponents-unsaved')).toBeNull();
    expect(global.fetch).not.toHaveBeenCalled();
    expect(screen.getByTestId('cell-params-field-N').props.value).toBe('3');
  });

  it('runs at once when the setup has no unsaved changes', async () => {
    renderNotebook();
    mockFetchOnce(200, { run: queuedRun });
    fireEvent.press(screen.getByTestId('cell-exponents-run'));
    expect(screen.queryByTestId('cell-exponents-unsaved')).toBeNull();
    await waitFor(() => expect(requests()).toEqual(['POST /api/notebooks/nb1/cells/c2/run']));
  });

  it('offers no "Save and run" while the setup holds a wrong value, and says which cell to fix', () => {
    renderNotebook();
    fireEvent.press(screen.getByTestId('cell-params-edit'));
    fireEvent.changeText(screen.getByTestId('cell-params-field-d'), 'three');
    fireEvent.press(screen.getByTestId('cell-exponents-run'));
    expect(screen.getByTestId('cell-exponents-unsaved-invalid')).toHaveTextContent('Fix the marked fields of "params" before saving.');
    expect(screen.getByTestId('cell-exponents-unsaved-save-and-run')).toBeDisabled();
  });

  it('runs nothing when the save fails, and says so', async () => {
    renderNotebook();
    editSetupN('3');
    fireEvent.press(screen.getByTestId('cell-exponents-run'));
    mockFetchOnce(409, { error: { code: 'conflict', message: 'This cell was changed by someone else.' } });
    fireEvent.press(screen.getByTestId('cell-exponents-unsaved-save-and-run'));
    await waitFor(() => expect(screen.getByTestId('cell-exponents-unsaved-failed')).toHaveTextContent(/^A save failed, so nothing was run/));
    expect(requests()).toEqual(['PATCH /api/notebooks/nb1/cells/c1']);
    expect(screen.getByTestId('cell-params-conflict')).toBeTruthy();
  });

  it('reminds of unsaved changes once the editor is closed', () => {
    renderNotebook();
    editSetupN('3');
    fireEvent.press(screen.getByTestId('cell-params-edit'));
    expect(screen.getByTestId('cell-params-unsaved-note')).toHaveTextContent('Unsaved changes. Open the editor to save or discard them.');
  });
});

/** What the notebook screen's Run all does, on its own: the same question before running every cell. */
function RunAllButton({ cells, onRunAll }: { cells: CellView[]; onRunAll: () => void }) {
  const unsaved = useUnsavedEdits();
  const prompt = useUnsavedPrompt('run-all-unsaved');
  return (
    <>
      <ChipButton label="Run all" onPress={() => prompt.guard(unsaved.behindAll(cells), onRunAll)} testID="run-all" />
      {prompt.prompt}
      <Text>after</Text>
    </>
  );
}

describe('Run all with unsaved setup changes', () => {
  it('asks too, and each answer does what it says', async () => {
    const onRunAll = jest.fn();
    renderNotebook(<RunAllButton cells={[setup, exponents]} onRunAll={onRunAll} />);
    editSetupN('3');

    fireEvent.press(screen.getByTestId('run-all'));
    expect(screen.getByTestId('run-all-unsaved-question')).toHaveTextContent(/"params" has unsaved changes/);
    fireEvent.press(screen.getByTestId('run-all-unsaved-cancel'));
    expect(onRunAll).not.toHaveBeenCalled();

    fireEvent.press(screen.getByTestId('run-all'));
    fireEvent.press(screen.getByTestId('run-all-unsaved-run-saved'));
    expect(onRunAll).toHaveBeenCalledTimes(1);
    expect(global.fetch).not.toHaveBeenCalled();

    fireEvent.press(screen.getByTestId('run-all'));
    mockFetchOnce(200, { notebook: notebookWith([{ ...setup, revision: 2, input: { ...setupInput, model: { preset: 'on', N: 3 } } } as CellView, exponents]) });
    fireEvent.press(screen.getByTestId('run-all-unsaved-save-and-run'));
    await waitFor(() => expect(onRunAll).toHaveBeenCalledTimes(2));
    expect(requests()).toEqual(['PATCH /api/notebooks/nb1/cells/c1']);
  });

  it('does not ask about a note being edited', () => {
    const note = cell({ id: 'c3', position: 2, label: 'intro', kind: 'note', input: { kind: 'note', text: 'Hello' }, dependents: [] });
    const onRunAll = jest.fn();
    const notebook = notebookWith([note]);
    renderWithQueryClient(
      <UnsavedEditsProvider value={new UnsavedEdits()}>
        <CellCard notebook={notebook} cell={note} index={0} wide selected={false} onSelect={jest.fn()} />
        <RunAllButton cells={[note]} onRunAll={onRunAll} />
      </UnsavedEditsProvider>,
    );
    fireEvent.press(screen.getByTestId('cell-intro-edit'));
    fireEvent.changeText(screen.getByTestId('cell-intro-field-text'), 'Hello again');
    fireEvent.press(screen.getByTestId('run-all'));
    expect(screen.queryByTestId('run-all-unsaved')).toBeNull();
    expect(onRunAll).toHaveBeenCalledTimes(1);
  });
});

describe('a newly added cell', () => {
  it('opens its editor once and closes it after the first save', async () => {
    const started = jest.fn();
    const notebook = notebookWith([setup, exponents]);
    const view = renderWithQueryClient(<CellCard notebook={notebook} cell={setup} index={0} wide selected={false} onSelect={jest.fn()} startEditing onStartedEditing={started} />);
    expect(screen.getByTestId('cell-params-field-N')).toBeTruthy();
    expect(started).toHaveBeenCalledTimes(1);

    fireEvent.changeText(screen.getByTestId('cell-params-field-N'), '3');
    const saved = { ...setup, revision: 2, input: { ...setupInput, model: { preset: 'on', N: 3 } } } as CellView;
    mockFetchOnce(200, { notebook: notebookWith([saved, exponents]) });
    fireEvent.press(screen.getByTestId('cell-params-save'));
    await waitFor(() => expect(screen.getByTestId('cell-params-edit')).toHaveTextContent('Edit'));
    expect(screen.queryByTestId('cell-params-field-N')).toBeNull();

    // Opened again by hand, it stays open after a save.
    rerender(view, <CellCard notebook={notebookWith([saved, exponents])} cell={saved} index={0} wide selected={false} onSelect={jest.fn()} startEditing={false} onStartedEditing={started} />);
    fireEvent.press(screen.getByTestId('cell-params-edit'));
    fireEvent.changeText(screen.getByTestId('cell-params-field-N'), '4');
    mockFetchOnce(200, { notebook: notebookWith([{ ...saved, revision: 3, input: { ...setupInput, model: { preset: 'on', N: 4 } } } as CellView, exponents]) });
    fireEvent.press(screen.getByTestId('cell-params-save'));
    await waitFor(() => expect(global.fetch).toHaveBeenCalledTimes(2));
    // The save has ended when the button no longer reads "Saving…" (the props still hold the older copy).
    await waitFor(() => expect(screen.getByTestId('cell-params-save')).toHaveTextContent('Save'));
    expect(screen.getByTestId('cell-params-field-N')).toBeTruthy();
    expect(started).toHaveBeenCalledTimes(1);
  });

  it('opens its editor when asked after the card was already shown', () => {
    const notebook = notebookWith([setup, exponents]);
    const view = renderWithQueryClient(<CellCard notebook={notebook} cell={setup} index={0} wide selected={false} onSelect={jest.fn()} />);
    expect(screen.queryByTestId('cell-params-field-N')).toBeNull();
    rerender(view, <CellCard notebook={notebook} cell={setup} index={0} wide selected={false} onSelect={jest.fn()} startEditing />);
    expect(screen.getByTestId('cell-params-field-N')).toBeTruthy();
  });
});
