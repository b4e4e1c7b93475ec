import { useLocalSearchParams } from 'expo-router';
import { AuthFrame } from '../../components/auth/AuthFrame';
import { ResetPasswordForm } from '../../components/auth/ResetPasswordForm';

export default function ResetPasswordRoute() {
  const { token } = useLocalSearchParams<{ token?: string }>();
  return (
    <AuthFrame title="Choose a new password">
      <ResetPasswordForm token={typeof token === 'string' ? token : ''} />
    </AuthFrame>
  );
}
