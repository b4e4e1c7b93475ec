import { useEffect, useRef } from 'react';
import { View } from 'react-native';
import { useVerifyEmailMutation } from '../../hooks/api/auth';
import { Button } from '../ui/Button';
import { Notice } from '../ui/Notice';
import { AuthLink } from './AuthLink';
import { errorsFromServer } from './formErrors';
import { formStyles } from './formStyles';

/** Opened from the e-mailed link: confirms the address once, then hands over to the signed-in app. */
export function VerifyEmailForm({ token, onVerified }: { token: string; onVerified: () => void }) {
  const verify = useVerifyEmailMutation();
  const sent = useRef(false);

  useEffect(() => {
    if (!token || sent.current) return;
    sent.current = true;
    verify.mutate({ token }, { onSuccess: onVerified });
  }, [token, verify, onVerified]);

  if (!token) return <Notice tone="error" message="This confirmation link is incomplete. Open the link from the e-mail again." testID="verify-error" />;
  if (verify.isError) {
    return (
      <View style={formStyles.form}>
        <Notice tone="error" message={errorsFromServer(verify.error).message ?? verify.error.message} testID="verify-error" />
        <AuthLink href="/sign-in" label="Sign in to ask for a new link" testID="to-sign-in" />
      </View>
    );
  }
  if (verify.isSuccess) {
    return (
      <View style={formStyles.form}>
        <Notice tone="success" message={`Thank you, ${verify.data.user.name}: your address is confirmed.`} testID="verify-done" />
        <Button label="Open your notebooks" onPress={onVerified} testID="verify-continue" />
      </View>
    );
  }
  return <Notice tone="info" message="Confirming your address…" testID="verify-pending" />;
}
