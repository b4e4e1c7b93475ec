import { StyleSheet, View } from 'react-native';
import { spacing } from '../../../constants/theme';
import type { CellInput } from '../../../shared/notebook';
import { TextField } from '../../ui/TextField';
import { optionalText, SetupChoice, type EditorProps } from './fields';

type ReferenceInput = Extract<CellInput, { kind: 'flow' | 'fixedpoints' | 'exponents' }>;

/** Flow, fixed points and exponents take everything from their model & parameters cell. */
export function ReferenceEditor({ input, errors, onChange, setupLabels, testPrefix }: EditorProps<ReferenceInput>) {
  return (
    <View style={styles.form}>
      <SetupChoice value={input.uses} setupLabels={setupLabels} onChange={(uses) => onChange({ ...input, uses: uses ?? '' })} error={errors.uses} testID={`${testPrefix}-uses`} />
      {input.kind === 'exponents' ? (
        <TextField label="Fixed point" value={input.fixedPoint ?? ''} onChangeText={(fixedPoint) => onChange({ ...input, fixedPoint: optionalText(fixedPoint) })} error={errors.fixedPoint} hint="Empty: the IR-stable non-Gaussian one" testID={`${testPrefix}-fixedPoint`} />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({ form: { gap: spacing.md } });
