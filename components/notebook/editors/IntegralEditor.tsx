import { StyleSheet, View } from 'react-native';
import { spacing } from '../../../constants/theme';
import type { CellInput } from '../../../shared/notebook';
import { TextField } from '../../ui/TextField';
import { ChoiceRow } from '../ChoiceRow';
import { optionalText, SetupChoice, WholeNumberField, type EditorProps } from './fields';

type IntegralInput = Extract<CellInput, { kind: 'integral' }>;

export function IntegralEditor({ input, errors, onChange, setupLabels, testPrefix }: EditorProps<IntegralInput>) {
  return (
    <View style={styles.form}>
      <ChoiceRow
        label="Integral"
        options={[{ value: 'bubble', label: 'One-loop bubble G(a, b)' }, { value: 'laurent', label: 'Γ-product' }]}
        value={input.form}
        onChange={(form) => onChange({ ...input, form })}
        testID={`${testPrefix}-form`}
      />
      {input.form === 'laurent' ? (
        <TextField label="Product of Γ factors" value={input.expr ?? ''} onChangeText={(expr) => onChange({ ...input, expr: optionalText(expr) })} error={errors.expr} hint="e.g. gamma(eps/2)*gamma(1 - eps/2)/gamma(1 + eps)" testID={`${testPrefix}-expr`} />
      ) : (
        <View style={styles.pair}>
          <View style={styles.half}>
            <TextField label="Power a" value={input.a ?? ''} onChangeText={(a) => onChange({ ...input, a: optionalText(a) })} error={errors.a} testID={`${testPrefix}-a`} />
          </View>
          <View style={styles.half}>
            <TextField label="Power b" value={input.b ?? ''} onChangeText={(b) => onChange({ ...input, b: optionalText(b) })} error={errors.b} testID={`${testPrefix}-b`} />
          </View>
        </View>
      )}
      <TextField label="d, in ε and parameters" value={input.d} onChangeText={(d) => onChange({ ...input, d })} error={errors.d} hint="e.g. 2*s - eps" testID={`${testPrefix}-d`} />
      <WholeNumberField label="Expand through ε to the power" value={input.order} onChange={(order) => onChange({ ...input, order: order as number })} error={errors.order} testID={`${testPrefix}-order`} />
      <SetupChoice optional value={input.uses} setupLabels={setupLabels} onChange={(uses) => onChange({ ...input, uses })} error={errors.uses} testID={`${testPrefix}-uses`} />
    </View>
  );
}

const styles = StyleSheet.create({
  form: { gap: spacing.md },
  pair: { flexDirection: 'row', gap: spacing.md },
  half: { flex: 1 },
});
