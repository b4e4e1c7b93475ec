import { AuthFrame } from '../../components/auth/AuthFrame';
import { ForgotPasswordForm } from '../../components/auth/ForgotPasswordForm';

export default function ForgotPasswordRoute() {
  return (
    <AuthFrame title="Reset your password">
      <ForgotPasswordForm />
    </AuthFrame>
  );
}
