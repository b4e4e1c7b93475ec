import { useState } from 'react';
import { View } from 'react-native';
import { signUpInput } from '../../shared/api/schemas';
import { useSignUpMutation } from '../../hooks/api/auth';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { AuthLink } from './AuthLink';
import { checkLocally, errorsFromServer, type FormErrors } from './formErrors';
import { formStyles } from './formStyles';

interface SignUpFormProps {
  /** Filled in from an invitation link. */
  initialEmail?: string;
  /** Opened from an invitation to a notebook. */
  invited?: boolean;
}

/** Sign-up answers "check your inbox" whether or not the address is new; the e-mailed link finishes it. */
export function SignUpForm({ initialEmail = '', invited = false }: SignUpFormProps = {}) {
  const [name, setName] = useState('');
  const [email, setEmail] = useState(initialEmail);
  const [password, setPassword] = useState('');
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const signUp = useSignUpMutation();

  function submit() {
    const { data, errors: localErrors } = checkLocally(signUpInput, { name, email, password });
    setErrors(localErrors);
    if (!data) return;
    signUp.mutate(data, { onError: (error) => setErrors(errorsFromServer(error)) });
  }

  if (signUp.isSuccess) {
    return (
      <View style={formStyles.form}>
        <Notice tone="success" message={signUp.data.message} testID="sign-up-sent" />
        <View style={formStyles.links}>
          <AuthLink href="/resend-confirmation" label="No message after a few minutes? Ask for a new one" testID="to-resend" />
          <AuthLink href="/sign-in" label="Go to sign in" testID="to-sign-in" />
        </View>
      </View>
    );
  }
  return (
    <View style={formStyles.form}>
      {invited ? <Notice tone="info" message="You were invited to a notebook; it opens for you once you confirm this address" testID="sign-up-invited" /> : null}
      {errors.message ? <Notice tone="error" message={errors.message} testID="sign-up-error" /> : null}
      <TextField label="Name" value={name} onChangeText={setName} autoComplete="name" error={errors.fields.name} testID="sign-up-name" />
      <TextField label="E-mail" value={email} onChangeText={setEmail} autoComplete="email" keyboardType="email-address" error={errors.fields.email} testID="sign-up-email" />
      <TextField
        label="Password"
        value={password}
        onChangeText={setPassword}
        secureTextEntry
        autoComplete="new-password"
        hint="At least 10 characters."
        error={errors.fields.password}
        onSubmitEditing={submit}
        testID="sign-up-password"
      />
      <Button label="Create account" onPress={submit} busy={signUp.isPending} testID="sign-up-submit" />
      <View style={formStyles.links}>
        <AuthLink href="/sign-in" label="Already have an account? Sign in" testID="to-sign-in" />
      </View>
    </View>
  );
}
