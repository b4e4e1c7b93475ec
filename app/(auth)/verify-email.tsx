import { router, useLocalSearchParams } from 'expo-router';
import { AuthFrame } from '../../components/auth/AuthFrame';
import { VerifyEmailForm } from '../../components/auth/VerifyEmailForm';

export default function VerifyEmailRoute() {
  const { token } = useLocalSearchParams<{ token?: string }>();
  return (
    <AuthFrame title="Confirm your e-mail address">
      <VerifyEmailForm token={typeof token === 'string' ? token : ''} onVerified={() => router.replace('/notebooks')} />
    </AuthFrame>
  );
}
