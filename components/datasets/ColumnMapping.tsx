import { StyleSheet, View } from 'react-native';
import { spacing } from '../../constants/theme';
import { ChoiceRow } from '../notebook/ChoiceRow';
import { Notice } from '../ui/Notice';
import type { MappingDraft, YErrorKind } from './draft';

const ERROR_KINDS: { value: YErrorKind; label: string }[] = [
  { value: 'none', label: 'None' },
  { value: 'symmetric', label: '± one column' },
  { value: 'asymmetric', label: 'Lower & upper columns' },
];

/** How a column is offered: its name, or its position when the table has no header. */
export function columnTitle(name: string, index: number): string {
  const trimmed = name.trim();
  const title = trimmed && !/^column\s*\d+$/i.test(trimmed) ? trimmed : `Column ${index + 1}`;
  return title.length > 24 ? `${title.slice(0, 23)}…` : title;
}

interface ColumnMappingProps {
  columns: string[];
  mapping: MappingDraft;
  onChange: (mapping: MappingDraft) => void;
  errors: Record<string, string>;
}

/** Which column is x, which is y, and where the errors are. */
export function ColumnMapping({ columns, mapping, onChange, errors }: ColumnMappingProps) {
  const options = columns.map((name, index) => ({ value: index, label: columnTitle(name, index) }));
  const set = (change: Partial<MappingDraft>) => onChange({ ...mapping, ...change });
  const error = errors['mapping.y'] ?? errors['mapping.x'] ?? errors['mapping.yError'] ?? errors['mapping.xError'] ?? errors.mapping;
  return (
    <View style={styles.wrap}>
      <View testID="dataset-x-column">
        <ChoiceRow label="x column" options={options} value={mapping.x} onChange={(x) => set({ x })} testID="dataset-x-column" />
      </View>
      <View testID="dataset-y-column">
        <ChoiceRow label="y column" options={options} value={mapping.y} onChange={(y) => set({ y })} testID="dataset-y-column" />
      </View>
      <View testID="dataset-yerror-kind">
        <ChoiceRow label="Errors of y" options={ERROR_KINDS} value={mapping.yErrorKind} onChange={(yErrorKind) => set({ yErrorKind })} testID="dataset-yerror-kind" />
      </View>
      {mapping.yErrorKind === 'symmetric' ? (
        <View testID="dataset-yerror-column">
          <ChoiceRow label="Error column (±)" options={options} value={mapping.yError} onChange={(yError) => set({ yError })} testID="dataset-yerror-column" />
        </View>
      ) : null}
      {mapping.yErrorKind === 'asymmetric' ? (
        <>
          <View testID="dataset-yerror-lower">
            <ChoiceRow label="Lower error column (distance below y)" options={options} value={mapping.yErrorLower} onChange={(yErrorLower) => set({ yErrorLower })} testID="dataset-yerror-lower" />
          </View>
          <View testID="dataset-yerror-upper">
            <ChoiceRow label="Upper error column (distance above y)" options={options} value={mapping.yErrorUpper} onChange={(yErrorUpper) => set({ yErrorUpper })} testID="dataset-yerror-upper" />
          </View>
        </>
      ) : null}
      <View testID="dataset-xerror-column">
        <ChoiceRow<number | 'none'>
          label="Errors of x (optional)"
          options={[{ value: 'none', label: 'None' }, ...options]}
          value={mapping.xError ?? 'none'}
          onChange={(xError) => set({ xError: xError === 'none' ? null : xError })}
          testID="dataset-xerror-column"
        />
      </View>
      {error ? <Notice tone="error" message={error} testID="dataset-mapping-error" /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.md },
});
