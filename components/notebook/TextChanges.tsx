import { StyleSheet, Text } from 'react-native';
import { colors } from '../../constants/theme';
import type { TextChange } from '../../shared/notebook';
import { monoFont } from './monoFont';

/** A diff as one block of text: additions on green, removals struck through on red. */
export function TextChanges({ changes, testID }: { changes: TextChange[]; testID?: string }) {
  return (
    <Text style={styles.block} selectable testID={testID}>
      {changes.map((change, index) => (
        <Text key={index} style={change.added ? styles.added : change.removed ? styles.removed : undefined} accessibilityLabel={change.added ? `added ${change.value}` : change.removed ? `removed ${change.value}` : undefined}>
          {change.value}
        </Text>
      ))}
    </Text>
  );
}

const styles = StyleSheet.create({
  block: { fontFamily: monoFont, fontSize: 12, lineHeight: 18, color: colors.inkSoft, backgroundColor: colors.paper, padding: 10, borderRadius: 6, borderWidth: 1, borderColor: colors.rule },
  added: { backgroundColor: colors.successWash, color: colors.success },
  removed: { backgroundColor: colors.dangerWash, color: colors.danger, textDecorationLine: 'line-through' },
});
