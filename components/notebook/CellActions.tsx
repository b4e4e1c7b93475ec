import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, spacing } from '../../constants/theme';
import { ChipButton } from './ChipButton';

interface CellActionsProps {
  wide: boolean;
  testPrefix: string;
  canRun: boolean;
  running: boolean;
  /** The cell's run waits in the queue for a worker. */
  waiting?: boolean;
  editing: boolean;
  isFirst: boolean;
  isLast: boolean;
  onRun: () => void;
  onToggleEdit: () => void;
  onMove: (offset: -1 | 1) => void;
  onDelete: () => void;
}

/** Wide screens show every action; phones keep Run at hand and fold the rest into a small menu. */
export function CellActions({ wide, testPrefix, canRun, running, waiting = false, editing, isFirst, isLast, onRun, onToggleEdit, onMove, onDelete }: CellActionsProps) {
  const [menuOpen, setMenuOpen] = useState(false);
  const [confirmDelete, setConfirmDelete] = useState(false);
  const run = canRun ? <ChipButton label={waiting ? 'Waiting…' : running ? 'Running…' : 'Run'} tone="accent" disabled={running} onPress={onRun} testID={`${testPrefix}-run`} /> : null;
  const secondary = (
    <>
      <ChipButton label={editing ? 'Close editor' : 'Edit'} onPress={() => { onToggleEdit(); setMenuOpen(false); }} testID={`${testPrefix}-edit`} />
      <ChipButton label="Move up" disabled={isFirst} onPress={() => onMove(-1)} testID={`${testPrefix}-up`} />
      <ChipButton label="Move down" disabled={isLast} onPress={() => onMove(1)} testID={`${testPrefix}-down`} />
      {confirmDelete ? (
        <ChipButton label="Really delete" tone="danger" onPress={onDelete} testID={`${testPrefix}-delete-confirm`} />
      ) : (
        <ChipButton label="Delete" tone="danger" onPress={() => setConfirmDelete(true)} testID={`${testPrefix}-delete`} />
      )}
    </>
  );
  if (wide) {
    return (
      <View style={styles.row}>
        {run}
        {secondary}
      </View>
    );
  }
  return (
    <View style={styles.phone}>
      <View style={styles.row}>
        {run}
        <ChipButton label="⋯" accessibilityLabel="More cell actions" selected={menuOpen} onPress={() => setMenuOpen(!menuOpen)} testID={`${testPrefix}-menu`} />
      </View>
      {menuOpen ? <View style={styles.menu} testID={`${testPrefix}-menu-items`}>{secondary}</View> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm, alignItems: 'center' },
  phone: { alignItems: 'flex-end', gap: spacing.sm },
  menu: { flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'flex-end', gap: spacing.sm, padding: spacing.sm, borderRadius: 8, backgroundColor: colors.paper, borderWidth: 1, borderColor: colors.rule },
});
