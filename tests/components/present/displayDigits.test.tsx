import { fireEvent, render } from '@testing-library/react-native';
import { Text } from 'react-native';
import { DisplayDigitsProvider, shortenDecimal, useDisplayDigits } from '../../../components/notebook/displayPrecision';
import { DisplayDigitsPicker } from '../../../components/ui/DisplayDigitsPicker';
import { parseDisplayDigits, useDisplayDigitsSetting } from '../../../hooks/useDisplayDigits';

/** A value as a result shows it, at the precision its notebook provides. */
function Shown({ value }: { value: string }) {
  return <Text testID="shown">{shortenDecimal(value, useDisplayDigits())}</Text>;
}

function NotebookHeader({ notebookId, userId }: { notebookId: string; userId: string }) {
  const [digits, choose] = useDisplayDigitsSetting(notebookId, userId);
  return (
    <DisplayDigitsProvider value={digits}>
      <DisplayDigitsPicker digits={digits} onChoose={choose} />
      {/* 1/ν of some scan point, 20 digits (invented) */}
      <Shown value="1.2345678901234567890" />
    </DisplayDigitsProvider>
  );
}

test('a stored choice counts only when it is one of the offered ones', () => {
  expect(parseDisplayDigits('6')).toBe(6);
  expect(parseDisplayDigits('7')).toBe(10);
  expect(parseDisplayDigits(null)).toBe(10);
  expect(parseDisplayDigits('ten')).toBe(10);
});

test('results show 10 significant digits until the user picks another precision', () => {
  const screen = render(<NotebookHeader notebookId="nb-default" userId="u1" />);
  // 1.2345678901|234… rounds (half-even) to 1.234567890 at 10 digits; decimal.js drops the trailing zero
  expect(screen.getByTestId('shown')).toHaveTextContent('1.23456789');
  expect(screen.getByTestId('display-digits')).toHaveTextContent('10 digits');
});

test('the picked precision applies to the results and is remembered per user and notebook', () => {
  const first = render(<NotebookHeader notebookId="nb-a" userId="u1" />);
  fireEvent.press(first.getByTestId('display-digits'));
  fireEvent.press(first.getByTestId('display-digits-6'));
  // 1.23456|789… rounds up at the sixth digit: 1.23457
  expect(first.getByTestId('shown')).toHaveTextContent('1.23457');
  expect(first.queryByTestId('display-digits-choices')).toBeNull();
  first.unmount();

  expect(render(<NotebookHeader notebookId="nb-a" userId="u1" />).getByTestId('shown')).toHaveTextContent('1.23457');
  expect(render(<NotebookHeader notebookId="nb-b" userId="u1" />).getByTestId('shown')).toHaveTextContent('1.23456789');
  expect(render(<NotebookHeader notebookId="nb-a" userId="u2" />).getByTestId('shown')).toHaveTextContent('1.23456789');
});
