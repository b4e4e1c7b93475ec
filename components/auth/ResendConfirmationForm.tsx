import { useState } from 'react';
import { View } from 'react-native';
import { resendVerificationInput } from '../../shared/api/schemas';
import { useResendVerificationMutation } from '../../hooks/api/auth';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { AuthLink } from './AuthLink';
import { checkLocally, errorsFromServer, type FormErrors } from './formErrors';
import { formStyles } from './formStyles';

/** Asks for a fresh confirmation link: an account signs in for the first time through that link. */
export function ResendConfirmationForm() {
  const [email, setEmail] = useState('');
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const resend = useResendVerificationMutation();

  function submit() {
    const { data, errors: localErrors } = checkLocally(resendVerificationInput, { email });
    setErrors(localErrors);
    if (!data) return;
    resend.mutate(data, { onError: (error) => setErrors(errorsFromServer(error)) });
  }

  return (
    <View style={formStyles.form}>
      <Notice
        tone="info"
        message="A new account signs in for the first time through the link we e-mail to it, with its password. Lost the message, or the link expired? Ask for a new one."
        testID="resend-intro"
      />
      {resend.isSuccess ? <Notice tone="success" message={resend.data.message} testID="resend-sent" /> : null}
      {errors.message ? <Notice tone="error" message={errors.message} testID="resend-error" /> : null}
      <TextField label="E-mail" value={email} onChangeText={setEmail} autoComplete="email" keyboardType="email-address" error={errors.fields.email} onSubmitEditing={submit} testID="resend-email" />
      <Button label="Send a new confirmation link" onPress={submit} busy={resend.isPending} testID="resend-submit" />
      <View style={formStyles.links}>
        <AuthLink href="/sign-in" label="Back to sign in" testID="to-sign-in" />
      </View>
    </View>
  );
}
