import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useCancelInvitationMutation } from '../../hooks/api/sharing';
import type { PendingInvitationView } from '../../shared/notebook/sharing';
import { ChipButton } from '../notebook/ChipButton';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { RoleBadge } from './RoleBadge';

/** Invitations to addresses without an account yet; the role is granted when the address is confirmed. */
export function InvitationList({ notebookId, invitations, manage }: { notebookId: string; invitations: PendingInvitationView[]; manage: boolean }) {
  const cancel = useCancelInvitationMutation(notebookId);
  if (invitations.length === 0) return null;
  return (
    <Card testID="invitation-list">
      <Text style={styles.heading}>Waiting for sign-up</Text>
      {cancel.error ? <Notice tone="error" message={cancel.error.message} /> : null}
      {invitations.map((invitation) => (
        <View key={invitation.id} style={styles.row} testID={`invitation-row-${invitation.email}`}>
          <View style={styles.text}>
            <Text style={styles.name}>{invitation.email}</Text>
            <Text style={styles.muted}>
              invited by {invitation.invitedByName} · open until {new Date(invitation.expiresAt).toLocaleDateString()}
            </Text>
            {invitation.voidReason ? (
              <Text style={styles.muted} testID={`invitation-void-${invitation.id}`}>
                void: {invitation.voidReason} — accepting it grants nothing
              </Text>
            ) : null}
          </View>
          <View style={styles.controls}>
            <RoleBadge role={invitation.role} />
            {manage ? <ChipButton label="Cancel invitation" tone="danger" disabled={cancel.isPending} onPress={() => cancel.mutate(invitation.id)} testID={`invitation-cancel-${invitation.id}`} /> : null}
          </View>
        </View>
      ))}
    </Card>
  );
}

const styles = StyleSheet.create({
  heading: { fontFamily: fonts.semibold, fontSize: 17, color: colors.ink },
  row: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', justifyContent: 'space-between', gap: spacing.sm, paddingVertical: spacing.sm, borderTopWidth: 1, borderTopColor: colors.rule },
  text: { flexShrink: 1, flexGrow: 1, gap: 2, minWidth: 160 },
  name: { fontFamily: fonts.medium, fontSize: 15, color: colors.ink },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  controls: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm },
});
