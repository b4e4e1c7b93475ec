import { fireEvent, render, screen, within } from '@testing-library/react-native';
import type { ReactTestInstance } from 'react-test-renderer';
import { ExponentsOutput, noticesOf } from '../../../components/notebook/outputs/ExponentsOutput';
import { ScanOutput } from '../../../components/notebook/outputs/ScanOutput';
import { asExponents, asScan } from '../../../components/notebook/resultShapes';
import { ExponentsResult, ScanResult } from '../../../shared/jobs/contract';
import isingPlusFreeJson from './fixtures/exponents-ising-plus-free-s2.json';
import o1d2Json from './fixtures/exponents-o1-d2-s2.json';
import beyondSStarJson from './fixtures/scan-o1-d3-beyond-s-star.json';

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

/*
 * Fixtures are the jobs' answers as `npm run calc` writes them (quadratic operators left out; they are
 * optional), parsed with the contract's schema here so that a fixture drifting from the contract fails:
 * - exponents-o1-d2-s2: {job: exponents, model: O(1), s: 2, d: 2, loops: 2, digits: 8}
 * - exponents-ising-plus-free-s2: {job: exponents, model: custom, fields: 2,
 *   potential: u/24*phi1^4 + v/24*phi2^4 + w/4*phi1^2*phi2^2, s: 2, d: 3.8, loops: 2, digits: 8, fixedPoint: "u only"}
 * - scan-o1-d3-beyond-s-star: {job: scan, model: O(1), d: 3, s: 1.5 → 1.98 (3 points), quantities: [nuInv], loops: 2, digits: 8}
 */
const o1d2 = ExponentsResult.parse(o1d2Json);
const isingPlusFree = ExponentsResult.parse(isingPlusFreeJson);
const beyondSStar = ScanResult.parse(beyondSStarJson);

/** The row of a table that starts with `name` (the nearest ancestor holding more than that one text). */
function rowOf(table: ReactTestInstance, name: string): ReactTestInstance {
  let node = within(table).getByText(name);
  while (node.parent && within(node).queryAllByText(/./).length < 2) node = node.parent;
  return node;
}

describe('ExponentsOutput', () => {
  it('reads a contract result exactly (no earlier-shape reading)', () => {
    expect(asExponents(o1d2)?.earlier).toBe(false);
    expect(asExponents(isingPlusFree)?.earlier).toBe(false);
  });

  it('shows the notices before anything else', () => {
    const { toJSON } = render(<ExponentsOutput result={asExponents(o1d2)!} fileName="exp" testID="out" />);
    expect(screen.getByTestId('out-notices-0')).toHaveTextContent(/^at ε = 2 the truncated β has no real fixed point on this branch/);
    const root = toJSON() as { children: { props: { testID?: string } }[] };
    expect(root.children[0].props.testID).toBe('out-notices');
  });

  it('writes each value with what it is computed from, and the crossover with its source', () => {
    render(<ExponentsOutput result={asExponents(o1d2)!} fileName="exp" testID="out" />);
    const table = screen.getByTestId('out-table');
    expect(within(table).getByText('computed from')).toBeTruthy();
    expect(within(table).getByText('1/(1/ν) from the value of 1/ν (not the truncated series of ν)')).toBeTruthy();
    // 2D Ising: Δσ = 1/8, s* = d − 2Δσ = 2 − 1/4 = 1.75 (docs/physics.md §7)
    expect(screen.getByText(/s\* = 1\.75 \(built in: 2D Ising/)).toBeTruthy();
  });

  it('shows a defective Padé approximant by its defect, never as a number', () => {
    render(<ExponentsOutput result={asExponents(o1d2)!} fileName="exp" testID="out" />);
    const pade = screen.getByTestId('out-pade');
    const nuRow = rowOf(pade, 'ν');
    // ν = 1/2 + ε/12 + (7/162) ε²: [1/1] has Q = 1 − (c₂/c₁) ε = 1 − (14/27) ε, a pole at ε = 27/14 = 1.928571… in (0, 2]
    expect(within(nuRow).getByText('defective: pole at ε = 1.92857')).toBeTruthy();
    // [0/1] = c₀/(1 − (c₁/c₀) ε) = 0.5/(1 − ε/6) at ε = 2: 0.75
    expect(within(nuRow).getByText('0.75')).toBeTruthy();
    expect(within(nuRow).queryByText(/degenerate/)).toBeNull();
    expect(within(pade).queryByText('1.9285714')).toBeNull();
    // ω = ε − 0.6296… ε²: c₀ = 0 leaves [0/1] without a solution (docs/physics.md §9: degenerate, flagged)
    const omegaRow = rowOf(pade, 'ω');
    expect(within(omegaRow).getAllByText(/^defective: degenerate approximant/)).toHaveLength(2);
  });

  it('shows the Padé–Borel sums with their method; a pole on the positive t axis is a defect, never a number', () => {
    const withBorel = ExponentsResult.parse({
      ...o1d2Json,
      borel: {
        nuInv: [{ L: 1, M: 1, value: null, error: null, flagged: true, poles: ['3.5'], reason: 'the Borel–Padé approximant has a pole on the positive t axis (t = 3.5): the Laplace integral does not exist' }],
        omega: [{ L: 1, M: 1, value: '0.91234567', error: '2.1e-32', flagged: false, poles: [], reason: null }],
      },
      borelMethod: 'Padé–Borel: B(t) = Σ a_k t^k/k!, Padé [L/M] of B, Laplace integral by double-exponential quadrature',
    });
    render(<ExponentsOutput result={asExponents(withBorel)!} fileName="exp" testID="out" />);
    expect(screen.getByTestId('out-borel-method')).toHaveTextContent(/^Method: Padé–Borel: B\(t\) = Σ a_k t\^k\/k!/);
    const table = screen.getByTestId('out-borel-table');
    expect(within(rowOf(table, '1/ν')).getByText(/^defective: the Borel–Padé approximant has a pole on the positive t axis/)).toBeTruthy();
    expect(within(rowOf(table, 'ω')).getByText('0.91234567 (± 2.1e-32)')).toBeTruthy();
  });

  it('gives η per field direction, typeset, when γ_φ is a matrix, and says why the single η is missing', () => {
    render(<ExponentsOutput result={asExponents(isingPlusFree)!} fileName="exp" testID="out" />);
    // phi1 is an Ising field: η = (N + 2) ε² / (2 (N + 8)²) = ε²/54 = 0.018518519 ε² at N = 1 (textbook two-loop result, recalled from memory);
    // phi2 is free at this point: η = 0 (common practice)
    expect(within(screen.getByTestId('exponent-eta-phi1')).getByTestId('tex')).toHaveTextContent('\\eta_{\\phi_{1}} = 0.018518519\\,\\varepsilon^{2} + O(\\varepsilon^{3})');
    expect(within(screen.getByTestId('exponent-eta-phi2')).getByTestId('tex')).toHaveTextContent('\\eta_{\\phi_{2}} = 0 + O(\\varepsilon^{3})');
    const fields = screen.getByTestId('out-fields-table');
    // at ε = 0.2: ε²/54 = 0.04/54 = 0.00074074074
    expect(within(fields).getByText('0.00074074074')).toBeTruthy();
    expect(screen.getByTestId('out-unavailable')).toHaveTextContent(/η: γ_φ differs between field directions at u only \(phi1, phi2\)/);
    expect(within(screen.getByTestId('out-table')).getAllByText('not available').length).toBe(10);
    expect(screen.queryByText('field anomalous')).toBeNull();
  });

  it('reads notices only from a well-formed list', () => {
    expect(noticesOf({ notices: [{ kind: 'a', message: 'b' }, { kind: 1 }, 'x'] })).toEqual([{ kind: 'a', message: 'b' }]);
    expect(noticesOf({})).toEqual([]);
  });
});

describe('ScanOutput', () => {
  it('shows the notices first, the marks with their notes and sources, and each point’s notices in the table', () => {
    const { toJSON } = render(<ScanOutput scan={asScan(beyondSStar)!} result={beyondSStar} fileName="scan" testID="scan" />);
    const root = toJSON() as { children: { props: { testID?: string } }[] };
    expect(root.children[0].props.testID).toBe('scan-notices');
    // 3D Ising: s* = d − 2Δσ = 3 − 2 · 0.5181489 = 1.9637022 (docs/physics.md §7)
    expect(screen.getByTestId('scan-notices-2')).toHaveTextContent(/^At s = 1\.98: s ≥ s\* = 1\.9637022/);
    expect(screen.getByTestId('scan-marks')).toHaveTextContent(/^s = d\/2 = 1\.5 \(d = 2s: the upper critical dimension .*\) · s\* = 1\.9637022 \(built in: 3D Ising Δσ = 0\.5181489\(10\)/);
    fireEvent.press(screen.getByTestId('scan-points'));
    const table = screen.getByTestId('scan-table');
    expect(within(table).getByText('notices')).toBeTruthy();
    expect(within(table).getByText('beyond-s-star, complex-at-eps')).toBeTruthy();
  });

  it('gives a Padé value the pole check refused as its defect', () => {
    // invented defect on a contract-shaped point (no physics claimed): the [L/1] value is null, the reason given
    const withDefect = ScanResult.parse({ ...beyondSStar, points: beyondSStar.points.map((p) => (p.s === '1.74' ? { ...p, pade: { nuInv: null }, padeDefects: { nuInv: 'pole at ε = 0.3' } } : p)) });
    render(<ScanOutput scan={asScan(withDefect)!} result={withDefect} fileName="scan" testID="scan" />);
    fireEvent.press(screen.getByTestId('scan-points'));
    expect(within(screen.getByTestId('scan-table')).getByText('defective: pole at ε = 0.3')).toBeTruthy();
  });

  it('without the raw result it still draws (no notices, plain marks)', () => {
    render(<ScanOutput scan={asScan(beyondSStar)!} fileName="scan" testID="scan" />);
    expect(screen.queryByTestId('scan-notices')).toBeNull();
    expect(screen.getByTestId('scan-marks')).toHaveTextContent('s = d/2 = 1.5 · s* = 1.9637022');
  });
});
