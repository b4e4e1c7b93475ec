import { render, screen } from '@testing-library/react-native';
import { FixedPointsOutput } from '../../../components/notebook/outputs/FixedPointsOutput';

// Formulas are KaTeX in a web view on native; here their TeX source is enough.
jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
jest.mock('../../../components/notebook/saveFile', () => ({ saveTextFile: jest.fn(async () => undefined) }));
jest.mock('../../../components/notebook/clipboard', () => ({ copyText: jest.fn(async () => true) }));

// Invented values (no physics claimed): one point complex at ε, one whose stability is undecided.
const points = [
  {
    name: 'A',
    status: 'complex',
    stable: false,
    couplings: [{ name: 'u', series: ['0', '0.5'], value: '0.1 + 0.2i' }],
    stabilityValues: ['0.3 - 0.1i'],
    stabilitySeries: [['0', '1']],
    notes: [],
    caveats: [{ kind: 'complex-at-eps', message: 'point A is complex at this ε' }],
  },
  {
    name: 'B',
    status: 'real',
    stable: null,
    couplings: [{ name: 'u', series: ['0', '0.25'], value: '0.05' }],
    stabilityValues: ['0.01'],
    stabilitySeries: [['0', '1', '-3']],
    notes: [],
    caveats: [{ kind: 'stability-sign-disagrees', message: 'λ1 of B: truncated and Padé disagree' }],
  },
];

test('fixed points show their caveats visibly before the series, and the table says complex / undecided', () => {
  render(<FixedPointsOutput eps="0.5" points={points} fileName="fp" testID="fp" />);
  expect(screen.getByTestId('fp-caveats-0-0')).toHaveTextContent('point A is complex at this ε');
  expect(screen.getByTestId('fp-caveats-1-0')).toHaveTextContent('λ1 of B: truncated and Padé disagree');
  expect(screen.getByText('complex: not physical')).toBeTruthy();
  expect(screen.getByText('undecided')).toBeTruthy();
});
