import { StyleSheet, Text } from 'react-native';
import { colors } from '../../constants/theme';
import { View } from 'react-native';
import type { TextChange, ValueDifferences } from '../../shared/notebook';
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

const size = (chars: number) => (chars < 1000 ? `${chars} characters` : `${(chars / 1000).toFixed(chars < 10_000 ? 1 : 0)} kB`);

/**
 * A part too large to diff line by line: how large each side is, how many values differ, and the first
 * of them as path: before → after.
 */
export function ValueChangesSummary({ values, testID }: { values: ValueDifferences; testID?: string }) {
  const counted = values.complete ? `${values.changed} ${values.changed === 1 ? 'value differs' : 'values differ'}` : `at least ${values.changed} values differ (compared as far as the size limit allows)`;
  return (
    <View style={styles.summary} testID={testID}>
      <Text style={styles.note} testID={testID ? `${testID}-note` : undefined}>
        Too large to compare line by line ({size(values.sizeBefore)} → {size(values.sizeAfter)}); summarised: {counted}.
      </Text>
      {values.listed.length ? (
        <Text style={styles.block} selectable>
          {values.listed.map((change, index) => (
            <Text key={index}>
              {change.path}: <Text style={styles.removed}>{change.before ?? '—'}</Text> → <Text style={styles.added}>{change.after ?? '—'}</Text>
              {index < values.listed.length - 1 ? '\n' : ''}
            </Text>
          ))}
        </Text>
      ) : null}
      {values.more > 0 ? <Text style={styles.note}>… and {values.more} more.</Text> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  summary: { gap: 6 },
  note: { fontSize: 13, color: colors.inkSoft },
  block: { fontFamily: monoFont, fontSize: 12, lineHeight: 18, color: colors.inkSoft, backgroundColor: colors.paper, padding: 10, borderRadius: 6, borderWidth: 1, borderColor: colors.rule },
  added: { backgroundColor: colors.successWash, color: colors.success },
  removed: { backgroundColor: colors.dangerWash, color: colors.danger, textDecorationLine: 'line-through' },
});
