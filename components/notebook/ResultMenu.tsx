import { useState, type ReactNode } from 'react';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { usePresentationMode } from '../ui/presentationMode';
import { ChipButton } from './ChipButton';
import { copyText } from './clipboard';

/** One thing a result can be copied as (`text` always carries every computed digit), or another action such as saving a file. */
export type CopyAction = { label: string; text: string } | { label: string; run: () => void };

/** The "⋯" button of a result: a compact trigger that stays out of the formula's way. */
export function ResultMenuButton({ open, onPress, testID }: { open: boolean; onPress: () => void; testID?: string }) {
  return (
    <Pressable
      accessibilityRole="button"
      accessibilityLabel="Copy options"
      accessibilityState={{ expanded: open }}
      onPress={onPress}
      hitSlop={6}
      testID={testID}
      style={({ pressed }) => [styles.trigger, open && styles.triggerOpen, pressed && styles.pressed]}
    >
      <Text style={[styles.triggerLabel, open && styles.triggerLabelOpen]}>⋯</Text>
    </Pressable>
  );
}

/** The copy actions of a result, shown under it when its menu is open. */
export function ResultMenuItems({ actions, testID }: { actions: CopyAction[]; testID?: string }) {
  return (
    <View style={styles.items} testID={testID}>
      {actions.map((action, index) => (
        <CopyChip key={action.label} action={action} testID={testID ? `${testID}-${index}` : undefined} />
      ))}
    </View>
  );
}

function CopyChip({ action, testID }: { action: CopyAction; testID?: string }) {
  const [copied, setCopied] = useState<boolean | null>(null);
  if ('run' in action) return <ChipButton label={action.label} onPress={action.run} testID={testID} />;
  const copy = async () => {
    setCopied(await copyText(action.text));
    setTimeout(() => setCopied(null), 1500);
  };
  return <ChipButton label={copied === null ? action.label : copied ? 'Copied' : 'Copy failed'} onPress={() => void copy()} testID={testID} />;
}

/** A result with a compact menu of copy actions in its top-right corner (none on a slide). */
export function WithResultMenu({ actions, children, testID }: { actions: CopyAction[]; children: ReactNode; testID?: string }) {
  const [open, setOpen] = useState(false);
  const presenting = usePresentationMode();
  if (presenting) return <View style={styles.wrap}>{children}</View>;
  return (
    <View style={styles.wrap}>
      <View style={styles.row}>
        <View style={styles.body}>{children}</View>
        <ResultMenuButton open={open} onPress={() => setOpen(!open)} testID={testID ? `${testID}-menu` : undefined} />
      </View>
      {open ? <ResultMenuItems actions={actions} testID={testID ? `${testID}-copy` : undefined} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.xs, alignSelf: 'stretch' },
  row: { flexDirection: 'row', alignItems: 'flex-start', gap: spacing.xs },
  body: { flex: 1, minWidth: 0 },
  trigger: { width: 32, height: 32, borderRadius: 16, alignItems: 'center', justifyContent: 'center', borderWidth: 1, borderColor: 'transparent' },
  triggerOpen: { backgroundColor: colors.slate, borderColor: colors.slate },
  pressed: { opacity: 0.8 },
  triggerLabel: { fontFamily: fonts.semibold, fontSize: 18, lineHeight: 20, color: colors.inkSoft },
  triggerLabelOpen: { color: colors.slateText },
  items: { flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'flex-end', gap: spacing.sm },
});
