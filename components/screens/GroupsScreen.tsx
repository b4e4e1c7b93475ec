import { useState } from 'react';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { router } from 'expo-router';
import { colors, fonts, spacing } from '../../constants/theme';
import { useCreateGroupMutation, useGroupsQuery } from '../../hooks/api/groups';
import { createGroupInput } from '../../shared/api/schemas';
import { checkLocally, errorsFromServer, type FormErrors } from '../auth/formErrors';
import { Button } from '../ui/Button';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { ScreenBody } from '../ui/ScreenBody';
import { TextField } from '../ui/TextField';

export function GroupsScreen() {
  const groups = useGroupsQuery();
  return (
    <ScreenBody title="Research groups" subtitle="Groups share notebooks. Leads decide who is in.">
      {groups.isError ? <Notice tone="error" message={groups.error.message} /> : null}
      {groups.data?.length === 0 ? <Notice tone="info" message="You are not in a research group yet. Start one below, or ask a lead to add you." /> : null}
      {groups.data?.map((group) => (
        <Pressable key={group.id} accessibilityRole="link" onPress={() => router.push(`/groups/${group.id}`)} testID={`group-${group.id}`}>
          <Card>
            <Text style={styles.name}>{group.name}</Text>
            {group.description ? <Text style={styles.description}>{group.description}</Text> : null}
            <Text style={styles.meta}>
              {group.memberCount} {group.memberCount === 1 ? 'member' : 'members'}
              {group.myRole ? ` · you are ${group.myRole === 'lead' ? 'a lead' : 'a member'}` : ''}
            </Text>
          </Card>
        </Pressable>
      ))}
      <CreateGroupCard />
    </ScreenBody>
  );
}

function CreateGroupCard() {
  const [name, setName] = useState('');
  const [description, setDescription] = useState('');
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const create = useCreateGroupMutation();

  function submit() {
    const { data, errors: localErrors } = checkLocally(createGroupInput, { name, description });
    setErrors(localErrors);
    if (!data) return;
    create.mutate(data, {
      onSuccess: () => {
        setName('');
        setDescription('');
      },
      onError: (error) => setErrors(errorsFromServer(error)),
    });
  }

  return (
    <Card>
      <Text style={styles.name}>Start a group</Text>
      {errors.message ? <Notice tone="error" message={errors.message} /> : null}
      <View style={styles.form}>
        <TextField label="Group name" value={name} onChangeText={setName} error={errors.fields.name} testID="group-name" />
        <TextField label="What the group works on" value={description} onChangeText={setDescription} error={errors.fields.description} testID="group-description" />
        <Button label="Create group" onPress={submit} busy={create.isPending} testID="group-create" />
      </View>
    </Card>
  );
}

const styles = StyleSheet.create({
  name: { fontFamily: fonts.semibold, fontSize: 17, color: colors.ink },
  description: { fontFamily: fonts.regular, fontSize: 14, color: colors.inkSoft, lineHeight: 21 },
  meta: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  form: { gap: spacing.md },
});
