import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { cellKinds, cellKindTitles, type CellKind } from '../../shared/notebook';
import { ChipButton } from './ChipButton';

/** The kinds a new cell can be, one tap each. */
export function AddCellBar({ onAdd, busy, onClose }: { onAdd: (kind: CellKind) => void; busy: boolean; onClose?: () => void }) {
  return (
    <View style={styles.bar} testID="add-cell-kinds">
      <Text style={styles.title}>Add a cell</Text>
      <View style={styles.kinds}>
        {cellKinds.map((kind) => (
          <ChipButton key={kind} label={cellKindTitles[kind]} disabled={busy} onPress={() => onAdd(kind)} testID={`add-cell-${kind}`} />
        ))}
        {onClose ? <ChipButton label="Not now" onPress={onClose} testID="add-cell-close" /> : null}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  bar: { gap: spacing.sm, padding: spacing.md, borderRadius: 8, borderWidth: 1, borderStyle: 'dashed', borderColor: colors.amber, backgroundColor: colors.amberWash },
  title: { fontFamily: fonts.semibold, fontSize: 14, color: colors.amberDeep },
  kinds: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm },
});
