import { render } from '@testing-library/react-native';
import { Text } from 'react-native';
import { slideScale } from '../../../components/ui/slideScale';
import { PresentationModeProvider, usePresentationMode } from '../../../components/ui/presentationMode';

test('slides use large type on a wide screen and smaller type on a phone held either way', () => {
  expect(slideScale(1440, 900)).toMatchObject({ type: 26, compact: false });
  expect(slideScale(390, 844)).toMatchObject({ type: 16, compact: true });
  // landscape phone: short screen, compact bar and type
  expect(slideScale(844, 390)).toMatchObject({ type: 17, compact: true });
});

function Mode() {
  return <Text testID="mode">{usePresentationMode() ? 'presenting' : 'editing'}</Text>;
}

test('results know when they are on a slide, and only there', () => {
  expect(render(<Mode />).getByTestId('mode')).toHaveTextContent('editing');
  expect(
    render(
      <PresentationModeProvider value>
        <Mode />
      </PresentationModeProvider>,
    ).getByTestId('mode'),
  ).toHaveTextContent('presenting');
});
