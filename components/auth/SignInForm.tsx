import { useState } from 'react';
import { View } from 'react-native';
import { signInInput } from '../../shared/api/schemas';
import { useSignInMutation } from '../../hooks/api/auth';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { AuthLink } from './AuthLink';
import { checkLocally, errorsFromServer, type FormErrors } from './formErrors';
import { formStyles } from './formStyles';

export function SignInForm({ onSignedIn }: { onSignedIn: () => void }) {
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const signIn = useSignInMutation();

  function submit() {
    const { data, errors: localErrors } = checkLocally(signInInput, { email, password });
    setErrors(localErrors);
    if (!data) return;
    signIn.mutate(data, { onSuccess: onSignedIn, onError: (error) => setErrors(errorsFromServer(error)) });
  }

  return (
    <View style={formStyles.form}>
      {errors.message ? <Notice tone="error" message={errors.message} testID="sign-in-error" /> : null}
      <TextField label="E-mail" value={email} onChangeText={setEmail} autoComplete="email" keyboardType="email-address" error={errors.fields.email} testID="sign-in-email" />
      <TextField label="Password" value={password} onChangeText={setPassword} secureTextEntry autoComplete="current-password" error={errors.fields.password} onSubmitEditing={submit} testID="sign-in-password" />
      <Button label="Sign in" onPress={submit} busy={signIn.isPending} testID="sign-in-submit" />
      <View style={formStyles.links}>
        <AuthLink href="/forgot-password" label="Forgot your password?" testID="to-forgot" />
        <AuthLink href="/sign-up" label="New here? Create an account" testID="to-sign-up" />
        <AuthLink href="/resend-confirmation" label="Not confirmed yet? Resend the confirmation e-mail" testID="to-resend" />
      </View>
    </View>
  );
}
