import { fireEvent, render, screen, within } from '@testing-library/react-native';
import { ResultView } from '../../../components/notebook/outputs/ResultView';
import { FixedPointsResult, ScanResult } from '../../../shared/jobs/contract';
import scanJson from './fixtures/scan-o1-d3.json';

// Formulas are KaTeX in a web view on native; here their TeX source is enough. d3 ships as ES modules only.
jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
jest.mock('d3-scale', () => ({ scaleLinear: jest.fn() }));
jest.mock('d3-shape', () => ({ line: jest.fn() }));
jest.mock('../../../components/notebook/saveFile', () => ({ saveTextFile: jest.fn(async () => undefined) }));
jest.mock('../../../components/notebook/clipboard', () => ({ copyText: jest.fn(async () => true) }));

/**
 * The scan job's answer as `npm run calc` writes it, parsed with the contract's schema (a drifting fixture fails):
 * {job: scan, model: O(1), d: 3, s: 1.4 → 2 (4 points), quantities: [nuInv], loops: 2, digits: 8}.
 */
const scan = ScanResult.parse(scanJson);

describe('ResultView', () => {
  it('gives a scan cell its notices (complex fixed point, s = 2 short-range point) and the mark notes', () => {
    render(<ResultView kind="scan" result={scan} label="scan" />);
    const notices = screen.getByTestId('cell-scan-result-notices');
    expect(within(notices).getByText(/^At s = 1\.8, 2 \(as said at s = 1\.8\): the fixed point is complex there/)).toBeTruthy();
    expect(within(notices).getByText(/^At s = 2: s = 2 is the short-range \(local\) theory/)).toBeTruthy();
    // s = d/2 = 3/2 ends the mean-field region (docs/physics.md §3); 3D Ising s* = 3 − 2 · 0.5181489 = 1.9637022 (§7)
    expect(screen.getByTestId('cell-scan-result-marks')).toHaveTextContent(/^s = d\/2 = 1\.5 \(d = 2s: the upper critical dimension .*\) · s\* = 1\.9637022 \(built in: 3D Ising/);
    fireEvent.press(screen.getByTestId('cell-scan-result-points'));
    expect(within(screen.getByTestId('cell-scan-result-table')).getByText('short-range-flow, complex-at-eps')).toBeTruthy();
    expect(screen.queryByTestId('cell-scan-earlier')).toBeNull();
  });

  it('shows a fixed-points result with each point’s caveats', () => {
    // invented values (no physics claimed), contract-shaped
    const result = FixedPointsResult.parse({
      eps: '0.5',
      meanField: false,
      fixedPoints: [{ name: 'A', status: 'complex', couplings: { u: { series: ['0', '1'], value: '0.1 + 0.2i' } }, stability: { series: null, values: null }, stable: false, notes: [], caveats: [{ kind: 'complex-at-eps', message: 'A is complex at this ε' }] }],
    });
    render(<ResultView kind="fixedpoints" result={result} label="fp" />);
    expect(screen.getByTestId('cell-fp-result-caveats-0-0')).toHaveTextContent('A is complex at this ε');
  });

  it('says when a result has an earlier shape, and still shows what it can read', () => {
    // an earlier scan shape: no notices, no regime per point (invented values)
    const earlier = { d: '3', marks: { meanFieldEnd: '1.5' }, points: [{ s: '1.6', values: { nuInv: '1.5' } }, { s: '1.8', values: { nuInv: '1.55' } }] };
    render(<ResultView kind="scan" result={earlier} label="old" />);
    expect(screen.getByTestId('cell-old-earlier')).toHaveTextContent(/earlier shape/);
    expect(screen.getByTestId('cell-old-result-marks')).toHaveTextContent('s = d/2 = 1.5');
  });
});
