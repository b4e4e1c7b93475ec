import { StyleSheet, View } from 'react-native';
import { colors } from '../../constants/theme';

/** Share done of a running job, 0..1. */
export function ProgressBar({ progress, testID }: { progress: number; testID?: string }) {
  const share = Math.min(1, Math.max(0, Number.isFinite(progress) ? progress : 0));
  return (
    <View style={styles.track} accessibilityRole="progressbar" accessibilityValue={{ min: 0, max: 100, now: Math.round(share * 100) }} testID={testID}>
      <View style={[styles.fill, { width: `${Math.max(share * 100, 3)}%` }]} />
    </View>
  );
}

const styles = StyleSheet.create({
  track: { height: 6, borderRadius: 3, backgroundColor: colors.amberWash, overflow: 'hidden' },
  fill: { height: 6, borderRadius: 3, backgroundColor: colors.amber },
});
