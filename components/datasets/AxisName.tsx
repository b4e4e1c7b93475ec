import { Text } from 'react-native';
import { AXIS_NAMES, AXIS_TEX, type AxisSpec } from '../../shared/notebook/datasets';
import { Formula } from '../formula';

/** A listed quantity typeset; a label of the person's own as plain text (never read as TeX). */
export function AxisName({ axis, style }: { axis: AxisSpec; style?: object }) {
  if (axis.kind === 'other') return <Text style={style}>{axis.label}</Text>;
  return <Formula tex={AXIS_TEX[axis.kind]} label={AXIS_NAMES[axis.kind]} />;
}
