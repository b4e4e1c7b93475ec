import { View } from 'react-native';
import { AXIS_KINDS, AXIS_NAMES, type AxisKind } from '../../shared/notebook/datasets';
import { ChoiceRow } from '../notebook/ChoiceRow';
import { TextField } from '../ui/TextField';
import type { AxisDraft } from './draft';

const OPTIONS = AXIS_KINDS.map((kind) => ({ value: kind, label: kind === 'other' ? 'Other…' : AXIS_NAMES[kind] }));

/** What an axis measures: one of the listed quantities, or a name of the person's own. */
export function AxisPicker({ title, axis, onChange, error, testID }: { title: string; axis: AxisDraft; onChange: (axis: AxisDraft) => void; error?: string; testID: string }) {
  return (
    <View testID={testID}>
      <ChoiceRow<AxisKind> label={title} options={OPTIONS} value={axis.kind} onChange={(kind) => onChange({ ...axis, kind })} testID={testID} />
      {axis.kind === 'other' ? (
        <TextField label="Name of this axis" value={axis.label} onChangeText={(label) => onChange({ ...axis, label })} error={error} testID={`${testID}-label`} />
      ) : null}
    </View>
  );
}
