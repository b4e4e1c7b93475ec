import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { DISPLAY_DIGIT_CHOICES } from '../notebook/displayPrecision';
import { ChipButton } from '../notebook/ChipButton';

/** One chip naming the notebook's display precision; tapping it offers the choices in one row. */
export function DisplayDigitsPicker({ digits, onChoose }: { digits: number; onChoose: (digits: number) => void }) {
  const [open, setOpen] = useState(false);
  const choose = (next: number) => {
    onChoose(next);
    setOpen(false);
  };
  return (
    <View style={[styles.wrap, open && styles.openWrap]}>
      <ChipButton label={`${digits} digits`} selected={open} onPress={() => setOpen(!open)} testID="display-digits" accessibilityLabel={`Results show ${digits} significant digits; change`} />
      {open ? (
        <View style={styles.choices} testID="display-digits-choices">
          <Text style={styles.hint}>Significant digits shown (copies and exports keep every digit):</Text>
          {DISPLAY_DIGIT_CHOICES.map((choice) => (
            <ChipButton key={choice} label={String(choice)} selected={choice === digits} onPress={() => choose(choice)} testID={`display-digits-${choice}`} />
          ))}
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: spacing.sm, maxWidth: '100%' },
  openWrap: { flexBasis: '100%' },
  choices: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: spacing.xs, flexBasis: '100%' },
  hint: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkSoft, flexBasis: '100%' },
});
