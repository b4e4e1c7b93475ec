import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { ChipButton } from '../notebook/ChipButton';
import type { PresenterFollow } from './useFollowPresenter';

/** "<name> is presenting — Follow", or what the followed presenter shows now. */
export function PresenterBar({ follow, cellLabel }: { follow: PresenterFollow; cellLabel: string | null }) {
  const { presenter, following, endedName } = follow;
  if (!presenter) {
    if (!endedName) return null;
    return (
      <View style={[styles.bar, styles.ended]} testID="presenter-ended" accessibilityLiveRegion="polite">
        <Text style={styles.text}>{endedName} stopped presenting.</Text>
      </View>
    );
  }
  const where = cellLabel ? ` — at ${cellLabel}` : '';
  return (
    <View style={[styles.bar, following && styles.following]} testID="presenter-bar" accessibilityLiveRegion="polite">
      <Text style={[styles.text, following && styles.followingText]} numberOfLines={2}>
        {following ? `Following ${presenter.name}${where}` : `${presenter.name} is presenting${where}`}
      </Text>
      {following ? (
        <ChipButton label="Stop following" onPress={follow.stopFollowing} testID="stop-following" />
      ) : (
        <ChipButton label="Follow" tone="accent" onPress={follow.follow} testID="follow-presenter" />
      )}
    </View>
  );
}

/** Shown to the presenter: others may be following. */
export function PresentingNote({ followers }: { followers: number }) {
  const who = followers === 0 ? 'Nobody else has the notebook open yet' : followers === 1 ? '1 other person has the notebook open and can follow' : `${followers} others have the notebook open and can follow`;
  return (
    <View style={[styles.bar, styles.following]} testID="presenting-self">
      <Text style={[styles.text, styles.followingText]}>You are presenting. {who}.</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  bar: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: spacing.md, paddingVertical: spacing.sm, paddingHorizontal: spacing.lg, backgroundColor: colors.amberWash, borderBottomWidth: 1, borderBottomColor: colors.rule },
  following: { backgroundColor: colors.slate, borderBottomColor: colors.slate },
  ended: { backgroundColor: colors.surface },
  text: { flexShrink: 1, fontFamily: fonts.medium, fontSize: 14, color: colors.ink },
  followingText: { color: colors.slateText },
});
