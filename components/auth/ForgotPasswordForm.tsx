import { useState } from 'react';
import { View } from 'react-native';
import { forgotPasswordInput } from '../../shared/api/schemas';
import { useForgotPasswordMutation } from '../../hooks/api/auth';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { AuthLink } from './AuthLink';
import { checkLocally, errorsFromServer, type FormErrors } from './formErrors';
import { formStyles } from './formStyles';

export function ForgotPasswordForm() {
  const [email, setEmail] = useState('');
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const forgot = useForgotPasswordMutation();

  function submit() {
    const { data, errors: localErrors } = checkLocally(forgotPasswordInput, { email });
    setErrors(localErrors);
    if (!data) return;
    forgot.mutate(data, { onError: (error) => setErrors(errorsFromServer(error)) });
  }

  return (
    <View style={formStyles.form}>
      {forgot.isSuccess ? <Notice tone="success" message={forgot.data.message} testID="forgot-sent" /> : null}
      {errors.message ? <Notice tone="error" message={errors.message} testID="forgot-error" /> : null}
      <TextField label="E-mail" value={email} onChangeText={setEmail} autoComplete="email" keyboardType="email-address" error={errors.fields.email} onSubmitEditing={submit} testID="forgot-email" />
      <Button label="Send reset link" onPress={submit} busy={forgot.isPending} testID="forgot-submit" />
      <View style={formStyles.links}>
        <AuthLink href="/sign-in" label="Back to sign in" testID="to-sign-in" />
      </View>
    </View>
  );
}
