import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useChangeMemberRoleMutation, useRemoveMemberMutation } from '../../hooks/api/sharing';
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

/** People and groups with a role; everyone with access may read it, only those who manage sharing get controls. */
export function MemberList({ notebookId, sharing, myId }: MemberListProps) {
  const changeRole = useChangeMemberRoleMutation(notebookId);
  const remove = useRemoveMemberMutation(notebookId);
  const manage = can(sharing.role, 'manageSharing');
  const failure = changeRole.error ?? remove.error;
  const people = sharing.members.filter((member) => member.kind === 'person');
  const groups = sharing.members.filter((member) => member.kind === 'group');
  const row = (member: NotebookMemberView) => (
    <MemberRow
      key={member.id}
      member={member}
      isMe={member.kind === 'person' && member.subjectId === myId}
      choices={manage && canManageGrant(sharing.role, member.role) ? grantableBy(sharing.role) : null}
      busy={changeRole.isPending || remove.isPending}
      onRole={(role) => changeRole.mutate({ memberId: member.id, role })}
      onRemove={() => remove.mutate(member.id)}
    />
  );
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

interface MemberRowProps {
  member: NotebookMemberView;
  isMe: boolean;
  /** Roles offered in place of the badge; null = no controls. */
  choices: ReturnType<typeof grantableBy> | null;
  busy: boolean;
  onRole: (role: ReturnType<typeof grantableBy>[number]) => void;
  onRemove: () => void;
}

function MemberRow({ member, isMe, choices, busy, onRole, onRemove }: MemberRowProps) {
  const key = memberKey(member);
  const detail = member.kind === 'group' ? 'research group' : member.email;
  return (
    <View style={styles.row} testID={`member-row-${key}`}>
      <View style={styles.text}>
        <Text style={styles.name}>
          {member.name}
          {isMe ? <Text style={styles.muted}> (you)</Text> : null}
        </Text>
        <Text style={styles.muted}>{[detail, member.grantedByName ? `added by ${member.grantedByName}` : null].filter(Boolean).join(' · ')}</Text>
      </View>
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
          <ChipButton label={isMe ? 'Leave' : 'Remove'} tone="danger" disabled={busy} onPress={onRemove} testID={`member-remove-${key}`} />
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
  controls: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.xs },
});
