import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { StyleSheet } from 'react-native';
import { CellCard } from '../../../components/notebook/CellCard';
import { colors } from '../../../constants/theme';
import type { CellView, NotebookDetail } from '../../../shared/notebook';
import { mockFetchOnce, renderWithQueryClient } from '../testUtils';

// Formulas are KaTeX in a web view on native; here their TeX source is enough. d3 ships as ES modules only.
jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
jest.mock('d3-scale', () => ({ scaleLinear: jest.fn() }));
jest.mock('d3-shape', () => ({ line: jest.fn() }));

const run = { id: 'run1', status: 'done' as const, progress: 1, cached: false, engineVersion: 'engine-test', durationMs: 210, error: null, startedAt: null, finishedAt: null, queue: null };
/** An earlier-shape exponents result (before notices, relations and sources): shown as far as it reads, with the earlier-shape caption. */
const exponentsResult = {
  eps: '0.5',
  fixedPoint: 'Ising',
  series: { nuInv: ['1.75', '-0.33333333333333333333', '-0.14203232574896878531'] },
  values: { nuInv: '1.547825251896091137' },
};

function cell(overrides: Partial<CellView>): CellView {
  return { id: 'c1', position: 0, label: 'setup', kind: 'setup', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 30 }, revision: 1, state: 'never-run', dependents: [], lastRun: null, updatedAt: '2026-01-01T00:00:00Z', ...overrides };
}

function notebookWith(cells: CellView[]): NotebookDetail {
  return { id: 'nb1', title: 'Invented check', summary: '', ownerId: 'u1', ownerName: 'Invented Lead', groupId: null, groupName: null, cellCount: cells.length, updatedAt: '2026-01-01T00:00:00Z', role: 'owner', sharedBy: null, canEdit: true, cells, datasets: [] };
}

const setup = cell({ dependents: ['exponents'] });
const exponents = cell({ id: 'c2', position: 1, label: 'exponents', kind: 'exponents', input: { kind: 'exponents', uses: 'setup' }, state: 'up-to-date', lastRun: { ...run, result: exponentsResult } });

beforeEach(() => {
  global.fetch = jest.fn();
});

function renderCard(target: CellView, cells: CellView[], wide = true) {
  return renderWithQueryClient(<CellCard notebook={notebookWith(cells)} cell={target} index={cells.indexOf(target)} wide={wide} selected={false} onSelect={jest.fn()} />);
}

describe('CellCard', () => {
  it('shows an exponents result as a typeset series and a table whose values show every digit on a tap', () => {
    renderCard(exponents, [setup, exponents]);
    expect(screen.getByTestId('cell-exponents-state')).toHaveTextContent('Up to date');
    const formulas = screen.getAllByTestId('tex').map((node) => node.props.children as string);
    // -0.33333333333333333333 is the 20-digit rounding of -1/3 (hand division), so it prints as a fraction;
    // -0.14203232574896878531 is not a small-denominator rational and shows at the default 10 significant
    // digits (the 11th digit is 4, so it rounds down to 0.1420323257).
    expect(formulas).toContain('1/\\nu = 1.75 - \\tfrac{1}{3}\\,\\varepsilon - 0.1420323257\\,\\varepsilon^{2} + O(\\varepsilon^{3})');
    // The table shows −1/3 (with a real minus sign, U+2212); a tap shows every computed digit.
    fireEvent.press(screen.getByText('\u22121/3'));
    expect(screen.getByText('-0.33333333333333333333')).toBeTruthy();
    expect(screen.getByTestId('cell-exponents-earlier')).toHaveTextContent(/earlier shape/);
  });

  it('marks a cell whose inputs changed as out of date', () => {
    const stale = { ...exponents, state: 'out-of-date' as const };
    renderCard(stale, [setup, stale]);
    expect(screen.getByTestId('cell-exponents-state')).toHaveTextContent('Out of date');
    expect(screen.getByTestId('cell-exponents-stale')).toHaveTextContent(/Run it again/);
    // The earlier result keeps full contrast: an amber rule and a label mark it, no opacity (WCAG 2.1
    // 1.4.3 asks 4.5:1 for the text itself, which a 0.6 opacity would lower).
    const output = StyleSheet.flatten(screen.getByTestId('cell-exponents-output').props.style);
    expect(output.opacity).toBeUndefined();
    expect(output.borderLeftColor).toBe(colors.amber);
    expect(screen.getByTestId('cell-exponents-output-stale')).toHaveTextContent('Result of earlier inputs');
  });

  it('shows a queued run as waiting, with the jobs ahead of it and when the wait is given up', async () => {
    const queuedRun = { ...run, status: 'queued' as const, progress: 0, durationMs: null, result: null, queue: { ahead: 2, since: new Date(Date.now() - 90_000).toISOString(), waitLimitMs: 600_000 } };
    const waiting = { ...exponents, state: 'running' as const, lastRun: queuedRun };
    mockFetchOnce(200, { run: queuedRun });
    const { client, unmount } = renderCard(waiting, [setup, waiting]);
    expect(screen.getByTestId('cell-exponents-state')).toHaveTextContent('Waiting — 2 ahead');
    expect(screen.getByTestId('cell-exponents-queue')).toHaveTextContent('2 jobs ahead in the queue; waiting 90 s so far, given up after 10 min.');
    expect(screen.getByTestId('cell-exponents-run')).toHaveTextContent('Waiting…');
    // The card polls the queued run: wait for that request to settle.
    await waitFor(() => expect(global.fetch).toHaveBeenCalledWith('/api/runs/run1', expect.anything()));
    await waitFor(() => expect(client.isFetching()).toBe(0));
    unmount();
  });

  it('says "next" for a queued run with nobody ahead, and plain "Running" once it runs', async () => {
    const next = { ...exponents, state: 'running' as const, lastRun: { ...run, status: 'queued' as const, result: null, queue: { ahead: 0, since: new Date().toISOString(), waitLimitMs: 600_000 } } };
    mockFetchOnce(200, { run: next.lastRun });
    const view = renderCard(next, [setup, next]);
    expect(screen.getByTestId('cell-exponents-state')).toHaveTextContent('Waiting — next');
    await waitFor(() => expect(global.fetch).toHaveBeenCalledTimes(1));
    await waitFor(() => expect(view.client.isFetching()).toBe(0));
    view.unmount();
    const running = { ...exponents, state: 'running' as const, lastRun: { ...run, status: 'running' as const, result: null, progress: 0.4 } };
    mockFetchOnce(200, { run: running.lastRun });
    const second = renderCard(running, [setup, running]);
    expect(screen.getByTestId('cell-exponents-state')).toHaveTextContent('Running');
    expect(screen.queryByTestId('cell-exponents-queue')).toBeNull();
    await waitFor(() => expect(global.fetch).toHaveBeenCalledTimes(2));
    await waitFor(() => expect(second.client.isFetching()).toBe(0));
    second.unmount();
  });

  it('shows an unknown result shape as JSON instead of failing', () => {
    const odd = { ...exponents, lastRun: { ...run, result: { something: ['unexpected', 1] } } };
    renderCard(odd, [setup, odd]);
    expect(screen.getByText('unexpected')).toBeTruthy();
  });

  it('checks inputs as they are typed and does not save an invalid cell', () => {
    renderCard(setup, [setup, exponents]);
    fireEvent.press(screen.getByTestId('cell-setup-edit'));
    fireEvent.changeText(screen.getByTestId('cell-setup-field-d'), 'three');
    expect(screen.getByTestId('cell-setup-field-d-error')).toHaveTextContent('Enter a decimal number, e.g. 1.75');
    fireEvent.press(screen.getByTestId('cell-setup-save'));
    expect(global.fetch).not.toHaveBeenCalled();
  });

  it('keeps the phone’s secondary actions in a menu', () => {
    renderCard(exponents, [setup, exponents], false);
    expect(screen.queryByTestId('cell-exponents-delete')).toBeNull();
    fireEvent.press(screen.getByTestId('cell-exponents-menu'));
    expect(screen.getByTestId('cell-exponents-delete')).toBeTruthy();
  });

  it('on a conflicting save offers both copies, and "keep mine" resends on the current revision', async () => {
    renderCard(setup, [setup, exponents]);
    fireEvent.press(screen.getByTestId('cell-setup-edit'));
    fireEvent.changeText(screen.getByTestId('cell-setup-field-N'), '3');
    mockFetchOnce(409, { error: { code: 'conflict', message: 'This cell was changed by someone else.' } });
    fireEvent.press(screen.getByTestId('cell-setup-save'));
    await waitFor(() => expect(screen.getByTestId('cell-setup-conflict')).toBeTruthy());
    expect(screen.getByTestId('cell-setup-reload-theirs')).toBeTruthy();

    const theirs = { ...setup, revision: 2, input: { ...setup.input, d: '2.5' } as CellView['input'] };
    mockFetchOnce(200, { notebook: notebookWith([theirs, exponents]) });
    const mine = { ...theirs, revision: 3, input: { ...setup.input, model: { preset: 'on', N: 3 } } as CellView['input'] };
    mockFetchOnce(200, { notebook: notebookWith([mine, exponents]) });
    fireEvent.press(screen.getByTestId('cell-setup-keep-mine'));
    await waitFor(() => expect((global.fetch as jest.Mock).mock.calls).toHaveLength(3));
    const [url, init] = (global.fetch as jest.Mock).mock.calls[2];
    expect(url).toBe('/api/notebooks/nb1/cells/c1');
    expect(JSON.parse(init.body)).toMatchObject({ revision: 2, input: { model: { preset: 'on', N: 3 } } });
  });
});
