import { router } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { spacing } from '../../constants/theme';
import { useActivityQuery, useMarkActivityReadMutation } from '../../hooks/api/activity';
import type { NotificationView } from '../../shared/notebook/sharing';
import { ActivityItem } from '../activity/ActivityItem';
import { newestFirst } from '../activity/activityLinks';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { ScreenBody } from '../ui/ScreenBody';

/** Mentions, replies, invitations and changes to notebooks I follow, newest first. */
export function ActivityScreen() {
  const activity = useActivityQuery();
  const markRead = useMarkActivityReadMutation();
  const unread = activity.data?.unread ?? 0;
  const open = (item: NotificationView, href: string) => {
    if (!item.read) markRead.mutate([item.id]);
    router.push(href);
  };

  return (
    <ScreenBody
      title="Activity"
      subtitle={unread ? `${unread} unread` : 'Mentions, replies, invitations and changes to notebooks you follow.'}
      actions={unread ? <Button label="Mark all read" variant="quiet" busy={markRead.isPending} onPress={() => markRead.mutate(undefined)} testID="activity-mark-all-read" /> : null}
    >
      {activity.isError ? <Notice tone="error" message={activity.error.message} /> : null}
      {markRead.error ? <Notice tone="error" message={markRead.error.message} /> : null}
      {activity.data?.items.length === 0 ? <Notice tone="info" message="Nothing yet. When someone mentions you, replies to you or shares a notebook with you, it shows up here." testID="activity-empty" /> : null}
      <View style={styles.list} testID="activity-list">
        {newestFirst(activity.data?.items ?? []).map((item) => (
          <ActivityItem key={item.id} item={item} onOpen={open} />
        ))}
      </View>
    </ScreenBody>
  );
}

const styles = StyleSheet.create({
  list: { gap: spacing.sm },
});
