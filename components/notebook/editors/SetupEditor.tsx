import { StyleSheet, View } from 'react-native';
import { spacing } from '../../../constants/theme';
import type { CellInput, ModelSpec } from '../../../shared/notebook';
import { TextField } from '../../ui/TextField';
import { ChoiceRow } from '../ChoiceRow';
import { optionalText, PresetNField, WholeNumberField, type EditorProps } from './fields';

type SetupInput = Extract<CellInput, { kind: 'setup' }>;

const presetDefaults: Record<ModelSpec['preset'], ModelSpec> = {
  on: { preset: 'on', N: 1 },
  cubic: { preset: 'cubic', N: 3 },
  custom: { preset: 'custom', fields: 2, potential: 'u/24*(phi1^4+phi2^4) + v/4*phi1^2*phi2^2' },
};

export function SetupEditor({ input, errors, onChange, testPrefix }: EditorProps<SetupInput>) {
  const model = input.model;
  const setModel = (next: ModelSpec) => onChange({ ...input, model: next });
  return (
    <View style={styles.form}>
      <ChoiceRow
        label="Model"
        options={[{ value: 'on', label: 'O(N)' }, { value: 'cubic', label: 'Cubic anisotropy' }, { value: 'custom', label: 'Own potential' }]}
        value={model.preset}
        onChange={(preset) => setModel(presetDefaults[preset])}
        testID={`${testPrefix}-preset`}
      />
      {model.preset === 'on' ? (
        <PresetNField label="N (components)" value={model.N} allowSymbol="N" hint="Any real number (0: self-avoiding walk, 0.5, −1, 1000000), or N to keep it symbolic" onChange={(N) => setModel({ preset: 'on', N })} error={errors['model.N']} testID={`${testPrefix}-N`} />
      ) : null}
      {model.preset === 'cubic' ? (
        <PresetNField label="N (components)" value={model.N} hint="Any real number except 1, e.g. 3 or 2.5" onChange={(N) => setModel({ preset: 'cubic', N })} error={errors['model.N']} testID={`${testPrefix}-N`} />
      ) : null}
      {model.preset === 'custom' ? (
        <>
          <WholeNumberField label="Fields φ1…φn" value={model.fields} onChange={(fields) => setModel({ ...model, fields: fields as number })} error={errors['model.fields']} testID={`${testPrefix}-fields`} />
          <TextField label="Quartic potential" value={model.potential} onChangeText={(potential) => setModel({ ...model, potential })} error={errors['model.potential']} hint="A polynomial in phi1…phin with named couplings" testID={`${testPrefix}-potential`} />
        </>
      ) : null}
      <View style={styles.pair}>
        <View style={styles.half}>
          <TextField label="d" value={input.d ?? ''} onChangeText={(d) => onChange({ ...input, d: optionalText(d) })} error={errors.d} hint="Empty: symbolic" testID={`${testPrefix}-d`} />
        </View>
        <View style={styles.half}>
          <TextField label="s" value={input.s ?? ''} onChangeText={(s) => onChange({ ...input, s: optionalText(s) })} error={errors.s} hint="Empty: symbolic" testID={`${testPrefix}-s`} />
        </View>
      </View>
      <ChoiceRow label="Loop order" options={[{ value: 1, label: '1 loop' }, { value: 2, label: '2 loops' }, { value: 3, label: '3 loops' }]} value={input.loops} onChange={(loops) => onChange({ ...input, loops })} testID={`${testPrefix}-loops`} />
      <WholeNumberField label="Digits" value={input.digits} onChange={(digits) => onChange({ ...input, digits: digits as number })} error={errors.digits} testID={`${testPrefix}-digits`} />
    </View>
  );
}

const styles = StyleSheet.create({
  form: { gap: spacing.md },
  pair: { flexDirection: 'row', gap: spacing.md },
  half: { flex: 1 },
});
