import { useState } from 'react';
import { Text, View } from 'react-native';
import { changeNameInput } from '../../shared/api/account';
import type { PublicUser } from '../../shared/api/schemas';
import { useChangeNameMutation } from '../../hooks/api/auth';
import { checkLocally, errorsFromServer, type FormErrors } from '../auth/formErrors';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { accountStyles } from './accountStyles';

export function NameForm({ user }: { user: PublicUser }) {
  const [name, setName] = useState(user.name);
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const change = useChangeNameMutation();

  function submit() {
    const { data, errors: found } = checkLocally(changeNameInput, { name });
    setErrors(found);
    if (data) change.mutate(data, { onError: (error) => setErrors(errorsFromServer(error)) });
  }

  return (
    <View style={accountStyles.section} testID="account-name">
      <Text style={accountStyles.heading} accessibilityRole="header">Name</Text>
      <Text style={accountStyles.explain}>How other people see you in groups, comments and shared notebooks.</Text>
      {errors.message ? <Notice tone="error" message={errors.message} testID="account-name-error" /> : null}
      {change.isSuccess && !errors.message ? <Notice tone="success" message="Name saved." testID="account-name-saved" /> : null}
      <TextField label="Name" value={name} onChangeText={setName} error={errors.fields.name} onSubmitEditing={submit} testID="account-name-field" />
      <View style={accountStyles.actions}>
        <Button label="Save name" onPress={submit} busy={change.isPending} disabled={name.trim() === user.name} testID="account-name-save" />
      </View>
    </View>
  );
}
