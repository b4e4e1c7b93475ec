import { useState } from 'react';
import { Text, type StyleProp, type TextStyle } from 'react-native';
import { shortenDecimal, useDisplayDigits } from '../displayPrecision';
import { readableValue } from '../texFormat';

const WHOLE_DECIMAL = /^\s*[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?\s*$/;
const DECIMAL_IN_TEXT = /\d+\.\d+(?:[eE][+-]?\d+)?/g;

/**
 * A value as a reader wants it: an exact rational as a fraction, a decimal at the display precision, and
 * the decimals inside text ("0.1744… + 0.1309…i", "u = 0.27…") shortened the same way.
 */
export function displayedValue(text: string, digits: number): string {
  if (WHOLE_DECIMAL.test(text)) return readableValue(text.trim(), digits);
  return text.replace(DECIMAL_IN_TEXT, (token) => shortenDecimal(token, digits));
}

/** A table value at the display precision; a tap shows every computed digit (and a second tap shortens it again). */
export function ShortValue({ value, style, testID }: { value: string; style?: StyleProp<TextStyle>; testID?: string }) {
  const digits = useDisplayDigits();
  const [full, setFull] = useState(false);
  const shown = displayedValue(value, digits);
  if (shown === value) return <Text selectable style={style} testID={testID}>{value}</Text>;
  return (
    <Text
      selectable
      style={style}
      onPress={() => setFull(!full)}
      accessibilityRole="button"
      accessibilityHint={full ? 'Shows the value at the display precision' : 'Shows every computed digit'}
      testID={testID}
    >
      {full ? value : shown}
    </Text>
  );
}
