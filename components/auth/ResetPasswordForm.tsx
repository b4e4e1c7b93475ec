import { useState } from 'react';
import { View } from 'react-native';
import { passwordSchema } from '../../shared/api/schemas';
import { useResetPasswordMutation } from '../../hooks/api/auth';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { AuthLink } from './AuthLink';
import { errorsFromServer, type FormErrors } from './formErrors';
import { formStyles } from './formStyles';

export function ResetPasswordForm({ token }: { token: string }) {
  const [password, setPassword] = useState('');
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const reset = useResetPasswordMutation();

  if (!token) return <Notice tone="error" message="This reset link is incomplete. Open the link from the e-mail again, or ask for a new one." />;

  function submit() {
    const checked = passwordSchema.safeParse(password);
    if (!checked.success) return setErrors({ fields: { password: checked.error.issues[0].message } });
    setErrors({ fields: {} });
    reset.mutate({ token, password }, { onError: (error) => setErrors(errorsFromServer(error)) });
  }

  if (reset.isSuccess) {
    return (
      <View style={formStyles.form}>
        <Notice tone="success" message={reset.data.message} testID="reset-done" />
        <AuthLink href="/sign-in" label="Go to sign in" testID="to-sign-in" />
      </View>
    );
  }
  return (
    <View style={formStyles.form}>
      {errors.message ? <Notice tone="error" message={errors.message} testID="reset-error" /> : null}
      <TextField label="New password" value={password} onChangeText={setPassword} secureTextEntry autoComplete="new-password" hint="At least 10 characters." error={errors.fields.password} onSubmitEditing={submit} testID="reset-password" />
      <Button label="Set new password" onPress={submit} busy={reset.isPending} testID="reset-submit" />
      <AuthLink href="/forgot-password" label="Ask for a new link" />
    </View>
  );
}
