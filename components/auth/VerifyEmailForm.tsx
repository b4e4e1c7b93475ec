import { useState } from 'react';
import { View } from 'react-native';
import { verifyEmailInput } from '../../shared/api/schemas';
import { useVerifyEmailMutation } from '../../hooks/api/auth';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { AuthLink } from './AuthLink';
import { checkLocally, errorsFromServer, type FormErrors } from './formErrors';
import { formStyles } from './formStyles';

/**
 * Opened from the e-mailed link: the account's password confirms the address (a link alone must not
 * sign anyone in to an account someone else may have set up), then hands over to the signed-in app.
 */
export function VerifyEmailForm({ token, onVerified }: { token: string; onVerified: () => void }) {
  const [password, setPassword] = useState('');
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const verify = useVerifyEmailMutation();

  if (!token) return <Notice tone="error" message="This confirmation link is incomplete. Open the link from the e-mail again." testID="verify-error" />;

  function submit() {
    const { data, errors: localErrors } = checkLocally(verifyEmailInput, { token, password });
    setErrors(localErrors);
    if (!data) return;
    verify.mutate(data, { onSuccess: onVerified, onError: (error) => setErrors(errorsFromServer(error)) });
  }

  if (verify.isSuccess) {
    return (
      <View style={formStyles.form}>
        <Notice tone="success" message={`Thank you, ${verify.data.user.name}: your address is confirmed.`} testID="verify-done" />
        <Button label="Open your notebooks" onPress={onVerified} testID="verify-continue" />
      </View>
    );
  }
  return (
    <View style={formStyles.form}>
      <Notice tone="info" message="Enter the password of your Rungbook account to confirm this address and sign in." testID="verify-intro" />
      {errors.message || errors.fields.token ? <Notice tone="error" message={errors.message ?? errors.fields.token} testID="verify-error" /> : null}
      <TextField label="Password" value={password} onChangeText={setPassword} secureTextEntry autoComplete="current-password" error={errors.fields.password} onSubmitEditing={submit} testID="verify-password" />
      <Button label="Confirm and sign in" onPress={submit} busy={verify.isPending} testID="verify-submit" />
      <View style={formStyles.links}>
        <AuthLink href="/forgot-password" label="Forgot the password, or did not sign up yourself? Set your own" testID="to-forgot" />
        <AuthLink href="/resend-confirmation" label="Link expired or already used? Ask for a new one" testID="to-resend" />
      </View>
    </View>
  );
}
