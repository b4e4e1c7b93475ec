import { Pressable, ScrollView, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { cellKindTitles, type CellView } from '../../shared/notebook';
import { stateColor, stateWords } from './CellStateBadge';

interface NotebookOutlineProps {
  cells: CellView[];
  selectedId: string | null;
  onPick: (cell: CellView) => void;
  /** The cell someone presents now, marked in the list. */
  presenterCellId?: string | null;
}

/** Wide screens: every cell in a column beside the notebook, with its state; a tap jumps to it. */
export function NotebookOutline({ cells, selectedId, onPick, presenterCellId = null }: NotebookOutlineProps) {
  return (
    <View style={styles.outline} testID="notebook-outline" role="navigation" aria-label="Cells of this notebook">
      <Text style={styles.heading}>Cells</Text>
      <ScrollView contentContainerStyle={styles.list}>
        {cells.map((cell, index) => (
          <Pressable key={cell.id} onPress={() => onPick(cell)} style={[styles.item, cell.id === selectedId && styles.itemSelected]} testID={`outline-${cell.label}`} accessibilityRole="link">
            <Text style={styles.number}>{index + 1}</Text>
            <View style={styles.itemText}>
              <Text style={styles.label} numberOfLines={1}>{cell.label}</Text>
              <Text style={styles.kind} numberOfLines={1}>{cellKindTitles[cell.kind]}</Text>
            </View>
            {cell.id === presenterCellId ? <Text style={styles.presenting} testID={`outline-${cell.label}-presenting`}>presenting</Text> : null}
            {cell.state !== 'text' && cell.kind !== 'setup' ? <View style={[styles.dot, { backgroundColor: stateColor[cell.state] }]} accessibilityLabel={stateWords[cell.state]} /> : null}
          </Pressable>
        ))}
      </ScrollView>
    </View>
  );
}

const styles = StyleSheet.create({
  outline: { width: 240, borderRightWidth: 1, borderRightColor: colors.rule, backgroundColor: colors.surface, paddingTop: spacing.xl },
  heading: { fontFamily: fonts.semibold, fontSize: 13, color: colors.inkFaint, textTransform: 'uppercase', letterSpacing: 1, paddingHorizontal: spacing.lg, marginBottom: spacing.sm },
  list: { paddingHorizontal: spacing.sm, paddingBottom: spacing.xl, gap: 2 },
  item: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm, paddingVertical: spacing.sm, paddingHorizontal: spacing.sm, borderRadius: 6 },
  itemSelected: { backgroundColor: colors.amberWash },
  number: { width: 20, fontFamily: fonts.medium, fontSize: 12, color: colors.inkFaint, textAlign: 'right' },
  itemText: { flex: 1, minWidth: 0 },
  label: { fontFamily: fonts.medium, fontSize: 14, color: colors.ink },
  kind: { fontFamily: fonts.regular, fontSize: 12, color: colors.inkFaint },
  presenting: { fontFamily: fonts.semibold, fontSize: 10, letterSpacing: 0.6, textTransform: 'uppercase', color: colors.amberDeep },
  dot: { width: 8, height: 8, borderRadius: 4 },
});
