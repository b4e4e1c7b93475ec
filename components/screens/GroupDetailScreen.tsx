import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useMeQuery } from '../../hooks/api/auth';
import { useAddMemberMutation, useChangeMemberRoleMutation, useGroupQuery, useRemoveMemberMutation } from '../../hooks/api/groups';
import type { GroupDetail, GroupMember } from '../../shared/api/schemas';
import { errorsFromServer, type FormErrors } from '../auth/formErrors';
import { Button } from '../ui/Button';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { ScreenBody } from '../ui/ScreenBody';
import { TextField } from '../ui/TextField';

export function GroupDetailScreen({ groupId }: { groupId: string }) {
  const group = useGroupQuery(groupId);
  const me = useMeQuery();
  if (group.isError) return <ScreenBody title="Research group"><Notice tone="error" message={group.error.message} /></ScreenBody>;
  if (!group.data || !me.data) return <ScreenBody title="Research group"><Text style={styles.muted}>Loading…</Text></ScreenBody>;
  const canManage = group.data.myRole === 'lead' || me.data.siteRole === 'admin';
  return (
    <ScreenBody title={group.data.name} subtitle={group.data.description}>
      <MemberList group={group.data} canManage={canManage} myId={me.data.id} />
      {canManage ? <AddMemberCard groupId={groupId} /> : null}
    </ScreenBody>
  );
}

function MemberList({ group, canManage, myId }: { group: GroupDetail; canManage: boolean; myId: string }) {
  const changeRole = useChangeMemberRoleMutation(group.id);
  const remove = useRemoveMemberMutation(group.id);
  const failure = changeRole.error ?? remove.error;
  return (
    <Card testID="member-list">
      <Text style={styles.heading}>Members</Text>
      {failure ? <Notice tone="error" message={failure.message} /> : null}
      {group.members.map((member: GroupMember) => (
        <View key={member.userId} style={styles.memberRow}>
          <View style={styles.memberText}>
            <Text style={styles.memberName}>{member.name}</Text>
            <Text style={styles.muted}>{member.email} · {member.role}</Text>
          </View>
          {canManage ? (
            <View style={styles.memberActions}>
              <Button
                variant="quiet"
                label={member.role === 'lead' ? 'Make member' : 'Make lead'}
                onPress={() => changeRole.mutate({ userId: member.userId, role: member.role === 'lead' ? 'member' : 'lead' })}
              />
              <Button variant="danger" label={member.userId === myId ? 'Leave' : 'Remove'} onPress={() => remove.mutate(member.userId)} />
            </View>
          ) : null}
        </View>
      ))}
    </Card>
  );
}

function AddMemberCard({ groupId }: { groupId: string }) {
  const [email, setEmail] = useState('');
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const add = useAddMemberMutation(groupId);
  const submit = () =>
    add.mutate({ email, role: 'member' }, { onSuccess: () => { setEmail(''); setErrors({ fields: {} }); }, onError: (e) => setErrors(errorsFromServer(e)) });
  return (
    <Card>
      <Text style={styles.heading}>Add a member</Text>
      {errors.message ? <Notice tone="error" message={errors.message} /> : null}
      <TextField label="Their Rungbook e-mail" value={email} onChangeText={setEmail} keyboardType="email-address" error={errors.fields.email} testID="member-email" />
      <Button label="Add to group" onPress={submit} busy={add.isPending} testID="member-add" />
    </Card>
  );
}

const styles = StyleSheet.create({
  heading: { fontFamily: fonts.semibold, fontSize: 17, color: colors.ink },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  memberRow: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', justifyContent: 'space-between', gap: spacing.sm, paddingVertical: spacing.sm, borderTopWidth: 1, borderTopColor: colors.rule },
  memberText: { flexShrink: 1, gap: 2 },
  memberName: { fontFamily: fonts.medium, fontSize: 15, color: colors.ink },
  memberActions: { flexDirection: 'row', gap: spacing.sm },
});
