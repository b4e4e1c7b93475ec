import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import type { CellInput } from '../../../shared/notebook';
import { TextField } from '../../ui/TextField';
import { ChipButton } from '../ChipButton';
import { nameOfQuantity } from '../texFormat';
import { longRangeWindow } from '../fieldErrors';
import { FieldError, optionalText, SetupChoice, WholeNumberField, type EditorProps } from './fields';

type ScanInput = Extract<CellInput, { kind: 'scan' }>;
type Quantity = ScanInput['quantities'][number];
const quantities: Quantity[] = ['nuInv', 'nu', 'eta', 'gamma', 'omega', 'Delta_phi2', 'Delta_phi4'];

export function ScanEditor({ input, errors, onChange, setupLabels, setupDimensions, testPrefix }: EditorProps<ScanInput>) {
  const d = setupDimensions?.get(input.uses);
  const sWindow = longRangeWindow(d);
  const toggle = (quantity: Quantity) =>
    onChange({ ...input, quantities: input.quantities.includes(quantity) ? input.quantities.filter((q) => q !== quantity) : [...input.quantities, quantity] });
  return (
    <View style={styles.form}>
      <SetupChoice value={input.uses} setupLabels={setupLabels} onChange={(uses) => onChange({ ...input, uses: uses ?? '' })} error={errors.uses} testID={`${testPrefix}-uses`} />
      <View style={styles.pair}>
        <View style={styles.half}>
          <TextField label="s from" value={input.from} onChangeText={(from) => onChange({ ...input, from })} error={errors.from} hint={sWindow ? `d = ${d}: s in ${sWindow}` : 'Above d/2, at most 2'} testID={`${testPrefix}-from`} />
        </View>
        <View style={styles.half}>
          <TextField label="s to" value={input.to} onChangeText={(to) => onChange({ ...input, to })} error={errors.to} testID={`${testPrefix}-to`} />
        </View>
      </View>
      <WholeNumberField label="Points" value={input.points} onChange={(points) => onChange({ ...input, points: points as number })} error={errors.points} testID={`${testPrefix}-points`} />
      <View style={styles.group}>
        <Text style={styles.label}>Plot</Text>
        <View style={styles.chips}>
          {quantities.map((quantity) => (
            <ChipButton key={quantity} label={nameOfQuantity(quantity)} selected={input.quantities.includes(quantity)} onPress={() => toggle(quantity)} testID={`${testPrefix}-q-${quantity}`} />
          ))}
        </View>
        {errors.quantities ? <FieldError message={errors.quantities} testID={`${testPrefix}-quantities-error`} /> : null}
      </View>
      <TextField
        label="Short-range Δσ (marks s* = d − 2Δσ)"
        value={input.deltaSigmaShortRange ?? ''}
        onChangeText={(value) => onChange({ ...input, deltaSigmaShortRange: optionalText(value) })}
        error={errors.deltaSigmaShortRange}
        hint="Optional"
        testID={`${testPrefix}-deltaSigma`}
      />
    </View>
  );
}

const styles = StyleSheet.create({
  form: { gap: spacing.md },
  pair: { flexDirection: 'row', gap: spacing.md },
  half: { flex: 1 },
  group: { gap: spacing.xs },
  label: { fontFamily: fonts.medium, fontSize: 14, color: colors.inkSoft },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm },
});
