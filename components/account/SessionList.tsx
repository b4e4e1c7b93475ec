import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import type { AccountSession } from '../../shared/api/account';
import { useEndOtherSessionsMutation, useEndSessionMutation, useSessionsQuery } from '../../hooks/api/auth';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { accountStyles } from './accountStyles';

const when = (iso: string | null) => (iso ? new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' }) : 'not recorded');

function SessionRow({ session, onEnd, ending }: { session: AccountSession; onEnd: () => void; ending: boolean }) {
  return (
    <View style={styles.row} testID={`session-${session.id}`}>
      <View style={styles.text}>
        <Text style={styles.device}>
          {session.device}
          {session.current ? <Text style={styles.current} testID="session-this-device">{'  ·  This device'}</Text> : null}
        </Text>
        <Text style={accountStyles.explain}>Signed in {when(session.createdAt)} · last seen {when(session.lastSeenAt)}</Text>
      </View>
      {session.current ? null : <Button label="End" variant="quiet" onPress={onEnd} busy={ending} testID={`session-end-${session.id}`} />}
    </View>
  );
}

export function SessionList() {
  const sessions = useSessionsQuery();
  const endOne = useEndSessionMutation();
  const endOthers = useEndOtherSessionsMutation();
  const others = (sessions.data ?? []).filter((session) => !session.current);
  const outcome = endOthers.data ?? endOne.data;
  const failure = endOthers.error ?? endOne.error ?? sessions.error;

  return (
    <View style={accountStyles.section} testID="account-sessions">
      <Text style={accountStyles.heading} accessibilityRole="header">Where you are signed in</Text>
      {failure ? <Notice tone="error" message={failure.message} testID="sessions-error" /> : null}
      {outcome && !failure ? <Notice tone="success" message={outcome.message} testID="sessions-ended" /> : null}
      {(sessions.data ?? []).map((session) => (
        <SessionRow key={session.id} session={session} ending={endOne.isPending && endOne.variables === session.id} onEnd={() => endOne.mutate(session.id)} />
      ))}
      {sessions.isSuccess && others.length === 0 ? <Text style={accountStyles.explain} testID="sessions-only-this">You are signed in only on this device.</Text> : null}
      {others.length > 0 ? (
        <View style={accountStyles.actions}>
          <Button label="Sign out everywhere else" variant="danger" onPress={() => endOthers.mutate()} busy={endOthers.isPending} testID="sessions-end-others" />
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  row: {
    flexDirection: 'row',
    flexWrap: 'wrap',
    alignItems: 'center',
    justifyContent: 'space-between',
    gap: spacing.sm,
    paddingVertical: spacing.sm,
    borderTopWidth: 1,
    borderTopColor: colors.rule,
  },
  text: { flexGrow: 1, flexShrink: 1, flexBasis: 220, gap: spacing.xs },
  device: { fontFamily: fonts.medium, fontSize: 15, color: colors.ink },
  current: { fontFamily: fonts.semibold, color: colors.amberDeep },
});
