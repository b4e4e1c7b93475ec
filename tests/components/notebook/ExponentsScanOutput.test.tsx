import { fireEvent, render, screen, within } from '@testing-library/react-native';
import { ExponentsOutput, noticesOf } from '../../../components/notebook/outputs/ExponentsOutput';
import { ScanOutput } from '../../../components/notebook/outputs/ScanOutput';
import { asExponents, asScan } from '../../../components/notebook/resultShapes';

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

/** An excerpt of the exponents job's result (O(1), d = 2, s = 2, two loops, 8 digits), shortened by hand. */
const exponents = {
  notices: [{ kind: 'complex-at-eps', message: 'at ε = 2 the truncated β has no real fixed point on this branch' }],
  eps: '2',
  meanField: false,
  fixedPoint: 'Ising',
  series: { nuInv: ['2', '-0.33333333', '-0.11728395'], nu: ['0.5', '0.083333333', '0.043209877'] },
  relations: { nu: 'ν = 1/(1/ν)' },
  sources: { nuInv: 'truncated ε-series of 1/ν at the physical ε', nu: '1/(1/ν) from the value of 1/ν (not the truncated series of ν)' },
  unavailable: { gamma: 'invented reason for the test' },
  values: { nuInv: '0.86419753', nu: '1.1571429', gamma: null },
  pade: {
    nuInv: [
      { L: 0, M: 1, value: '1.5', flagged: false, poles: [], signChange: false, reason: null },
      { L: 1, M: 1, value: '-0.25', flagged: false, poles: [], signChange: false, reason: null },
    ],
    nu: [
      { L: 0, M: 1, value: '0.75', flagged: false, poles: [], signChange: false, reason: null },
      { L: 1, M: 1, value: null, flagged: true, poles: ['1.9285714'], signChange: true, reason: 'pole at ε = 1.92857' },
    ],
  },
  shortRange: { sStar: '1.75', Delta_sigma: '0.125', source: 'built in: 2D Ising Δσ = 0.125' },
};

describe('ExponentsOutput', () => {
  it('shows the notices before anything else', () => {
    const { toJSON } = render(<ExponentsOutput result={asExponents(exponents)!} fileName="exp" testID="out" />);
    expect(screen.getByTestId('out-notices-0')).toHaveTextContent(exponents.notices[0].message);
    const root = toJSON() as { children: { props: { testID?: string } }[] };
    expect(root.children[0].props.testID).toBe('out-notices');
  });

  it('writes each value with what it is computed from, and says which quantities are unavailable and why', () => {
    render(<ExponentsOutput result={asExponents(exponents)!} fileName="exp" testID="out" />);
    const table = screen.getByTestId('out-table');
    expect(within(table).getByText('computed from')).toBeTruthy();
    expect(within(table).getByText('1/(1/ν) from the value of 1/ν (not the truncated series of ν)')).toBeTruthy();
    expect(within(table).getByText('not available')).toBeTruthy();
    expect(screen.getByTestId('out-unavailable')).toHaveTextContent(/γ: invented reason for the test/);
    expect(screen.getByText(/s\* = 1\.75 \(built in: 2D Ising/)).toBeTruthy();
  });

  it('lists every Padé approximant; a flagged one shows its pole instead of a number', () => {
    render(<ExponentsOutput result={asExponents(exponents)!} fileName="exp" testID="out" />);
    const pade = screen.getByTestId('out-pade');
    expect(within(pade).getByText('[0/1]')).toBeTruthy();
    expect(within(pade).getByText('[1/1]')).toBeTruthy();
    expect(within(pade).getByText('-0.25')).toBeTruthy();
    expect(within(pade).getByText('flagged: pole at ε = 1.92857')).toBeTruthy();
    expect(within(pade).queryByText('1.9285714')).toBeNull();
  });

  it('reads notices only from a well-formed list', () => {
    expect(noticesOf({ notices: [{ kind: 'a', message: 'b' }, { kind: 1 }, 'x'] })).toEqual([{ kind: 'a', message: 'b' }]);
    expect(noticesOf({})).toEqual([]);
  });
});

/** An excerpt of a scan result (O(1), d = 2, s from 1.5 to 2), invented digits. */
const scanResult = {
  notices: [{ kind: 'beyond-s-star', message: 'At s = 1.75: s ≥ s* = 1.75 (built in: 2D Ising Δσ = 0.125): beyond the crossover …' }],
  d: '2',
  fixedPoint: 'Ising',
  quantities: ['nuInv'],
  marks: { meanFieldEnd: '1', meanFieldEndNote: 'd = 2s: the upper critical dimension (mean-field exponents with logarithmic corrections)', sStar: '1.75', sStarSource: 'built in: 2D Ising Δσ = 0.125' },
  points: [
    { s: '1.5', eps: '1', regime: 'long-range', flagged: false, values: { nuInv: '0.98' }, pade: { nuInv: '0.77' } },
    { s: '1.75', eps: '1.5', regime: 'short-range', flagged: true, values: { nuInv: '0.93' }, pade: { nuInv: null }, padeDefects: { nuInv: 'pole at ε = 1.2' }, notices: ['beyond-s-star'] },
  ],
};

describe('ScanOutput', () => {
  it('shows the notices first, the marks with their notes and sources, and each point’s notices in the table', () => {
    const { toJSON } = render(<ScanOutput scan={asScan(scanResult)!} result={scanResult} fileName="scan" testID="scan" />);
    const root = toJSON() as { children: { props: { testID?: string } }[] };
    expect(root.children[0].props.testID).toBe('scan-notices');
    expect(screen.getByTestId('scan-notices-0')).toHaveTextContent(/^At s = 1\.75: s ≥ s\* = 1\.75/);
    expect(screen.getByTestId('scan-marks')).toHaveTextContent('s = d/2 = 1 (d = 2s: the upper critical dimension (mean-field exponents with logarithmic corrections)) · s* = 1.75 (built in: 2D Ising Δσ = 0.125)');
    fireEvent.press(screen.getByTestId('scan-points'));
    const table = screen.getByTestId('scan-table');
    expect(within(table).getByText('notices')).toBeTruthy();
    expect(within(table).getByText('beyond-s-star')).toBeTruthy();
  });

  it('without the raw result it still draws (no notices, plain marks)', () => {
    render(<ScanOutput scan={asScan(scanResult)!} fileName="scan" testID="scan" />);
    expect(screen.queryByTestId('scan-notices')).toBeNull();
    expect(screen.getByTestId('scan-marks')).toHaveTextContent('s = d/2 = 1 · s* = 1.75');
  });
});
