import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import type { CellState, RunView } from '../../shared/notebook';

export const stateWords: Record<CellState, string> = {
  text: 'Text',
  'never-run': 'Not run yet',
  'up-to-date': 'Up to date',
  'out-of-date': 'Out of date',
  failed: 'Failed',
  running: 'Running',
  'broken-reference': 'Missing reference',
};

export const stateColor: Record<CellState, string> = {
  text: colors.inkFaint,
  'never-run': colors.inkFaint,
  'up-to-date': colors.success,
  'out-of-date': colors.amberDeep,
  failed: colors.danger,
  running: colors.amber,
  'broken-reference': colors.danger,
};

/** "Waiting — 2 ahead" for a run still in the queue; null for any other run. */
export function queueWords(run: RunView | null | undefined): string | null {
  if (run?.status !== 'queued') return null;
  const ahead = run.queue?.ahead ?? 0;
  return ahead === 0 ? 'Waiting — next' : `Waiting — ${ahead} ahead`;
}

export function CellStateBadge({ state, run, testID }: { state: CellState; run?: RunView | null; testID?: string }) {
  if (state === 'text') return null;
  const words = (state === 'running' && queueWords(run)) || stateWords[state];
  return (
    <View style={[styles.badge, { borderColor: stateColor[state] }]} testID={testID} accessibilityLabel={`State: ${words}`}>
      <View style={[styles.dot, { backgroundColor: stateColor[state] }]} />
      <Text style={[styles.text, { color: stateColor[state] }]}>{words}</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  badge: { flexDirection: 'row', alignItems: 'center', gap: spacing.xs, borderWidth: 1, borderRadius: 10, paddingHorizontal: spacing.sm, paddingVertical: 2 },
  dot: { width: 7, height: 7, borderRadius: 4 },
  text: { fontFamily: fonts.medium, fontSize: 12 },
});
