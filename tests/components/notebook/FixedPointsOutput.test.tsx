import { render, screen, within } from '@testing-library/react-native';
import { FixedPointsOutput } from '../../../components/notebook/outputs/FixedPointsOutput';
import { asFixedPoints } from '../../../components/notebook/resultShapes';
import { FixedPointsResult } from '../../../shared/jobs/contract';

// Formulas are KaTeX in a web view on native; here their TeX source is enough.
jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
jest.mock('../../../components/notebook/saveFile', () => ({ saveTextFile: jest.fn(async () => undefined) }));
jest.mock('../../../components/notebook/clipboard', () => ({ copyText: jest.fn(async () => true) }));

/**
 * Parsed with the contract's schema, so a fixture that drifts from the result the engine writes fails here.
 * Point "Ising": the fixedpoints job's answer for O(1), s = 1.75, d = 3, two loops, 8 digits (quadratic
 * operators and the long note left out). Point "B": invented (no physics claimed) — stability undecided,
 * and a second stability eigenvalue without an ε-series (null, in its place).
 */
const result = FixedPointsResult.parse({
  eps: '0.5',
  meanField: false,
  fixedPoints: [
    {
      name: 'Ising',
      status: 'complex',
      couplings: { u: { series: ['0', '0.33333333', '0.28406465'], value: '0.19557363 + 0.16414069i' } },
      stability: { series: [['0', '1', '-0.85219395']], values: ['0.4132791 - 0.49242206i'] },
      stable: false,
      notes: [],
      caveats: [
        {
          kind: 'complex-at-eps',
          message: 'at ε = 0.5 the truncated β has no real fixed point on this branch, only a complex pair: not a physical fixed point there, never IR-stable; results that use it evaluate its real ε-series',
        },
      ],
    },
    {
      name: 'B',
      status: 'real',
      couplings: { u: { series: ['0', '0.25'], value: '0.05' } },
      stability: { series: [['0', '1', '-3'], null, ['0', '2']], values: ['0.01', '0.5', '1'] },
      stable: null,
      notes: ['invented note'],
      caveats: [{ kind: 'stability-sign-disagrees', message: 'λ1 of B: truncated and Padé disagree' }],
    },
  ],
});

test('asFixedPoints keeps each point’s caveats and the position of an eigenvalue without a series', () => {
  const read = asFixedPoints(result)!;
  expect(read.earlier).toBe(false);
  expect(read.points.map((p) => p.caveats.map((c) => c.kind))).toEqual([['complex-at-eps'], ['stability-sign-disagrees']]);
  expect(read.points[1].stabilitySeries).toEqual([['0', '1', '-3'], null, ['0', '2']]);
});

test('fixed points show their caveats before the series, and the table says complex / undecided', () => {
  const read = asFixedPoints(result)!;
  render(<FixedPointsOutput eps={read.eps} points={read.points} fileName="fp" testID="fp" />);
  expect(screen.getByTestId('fp-caveats-0-0')).toHaveTextContent(/^at ε = 0\.5 the truncated β has no real fixed point/);
  expect(screen.getByTestId('fp-caveats-1-0')).toHaveTextContent('λ1 of B: truncated and Padé disagree');
  const table = screen.getByTestId('fp-table');
  expect(within(table).getByText('complex: not physical')).toBeTruthy();
  expect(within(table).getByText('undecided')).toBeTruthy();
});

test('an eigenvalue without a series is named in its place; the next one keeps its number', () => {
  const read = asFixedPoints(result)!;
  render(<FixedPointsOutput eps={read.eps} points={read.points} fileName="fp" testID="fp" />);
  expect(screen.getByText('λ₂: no ε-series (see the notes)')).toBeTruthy();
  // seriesTex of [0, 2]: the ε^0 term vanishes, 2ε, truncated at O(ε²)
  expect(screen.getByText('\\lambda_{3} = 2\\,\\varepsilon + O(\\varepsilon^{2})')).toBeTruthy();
});
