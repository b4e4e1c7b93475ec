import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import { copyText } from '../../../components/notebook/clipboard';
import { CopyableFormula } from '../../../components/notebook/CopyableFormula';
import { DisplayDigitsProvider } from '../../../components/notebook/displayPrecision';
import { CoefficientTable } from '../../../components/notebook/outputs/CoefficientTable';
import { exactFraction, seriesTex } from '../../../components/notebook/texFormat';

jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
jest.mock('../../../components/notebook/saveFile', () => ({ saveTextFile: jest.fn(async () => undefined) }));
jest.mock('../../../components/notebook/clipboard', () => ({ copyText: jest.fn(async () => true) }));

// ω's ε² coefficient of the demo's O(3) at s = 1.75, two loops, as the engine writes it (20 digits).
const LONG = '-0.78176470205630752904';

test('a formula shows 10 significant digits by default, every digit on tap, and copies carry every digit', async () => {
  render(<CopyableFormula tex={(n) => `\\omega = ${seriesTex(0, ['0', '1', LONG], true, n)}`} testID="omega" />);
  // 10 significant digits of −0.78176470205630752904, rounded by hand: −0.7817647021
  expect(screen.getByTestId('tex')).toHaveTextContent('\\omega = \\varepsilon - 0.7817647021\\,\\varepsilon^{2} + O(\\varepsilon^{3})');
  fireEvent.press(screen.getByTestId('omega-digits'));
  expect(screen.getByTestId('tex')).toHaveTextContent(`\\omega = \\varepsilon - ${LONG.slice(1)}\\,\\varepsilon^{2} + O(\\varepsilon^{3})`);
  fireEvent.press(screen.getByTestId('omega-menu'));
  fireEvent.press(screen.getByTestId('omega-copy-0'));
  await waitFor(() => expect(copyText).toHaveBeenCalled());
  expect((copyText as jest.Mock).mock.calls.at(-1)[0]).toContain(LONG.slice(1));
});

test('the notebook’s display precision applies: 4 digits', () => {
  render(
    <DisplayDigitsProvider value={4}>
      <CopyableFormula tex={(n) => seriesTex(0, [LONG], false, n)} />
    </DisplayDigitsProvider>,
  );
  // −0.78176… to 4 significant digits: −0.7818
  expect(screen.getByTestId('tex')).toHaveTextContent('-0.7818');
});

test('table values are shortened, a tap shows every digit, the copied table has every digit', async () => {
  render(<CoefficientTable header={['power of ε', 'coefficient']} rows={[['ε^2', LONG]]} fileName="t" testID="t" />);
  fireEvent.press(screen.getByText('-0.7817647021'));
  expect(screen.getByText(LONG)).toBeTruthy();
  fireEvent.press(screen.getByTestId('t-actions-menu'));
  fireEvent.press(screen.getByTestId('t-actions-copy-0'));
  await waitFor(() => expect((copyText as jest.Mock).mock.calls.at(-1)[0]).toContain(LONG));
});

test('exact rationals print as fractions, other decimals do not', () => {
  // −(N+2)/(N+8) at N = 3 is −5/11 (docs/physics.md §5); 0.4545… to 20 digits is its rounding
  expect(exactFraction('-0.45454545454545454545')).toEqual([-5, 11]);
  expect(seriesTex(0, ['1.75', '-0.45454545454545454545'], false)).toBe('1.75 - \\tfrac{5}{11}\\,\\varepsilon');
  // A(7/4)-type coefficient of the two-loop vertex graph: not a ratio of small integers
  expect(exactFraction('1.2782909317407190677')).toBeNull();
  // short decimals stay as typed
  expect(exactFraction('0.5')).toBeNull();
});
