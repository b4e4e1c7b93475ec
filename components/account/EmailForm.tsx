import { useState } from 'react';
import { Text, View } from 'react-native';
import { changeEmailInput } from '../../shared/api/account';
import type { PublicUser } from '../../shared/api/schemas';
import { useChangeEmailMutation } from '../../hooks/api/auth';
import { checkLocally, errorsFromServer, type FormErrors } from '../auth/formErrors';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { accountStyles } from './accountStyles';

export function EmailForm({ user }: { user: PublicUser }) {
  const [email, setEmail] = useState('');
  const [currentPassword, setCurrentPassword] = useState('');
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const change = useChangeEmailMutation();

  function submit() {
    const { data, errors: found } = checkLocally(changeEmailInput, { email, currentPassword });
    setErrors(found);
    if (!data) return;
    change.mutate(data, { onSuccess: () => setCurrentPassword(''), onError: (error) => setErrors(errorsFromServer(error)) });
  }

  return (
    <View style={accountStyles.section} testID="account-email">
      <Text style={accountStyles.heading} accessibilityRole="header">E-mail address</Text>
      <Text style={accountStyles.explain}>
        You sign in with {user.email}. A new address is used only after you open the link we send to it; your current address is told when it changes.
      </Text>
      {errors.message ? <Notice tone="error" message={errors.message} testID="account-email-error" /> : null}
      {change.isSuccess && !errors.message ? <Notice tone="info" message={change.data.message} testID="account-email-sent" /> : null}
      <TextField label="New e-mail address" value={email} onChangeText={setEmail} keyboardType="email-address" autoComplete="email" error={errors.fields.email} testID="account-email-new" />
      <TextField label="Current password" value={currentPassword} onChangeText={setCurrentPassword} secureTextEntry autoComplete="current-password" error={errors.fields.currentPassword} onSubmitEditing={submit} testID="account-email-password" />
      <View style={accountStyles.actions}>
        <Button label="Send confirmation link" onPress={submit} busy={change.isPending} testID="account-email-save" />
      </View>
    </View>
  );
}
