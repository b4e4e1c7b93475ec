import { fireEvent, render, screen, waitFor, within } from '@testing-library/react-native';
import { Text } from 'react-native';
import { Circle, Line } from 'react-native-svg';
import { copyText } from '../../../components/notebook/clipboard';
import { ComparisonOutput, comparisonDisplay } from '../../../components/notebook/outputs/ComparisonOutput';
import { ResultView } from '../../../components/notebook/outputs/ResultView';
import { saveTextFile } from '../../../components/notebook/saveFile';
import type { CompareResult } from '../../../shared/jobs/contract';

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
jest.mock('../../../components/notebook/saveFile', () => ({ saveTextFile: jest.fn(async () => undefined) }));
jest.mock('../../../components/notebook/clipboard', () => ({ copyText: jest.fn(async () => true) }));

/**
 * Invented numbers throughout (no physics claimed): a compare result for η against s at d = 3 with two
 * truncations and one Padé variant; the Padé has a pole at the middle grid point and at one data point.
 */
const variants: CompareResult['variants'] = [
  { key: 'order1', label: 'one loop (ε¹)', kind: 'truncated', order: 1 },
  { key: 'order2', label: 'two loops (ε²)', kind: 'truncated', order: 2 },
  { key: 'pade_1_1', label: 'Padé [1/1]', kind: 'pade', order: 2 },
];

const curveRow = (s: string, order1: string, order2: string, pade: string | null): CompareResult['curve'][number] => ({
  s,
  x: s,
  eps: String(2 * Number(s) - 3),
  regime: 'long-range',
  values: { order1, order2, pade_1_1: pade },
  ...(pade === null ? { defects: { pade_1_1: 'pole at ε = 0.4' } } : {}),
});

const pointsResult: CompareResult = {
  quantity: 'eta',
  xAxis: 's',
  d: '3',
  fixedPoint: 'Ising',
  variants,
  marks: { meanFieldEnd: { s: '1.5', x: '1.5' }, sStar: { s: '1.75', x: '1.75' }, dataRange: ['1.65', '1.75'] },
  curve: [
    curveRow('1.6', '0.4', '0.41', '0.405'),
    curveRow('1.65', '0.35', '0.36', '0.355'),
    curveRow('1.7', '0.3', '0.31', null),
    curveRow('1.75', '0.25', '0.26', '0.255'),
    curveRow('1.8', '0.2', '0.21', '0.205'),
  ],
  points: [
    { x: '1.65', s: '1.65', y: '0.36', errLow: '0.01', errHigh: '0.01', regime: 'long-range', series: { order1: '0.35', order2: '0.36', pade_1_1: '0.355' }, residual: { order1: '-0.01', order2: '0', pade_1_1: '-0.005' }, pull: { order1: '-1', order2: '0', pade_1_1: '-0.5' } },
    { x: '1.7', s: '1.7', y: '0.3', errLow: '0.02', errHigh: '0.04', regime: 'long-range', series: { order1: '0.3', order2: '0.31', pade_1_1: null }, residual: { order1: '0', order2: '0.01', pade_1_1: null }, pull: { order1: '0', order2: '0.25', pade_1_1: null }, defects: { pade_1_1: 'pole at ε = 0.4' } },
    { x: '1.75', s: '1.75', y: '0.27', errLow: '0.01', errHigh: '0.01', regime: 'long-range', series: { order1: '0.25', order2: '0.26', pade_1_1: '0.255' }, residual: { order1: '-0.02', order2: '-0.01', pade_1_1: '-0.015' }, pull: { order1: '-2', order2: '-1', pade_1_1: '-1.5' } },
  ],
  summary: [
    { key: 'order1', points: 3, chi2Points: 3, chi2: '5', chi2PerPoint: '1.666667', rms: '0.0129099', maxAbs: '0.02' },
    { key: 'order2', points: 3, chi2Points: 3, chi2: '2.0625', chi2PerPoint: '0.6875', rms: '0.0081650', maxAbs: '0.01' },
    { key: 'pade_1_1', points: 2, chi2Points: 2, chi2: '2.5', chi2PerPoint: '1.25', rms: '0.0111803', maxAbs: '0.015' },
  ],
  notes: ['Invented note: the Padé [1/1] has a pole in (0, ε) at s = 1.7.'],
};

const boundaryResult: CompareResult = {
  ...pointsResult,
  quantity: 'Delta_phi2',
  xAxis: 'Delta_phi',
  points: pointsResult.points.map(({ errLow: _low, errHigh: _high, pull: _pull, ...point }) => point),
  summary: pointsResult.summary.map((row) => ({ ...row, chi2Points: 0, chi2: null, chi2PerPoint: null })),
  kinks: [{ x: '0.52', y: '1.41', uncertainty: '0.012', strength: '7.5', s: '1.96', distance: { order1: '-0.03', order2: '0.004', pade_1_1: null } }],
};

const WIDTH = 360;
function renderLaidOut(result: CompareResult, show?: 'points' | 'boundary') {
  const view = render(<ComparisonOutput result={result} show={show} fileName="cmp" testID="cell-cmp-result" />);
  fireEvent(screen.getByTestId('comparison-canvas'), 'layout', { nativeEvent: { layout: { width: WIDTH, height: 0, x: 0, y: 0 } } });
  return view;
}

const moveCount = (d: string) => (d.match(/M/g) ?? []).length;

describe('ComparisonOutput', () => {
  it('draws one line per variant and every data point with its error bar', () => {
    renderLaidOut(pointsResult);
    for (const variant of variants) expect(screen.getByTestId(`comparison-curve-${variant.key}`)).toBeTruthy();
    const data = within(screen.getByTestId('comparison-data-points'));
    // Three data points, each with errors: three circles and three bars (the result above).
    expect(data.UNSAFE_getAllByType(Circle)).toHaveLength(3);
    expect(data.UNSAFE_getAllByType(Line)).toHaveLength(3);
    // Position by hand: x maps [1.6, 1.8] (the curve's span) linearly onto [60, 360 − 16] — a linear scale.
    const middle = data.UNSAFE_getAllByType(Circle)[1];
    expect(middle.props.cx).toBeCloseTo(60 + ((1.7 - 1.6) / (1.8 - 1.6)) * (WIDTH - 16 - 60), 1);
    // Padé and truncations are told apart by dash pattern, not only colour.
    const dashes = variants.map((variant) => screen.getByTestId(`comparison-curve-${variant.key}`).props.strokeDasharray ?? null);
    expect(new Set(dashes.map(String)).size).toBe(3);
  });

  it('breaks a line where a value is missing instead of drawing through a pole', () => {
    renderLaidOut(pointsResult);
    // The Padé value is null at the middle of five grid points: two unbroken stretches; the truncations have one.
    expect(moveCount(screen.getByTestId('comparison-curve-pade_1_1').props.d)).toBe(2);
    expect(moveCount(screen.getByTestId('comparison-curve-order2').props.d)).toBe(1);
  });

  it('marks s* and the data range inside the plot and lists s = d/2 when it lies outside', () => {
    renderLaidOut(pointsResult);
    expect(screen.getByTestId('comparison-mark-sstar')).toBeTruthy();
    expect(screen.queryByTestId('comparison-mark-meanfield')).toBeNull();
    expect(screen.getByTestId('comparison-data-range')).toBeTruthy();
    expect(screen.getByTestId('comparison-marks')).toHaveTextContent('s = d/2 at s = 1.5 · s* at s = 1.75 · data from s = 1.65 to 1.75 (shaded)');
  });

  it('shows a Padé defect as words, never as a number, and a dash for its residual and pull', () => {
    renderLaidOut(pointsResult);
    const row = within(screen.getByTestId('comparison-residuals-row-1'));
    expect(row.getByText('pole at ε = 0.4')).toBeTruthy();
    // x = 1.7 row: data 0.3 +0.04 −0.02 (asymmetric), then per variant series, residual, pull.
    expect(row.getByText('0.3 +0.04 −0.02')).toBeTruthy();
    const cells = row.UNSAFE_getAllByType(Text).map((node) => node.props.children as string);
    expect(cells).toEqual(['0.3 +0.04 −0.02', '0.3', '0', '0', '0.31', '0.01', '0.25', 'pole at ε = 0.4', '—', '—']);
  });

  it('a point with no usable error: the card gives the count χ² sums over beside the count of residuals', () => {
    // Invented: one of three points has a zero error on the side of the series, so χ² sums over two.
    const summary = [{ ...pointsResult.summary[0], points: 3, chi2Points: 2, chi2: '4', chi2PerPoint: '2' }];
    renderLaidOut({ ...pointsResult, summary });
    const card = screen.getByTestId('comparison-summary-order1');
    expect(card).toHaveTextContent(/points in χ²2/);
    expect(card).toHaveTextContent(/χ²\/point2/);
    expect(card).toHaveTextContent(/points3/);
  });

  it('without errors the card names no χ² count', () => {
    renderLaidOut(boundaryResult);
    expect(screen.getByTestId('comparison-summary-order1')).not.toHaveTextContent(/points in χ²/);
  });

  it('lists χ², χ²/point, RMS and max |r| per variant as the result gives them', () => {
    renderLaidOut(pointsResult);
    for (const row of pointsResult.summary) {
      const card = screen.getByTestId(`comparison-summary-${row.key}`);
      expect(card).toHaveTextContent(new RegExp(`χ²${row.chi2}`));
      expect(card).toHaveTextContent(new RegExp(`RMS residual${row.rms}`));
      expect(card).toHaveTextContent(new RegExp(`max \\|r\\|${row.maxAbs}`));
      expect(card).toHaveTextContent(new RegExp(`points${row.points}`));
      expect(card).toHaveTextContent(new RegExp(`points in χ²${row.chi2Points}`));
    }
    expect(screen.getByTestId('comparison-residual-plot')).toBeTruthy();
    expect(screen.getByTestId('comparison-notes')).toHaveTextContent(pointsResult.notes[0], { exact: false });
  });

  it('draws a boundary as a line, with each kink as a marker and listed with its uncertainty and distances', () => {
    renderLaidOut(boundaryResult);
    expect(screen.getByTestId('comparison-boundary')).toBeTruthy();
    expect(screen.queryByTestId('comparison-data-points')).toBeNull();
    expect(screen.getByTestId('comparison-kink-0')).toBeTruthy();
    const kink = screen.getByTestId('comparison-kinks-0');
    expect(kink).toHaveTextContent(/Δφ = 0\.52 ± 0\.012 \(s = 1\.96\), Δφ² = 1\.41 · strength 7\.5/);
    expect(kink).toHaveTextContent('Series − kink at this Δφ: one loop (ε¹) -0.03 · two loops (ε²) 0.004 · Padé [1/1] —', { exact: false });
    // Without errors there is no χ²: the card says so rather than printing a number.
    expect(screen.getByTestId('comparison-summary-order1')).toHaveTextContent(/χ²no errors given/);
  });

  it('says so when a boundary has no kink', () => {
    renderLaidOut({ ...boundaryResult, kinks: [] });
    expect(screen.getByTestId('comparison-kinks')).toHaveTextContent(/No kink stands out/);
    expect(screen.queryByTestId('comparison-kink-0')).toBeNull();
  });

  it('shows the first 50 rows of a long table and all of them on request', () => {
    const many = Array.from({ length: 60 }, (_, i) => ({ ...pointsResult.points[0], x: (1.6 + i / 500).toFixed(3), s: (1.6 + i / 500).toFixed(3) }));
    renderLaidOut({ ...pointsResult, points: many });
    expect(screen.getByTestId('comparison-residuals-row-49')).toBeTruthy();
    expect(screen.queryByTestId('comparison-residuals-row-50')).toBeNull();
    fireEvent.press(screen.getByTestId('comparison-residuals-all'));
    expect(screen.getByTestId('comparison-residuals-row-59')).toBeTruthy();
  });

  it('downloads the table as CSV and the plot as a standalone SVG file from its menu', () => {
    renderLaidOut(pointsResult);
    expect(screen.queryByTestId('comparison-download-csv')).toBeNull();
    fireEvent.press(screen.getByTestId('comparison-menu'));
    fireEvent.press(screen.getByTestId('comparison-download-csv'));
    const save = saveTextFile as jest.Mock;
    const [csvName, csv, csvType] = save.mock.calls.at(-1);
    expect([csvName, csvType]).toEqual(['cmp.csv', 'text/csv']);
    // RFC 4180: records end in CRLF; a header, then one record per data point.
    const records = (csv as string).split('\r\n').filter(Boolean);
    expect(records).toHaveLength(1 + pointsResult.points.length);
    // The header comes first: the x-axis by its name (AXIS_NAMES.s), then the data, then the variants by their labels.
    expect(records[0].split(',')[0]).toBe('s');
    for (const variant of variants) expect(records[0]).toContain(variant.label);

    fireEvent.press(screen.getByTestId('comparison-download-svg'));
    const [svgName, svg, svgType] = save.mock.calls.at(-1);
    expect([svgName, svgType]).toEqual(['cmp.svg', 'image/svg+xml']);
    expect(svg).toMatch(/^<\?xml[^>]*\?>\n<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg" /);
    expect((svg as string).trim().endsWith('</svg>')).toBe(true);
    // Every variant drawn in the file with its dash pattern; three data points, plus one dot as the data's
    // sample in the legend below the axes.
    expect((svg as string).match(/<circle /g)).toHaveLength(3 + 1);
    expect(svg).toContain('stroke-dasharray="8 4"');
  });

  it('copies the table as a TeX tabular', async () => {
    renderLaidOut(pointsResult);
    fireEvent.press(screen.getByTestId('comparison-menu'));
    fireEvent.press(screen.getByTestId('comparison-copy-tex'));
    await waitFor(() => expect(screen.getByTestId('comparison-copy-tex')).toHaveTextContent('Copied'));
    const [tex] = (copyText as jest.Mock).mock.calls.at(-1);
    // A LaTeX table body lives in a tabular environment (LaTeX's own documentation).
    expect(tex).toMatch(/\\begin\{tabular\}/);
  });

  it("takes the cell's choice of drawing, else the dataset's shape, and the dataset's name for the legend", () => {
    const datasets = [{ label: 'bound', shape: 'boundary' as const, name: 'Invented bound' }];
    expect(comparisonDisplay({ kind: 'comparison', uses: 'scan', dataset: 'bound', kinks: true }, datasets)).toEqual({ show: 'boundary', dataName: 'Invented bound' });
    expect(comparisonDisplay({ kind: 'comparison', uses: 'scan', dataset: 'bound', show: 'points', kinks: false }, datasets)).toEqual({ show: 'points', dataName: 'Invented bound' });
    expect(comparisonDisplay({ kind: 'comparison', uses: 'scan', dataset: 'gone', kinks: false }, datasets)).toEqual({ show: undefined, dataName: undefined });
    render(<ResultView kind="comparison" result={pointsResult} label="cmp" show="boundary" dataName="Invented bound" />);
    fireEvent(screen.getByTestId('comparison-canvas'), 'layout', { nativeEvent: { layout: { width: WIDTH, height: 0, x: 0, y: 0 } } });
    expect(screen.getByTestId('comparison-boundary')).toBeTruthy();
    expect(screen.getByTestId('comparison-legend')).toHaveTextContent('Invented bound', { exact: false });
  });

  it('is what a comparison cell shows for a compare result', () => {
    render(<ResultView kind="comparison" result={pointsResult} label="cmp" />);
    expect(screen.getByTestId('cell-cmp-result')).toBeTruthy();
    expect(screen.getByTestId('comparison-summary')).toBeTruthy();
  });
});
