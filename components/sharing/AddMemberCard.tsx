import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useGroupsQuery } from '../../hooks/api/groups';
import { useAddMemberMutation } from '../../hooks/api/sharing';
import type { GrantableRole, NotebookRole, SharingView } from '../../shared/notebook/sharing';
import { addNotebookMemberInput } from '../../shared/notebook/sharing';
import { checkLocally, errorsFromServer, type FormErrors } from '../auth/formErrors';
import { ChipButton } from '../notebook/ChipButton';
import { Button } from '../ui/Button';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { RolePicker } from './RolePicker';
import { grantableBy, roleHints, roleLabels } from './roles';

const noErrors: FormErrors = { fields: {} };

/** The weakest useful default: commenting, unless the caller may only hand out viewing. */
const defaultRole = (roles: GrantableRole[]): GrantableRole => (roles.includes('commenter') ? 'commenter' : roles[0]);

/** Add a person by address: someone without an account gets an invitation that carries the role. */
export function AddPersonCard({ notebookId, callerRole }: { notebookId: string; callerRole: NotebookRole }) {
  const roles = grantableBy(callerRole);
  const [email, setEmail] = useState('');
  const [role, setRole] = useState<GrantableRole>(defaultRole(roles));
  const [errors, setErrors] = useState<FormErrors>(noErrors);
  const [done, setDone] = useState<string | null>(null);
  const add = useAddMemberMutation(notebookId);
  const submit = () => {
    setDone(null);
    const { data, errors: local } = checkLocally(addNotebookMemberInput, { email, role });
    setErrors(local);
    if (!data || !('email' in data)) return;
    add.mutate(data, {
      onSuccess: (view) => {
        setDone(outcomeOf(view ?? null, data.email, data.role));
        setEmail('');
      },
      onError: (error) => setErrors(errorsFromServer(error)),
    });
  };
  return (
    <Card testID="share-person">
      <Text style={styles.heading}>Add a person</Text>
      {errors.message && !errors.fields.email ? <Notice tone="error" message={errors.message} testID="share-error" /> : null}
      {done ? <Notice tone="success" message={done} testID="share-done" /> : null}
      <TextField
        label="Their e-mail"
        value={email}
        onChangeText={setEmail}
        keyboardType="email-address"
        autoComplete="email"
        error={errors.fields.email}
        hint="Someone without a Rungbook account gets an invitation."
        onSubmitEditing={submit}
        testID="share-email"
      />
      <RolePicker label="Role" roles={roles} value={role} onChange={setRole} testID="share-role" />
      <Text style={styles.muted} testID="share-role-hint">{roleLabels[role]}: {roleHints[role]}.</Text>
      <Button label="Share" onPress={submit} busy={add.isPending} testID="share-add" />
    </Card>
  );
}

function outcomeOf(view: SharingView | null, email: string, role: GrantableRole): string {
  const invited = view?.invitations.some((invitation) => invitation.email.toLowerCase() === email.toLowerCase());
  return invited
    ? `We e-mailed an invitation to ${email}. They become ${roleLabels[role].toLowerCase()} once they sign up and confirm the address.`
    : `${email} is now ${roleLabels[role].toLowerCase()} on this notebook.`;
}

/** Share with one of my research groups: each of its members gets the role. */
export function AddGroupCard({ notebookId, sharing }: { notebookId: string; sharing: SharingView }) {
  const roles = grantableBy(sharing.role);
  const groups = useGroupsQuery();
  const [groupId, setGroupId] = useState<string | null>(null);
  const [role, setRole] = useState<GrantableRole>(defaultRole(roles));
  const add = useAddMemberMutation(notebookId);
  const granted = new Set(sharing.members.filter((member) => member.kind === 'group').map((member) => member.subjectId));
  const available = (groups.data ?? []).filter((group) => !granted.has(group.id));
  const submit = () => groupId && add.mutate({ groupId, role }, { onSuccess: () => setGroupId(null) });
  return (
    <Card testID="share-group">
      <Text style={styles.heading}>Share with a group</Text>
      {groups.isError ? <Notice tone="error" message={groups.error.message} /> : null}
      {add.error ? <Notice tone="error" message={add.error.message} testID="share-group-error" /> : null}
      {groups.data && available.length === 0 ? (
        <Text style={styles.muted} testID="share-group-none">
          {groups.data.length === 0 ? 'You are in no research group.' : 'Every group you are in already has a role here.'}
        </Text>
      ) : null}
      {available.length ? (
        <>
          <View style={styles.chips} accessibilityRole="radiogroup" accessibilityLabel="Group">
            {available.map((group) => (
              <ChipButton key={group.id} label={group.name} selected={group.id === groupId} onPress={() => setGroupId(group.id)} testID={`share-group-${group.id}`} />
            ))}
          </View>
          <RolePicker label="Role for every member" roles={roles} value={role} onChange={setRole} testID="share-group-role" />
          <Button label="Share with the group" onPress={submit} disabled={!groupId} busy={add.isPending} testID="share-group-add" />
        </>
      ) : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  heading: { fontFamily: fonts.semibold, fontSize: 17, color: colors.ink },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm },
});
