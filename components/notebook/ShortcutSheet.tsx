import { Modal, Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { ChipButton } from './ChipButton';
import { monoFont } from './monoFont';
import { shortcutList } from './shortcuts';

export function ShortcutSheet({ visible, onClose }: { visible: boolean; onClose: () => void }) {
  return (
    <Modal transparent visible={visible} animationType="fade" onRequestClose={onClose}>
      <Pressable style={styles.backdrop} onPress={onClose} accessibilityLabel="Close the shortcut list">
        <Pressable style={styles.sheet} onPress={() => undefined} testID="shortcut-sheet">
          <Text style={styles.title} accessibilityRole="header">Keyboard shortcuts</Text>
          {shortcutList.map((shortcut) => (
            <View key={shortcut.action} style={styles.row}>
              <Text style={styles.keys}>{shortcut.keys}</Text>
              <Text style={styles.what}>{shortcut.what}</Text>
            </View>
          ))}
          <ChipButton label="Close" onPress={onClose} testID="shortcut-sheet-close" />
        </Pressable>
      </Pressable>
    </Modal>
  );
}

const styles = StyleSheet.create({
  backdrop: { flex: 1, backgroundColor: 'rgba(28,34,48,0.45)', alignItems: 'center', justifyContent: 'center', padding: spacing.lg },
  sheet: { width: '100%', maxWidth: 460, backgroundColor: colors.surface, borderRadius: 10, padding: spacing.xl, gap: spacing.md, alignItems: 'flex-start' },
  title: { fontFamily: fonts.semibold, fontSize: 18, color: colors.ink },
  row: { flexDirection: 'row', gap: spacing.lg, alignItems: 'center' },
  keys: { width: 150, fontFamily: monoFont, fontSize: 13, color: colors.slate, backgroundColor: colors.paper, paddingHorizontal: spacing.sm, paddingVertical: 2, borderRadius: 4 },
  what: { flex: 1, fontFamily: fonts.regular, fontSize: 14, color: colors.inkSoft },
});
