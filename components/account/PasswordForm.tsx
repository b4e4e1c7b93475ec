import { useState } from 'react';
import { Text, View } from 'react-native';
import { changePasswordInput } from '../../shared/api/account';
import { useChangePasswordMutation } from '../../hooks/api/auth';
import { checkLocally, errorsFromServer, type FormErrors } from '../auth/formErrors';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { accountStyles } from './accountStyles';

export function PasswordForm() {
  const [currentPassword, setCurrentPassword] = useState('');
  const [newPassword, setNewPassword] = useState('');
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const change = useChangePasswordMutation();

  function submit() {
    const { data, errors: found } = checkLocally(changePasswordInput, { currentPassword, newPassword });
    setErrors(found);
    if (!data) return;
    change.mutate(data, {
      onSuccess: () => {
        setCurrentPassword('');
        setNewPassword('');
      },
      onError: (error) => setErrors(errorsFromServer(error)),
    });
  }

  return (
    <View style={accountStyles.section} testID="account-password">
      <Text style={accountStyles.heading} accessibilityRole="header">Password</Text>
      <Text style={accountStyles.explain}>Changing it signs you out everywhere else; you stay signed in here.</Text>
      {errors.message ? <Notice tone="error" message={errors.message} testID="account-password-error" /> : null}
      {change.isSuccess && !errors.message ? <Notice tone="success" message={change.data.message} testID="account-password-changed" /> : null}
      <TextField label="Current password" value={currentPassword} onChangeText={setCurrentPassword} secureTextEntry autoComplete="current-password" error={errors.fields.currentPassword} testID="account-password-current" />
      <TextField label="New password" value={newPassword} onChangeText={setNewPassword} secureTextEntry autoComplete="new-password" hint="At least 10 characters." error={errors.fields.newPassword} onSubmitEditing={submit} testID="account-password-new" />
      <View style={accountStyles.actions}>
        <Button label="Change password" onPress={submit} busy={change.isPending} testID="account-password-save" />
      </View>
    </View>
  );
}
