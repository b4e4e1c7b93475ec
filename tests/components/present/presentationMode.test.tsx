import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { CellOutput } from '../../../components/notebook/CellOutput';
import { PresentationModeProvider } from '../../../components/ui/presentationMode';
import type { CellView, NotebookDetail, RunView } from '../../../shared/notebook';
import scanJson from '../notebook/fixtures/scan-o1-d3.json';
import { mockFetchOnce, renderWithQueryClient } from '../testUtils';

// Formulas are KaTeX in a web view on native; here their TeX source is enough.
jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
// d3 ships as ES modules, which jest does not transform here; its UMD bundles are the same library as plain CommonJS.
jest.mock('d3-scale', () => jest.requireActual(`${process.cwd()}/node_modules/d3-scale/dist/d3-scale.js`));
jest.mock('d3-array', () => jest.requireActual(`${process.cwd()}/node_modules/d3-array/dist/d3-array.js`));
jest.mock('d3-interpolate', () => jest.requireActual(`${process.cwd()}/node_modules/d3-interpolate/dist/d3-interpolate.js`));
jest.mock('d3-color', () => jest.requireActual(`${process.cwd()}/node_modules/d3-color/dist/d3-color.js`));
jest.mock('d3-format', () => jest.requireActual(`${process.cwd()}/node_modules/d3-format/dist/d3-format.js`));
jest.mock('d3-time', () => jest.requireActual(`${process.cwd()}/node_modules/d3-time/dist/d3-time.js`));
jest.mock('d3-time-format', () => jest.requireActual(`${process.cwd()}/node_modules/d3-time-format/dist/d3-time-format.js`));
jest.mock('d3-shape', () => jest.requireActual(`${process.cwd()}/node_modules/d3-shape/dist/d3-shape.js`));
jest.mock('d3-path', () => jest.requireActual(`${process.cwd()}/node_modules/d3-path/dist/d3-path.js`));

const run: RunView = { id: 'run1', status: 'done', progress: 1, cached: false, engineVersion: 'engine-test', durationMs: 210, error: null, startedAt: null, finishedAt: null, queue: null, result: null };
/** An earlier-shape exponents result (invented numbers: −1/3 to 20 digits, then a 20-digit coefficient that is no small fraction). */
const exponentsResult = { eps: '0.5', fixedPoint: 'Ising', series: { nuInv: ['1.75', '-0.33333333333333333333', '-0.14203232574896878531'] }, values: { nuInv: '1.58' } };
const setupInput = { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 30 } as const;

function cell(overrides: Partial<CellView>): CellView {
  return { id: 'c1', position: 0, label: 'setup', kind: 'setup', input: setupInput, revision: 1, state: 'up-to-date', dependents: [], lastRun: null, updatedAt: '2026-01-01T00:00:00Z', ...overrides };
}

const setup = cell({});
const exponents = cell({ id: 'c2', position: 1, label: 'exponents', kind: 'exponents', input: { kind: 'exponents', uses: 'setup' }, lastRun: { ...run, result: exponentsResult } });
const scan = cell({ id: 'c3', position: 2, label: 'scan', kind: 'scan', input: { kind: 'scan', uses: 'setup', variable: 's', from: '1.6', to: '1.9', points: 4, quantities: ['nuInv'] } as CellView['input'], lastRun: { ...run, result: scanJson } });
const notebook: NotebookDetail = { id: 'nb1', title: 'Invented check', summary: '', ownerId: 'u1', ownerName: 'Invented Lead', groupId: null, groupName: null, cellCount: 3, updatedAt: '2026-01-01T00:00:00Z', role: 'owner', sharedBy: null, canEdit: true, cells: [setup, exponents, scan], datasets: [] };

function renderOutput(target: CellView, presenting: boolean) {
  return renderWithQueryClient(
    <PresentationModeProvider value={presenting}>
      <CellOutput notebook={notebook} cell={target} />
    </PresentationModeProvider>,
  );
}

beforeEach(() => {
  global.fetch = jest.fn();
});

describe('results on a slide', () => {
  it('in the notebook, a result has its copy menu and says how it ran', () => {
    renderOutput(exponents, false);
    expect(screen.getAllByRole('button', { name: 'Copy options' }).length).toBeGreaterThan(0);
    // The 20-digit coefficient shows at the default 10 digits, with every digit one tap away.
    expect(screen.getAllByText('10 digits · tap for all').length).toBeGreaterThan(0);
    // 210 ms = 0.21 s; the facts name the engine that computed it.
    expect(screen.getByTestId('cell-exponents-facts')).toHaveTextContent('0.21 s · engine engine-test');
  });

  it('on a slide, the same result has no copy menu, no digits toggle and no run facts', () => {
    renderOutput(exponents, true);
    expect(screen.queryAllByRole('button', { name: 'Copy options' })).toHaveLength(0);
    expect(screen.queryByText(/tap for all/)).toBeNull();
    expect(screen.queryByTestId('cell-exponents-facts')).toBeNull();
    // The result itself is there: 1/ν = 1.75 − ⅓ ε + O(ε²) with −0.333… recognised as −1/3.
    const formulas = screen.getAllByTestId('tex').map((node) => node.props.children as string);
    expect(formulas.some((tex) => tex.includes('1.75 - \\tfrac{1}{3}\\,\\varepsilon'))).toBe(true);
  });

  it('on a slide, a scan shows its plot without "Show points" or "Save SVG"', () => {
    for (const presenting of [false, true]) {
      const view = renderOutput(scan, presenting);
      // The plot is drawn (and can be saved) once it knows its width.
      fireEvent(screen.getByTestId('cell-scan-result-plot-canvas'), 'layout', { nativeEvent: { layout: { x: 0, y: 0, width: 400, height: 280 } } });
      expect(screen.queryByText('Show 4 points') === null).toBe(presenting);
      expect(screen.queryByText('Save SVG') === null).toBe(presenting);
      view.unmount();
    }
  });

  it('on a slide, a running cell shows its progress without a Cancel button', async () => {
    const running: RunView = { ...run, status: 'running', progress: 0.5, durationMs: null };
    mockFetchOnce(200, { run: running });
    const view = renderOutput(cell({ ...exponents, state: 'running', lastRun: running }), true);
    // progress 0.5 is shown as 50 %
    expect(screen.getByText('Computing… 50 %')).toBeTruthy();
    expect(screen.queryByTestId('cell-exponents-cancel')).toBeNull();
    await waitFor(() => expect(view.client.isFetching()).toBe(0));
  });
});
