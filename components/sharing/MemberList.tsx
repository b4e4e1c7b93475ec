import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { router } from 'expo-router';
import { colors, fonts, spacing } from '../../constants/theme';
import { useChangeMemberRoleMutation, useLeaveNotebookMutation, useRemoveMemberMutation } from '../../hooks/api/sharing';
import { can, type NotebookMemberView, type SharingView } from '../../shared/notebook/sharing';
import { ChipButton } from '../notebook/ChipButton';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { RoleBadge } from './RoleBadge';
import { canManageGrant, grantableBy, roleLabels } from './roles';

/** A row's key in test ids: the address for a person, `group-<id>` for a group. */
export const memberKey = (member: NotebookMemberView) => (member.kind === 'person' && member.email ? member.email : `group-${member.subjectId}`);

interface MemberListProps {
  notebookId: string;
  sharing: SharingView;
  myId: string | null;
}

/**
 * People and groups with a role; everyone with access may read it, only those who manage sharing get controls.
 * One's own row offers no role change (the server refuses it) but, below owner, leaving the notebook.
 */
export function MemberList({ notebookId, sharing, myId }: MemberListProps) {
  const changeRole = useChangeMemberRoleMutation(notebookId);
  const remove = useRemoveMemberMutation(notebookId);
  const leave = useLeaveNotebookMutation(notebookId);
  const manage = can(sharing.role, 'manageSharing');
  const failure = changeRole.error ?? remove.error ?? leave.error;
  const busy = changeRole.isPending || remove.isPending || leave.isPending;
  const people = sharing.members.filter((member) => member.kind === 'person');
  const groups = sharing.members.filter((member) => member.kind === 'group');
  const row = (member: NotebookMemberView) => {
    const isMe = member.kind === 'person' && member.subjectId === myId;
    if (isMe) {
      const onLeave = () => leave.mutate(member.id, { onSuccess: (view) => { if (!view) router.replace('/notebooks'); } });
      return <MyRow key={member.id} member={member} busy={busy} onLeave={member.role === 'owner' ? null : onLeave} />;
    }
    return (
      <MemberRow
        key={member.id}
        member={member}
        choices={manage && canManageGrant(sharing.role, member.role) ? grantableBy(sharing.role) : null}
        busy={busy}
        onRole={(role) => changeRole.mutate({ memberId: member.id, role })}
        onRemove={() => remove.mutate(member.id)}
      />
    );
  };
  return (
    <Card testID="member-list">
      <Text style={styles.heading}>People and groups</Text>
      {failure ? <Notice tone="error" message={failure.message} testID="member-error" /> : null}
      {people.map(row)}
      {groups.length ? <Text style={styles.subheading}>Groups — every member gets the group’s role</Text> : null}
      {groups.map(row)}
    </Card>
  );
}

function MemberText({ member, isMe }: { member: NotebookMemberView; isMe: boolean }) {
  const detail = member.kind === 'group' ? 'research group' : member.email;
  return (
    <View style={styles.text}>
      <Text style={styles.name}>
        {member.name}
        {isMe ? <Text style={styles.muted}> (you)</Text> : null}
      </Text>
      <Text style={styles.muted}>{[detail, member.grantedByName ? `added by ${member.grantedByName}` : null].filter(Boolean).join(' · ')}</Text>
    </View>
  );
}

/** The caller's own grant: the role as a badge, and "Leave" (after a confirmation) unless they own the notebook. */
function MyRow({ member, busy, onLeave }: { member: NotebookMemberView; busy: boolean; onLeave: (() => void) | null }) {
  const [confirming, setConfirming] = useState(false);
  const key = memberKey(member);
  return (
    <View style={styles.row} testID={`member-row-${key}`}>
      <MemberText member={member} isMe />
      <View style={styles.controls}>
        <RoleBadge role={member.role} testID={`member-role-${key}`} />
        {onLeave && !confirming ? <ChipButton label="Leave" tone="danger" disabled={busy} onPress={() => setConfirming(true)} testID="member-leave" /> : null}
      </View>
      {onLeave && confirming ? (
        <View style={styles.confirm} testID="member-leave-question">
          <Text style={styles.muted}>Leave this notebook? You lose the access this grant gives you; someone who shares it can add you again.</Text>
          <View style={styles.controls}>
            <ChipButton label={busy ? 'Leaving…' : 'Yes, leave'} tone="danger" disabled={busy} onPress={onLeave} testID="member-leave-confirm" />
            <ChipButton label="Stay" disabled={busy} onPress={() => setConfirming(false)} testID="member-leave-cancel" />
          </View>
        </View>
      ) : null}
    </View>
  );
}

interface MemberRowProps {
  member: NotebookMemberView;
  /** Roles offered in place of the badge; null = no controls. */
  choices: ReturnType<typeof grantableBy> | null;
  busy: boolean;
  onRole: (role: ReturnType<typeof grantableBy>[number]) => void;
  onRemove: () => void;
}

function MemberRow({ member, choices, busy, onRole, onRemove }: MemberRowProps) {
  const key = memberKey(member);
  return (
    <View style={styles.row} testID={`member-row-${key}`}>
      <MemberText member={member} isMe={false} />
      {choices ? (
        <View style={styles.controls}>
          {choices.map((role) => (
            <ChipButton
              key={role}
              label={roleLabels[role]}
              selected={member.role === role}
              disabled={busy}
              onPress={() => member.role !== role && onRole(role)}
              accessibilityLabel={`Make ${member.name} ${roleLabels[role].toLowerCase()}`}
              testID={`member-role-${key}-${role}`}
            />
          ))}
          <ChipButton label="Remove" tone="danger" disabled={busy} onPress={onRemove} testID={`member-remove-${key}`} />
        </View>
      ) : (
        <RoleBadge role={member.role} testID={`member-role-${key}`} />
      )}
    </View>
  );
}

const styles = StyleSheet.create({
  heading: { fontFamily: fonts.semibold, fontSize: 17, color: colors.ink },
  subheading: { fontFamily: fonts.medium, fontSize: 14, color: colors.inkSoft, marginTop: spacing.sm },
  row: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', justifyContent: 'space-between', gap: spacing.sm, paddingVertical: spacing.sm, borderTopWidth: 1, borderTopColor: colors.rule },
  text: { flexShrink: 1, flexGrow: 1, gap: 2, minWidth: 160 },
  name: { fontFamily: fonts.medium, fontSize: 15, color: colors.ink },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  controls: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: spacing.xs },
  confirm: { width: '100%', gap: spacing.xs },
});
