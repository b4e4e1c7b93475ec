import { AuthFrame } from '../../components/auth/AuthFrame';
import { ResendConfirmationForm } from '../../components/auth/ResendConfirmationForm';

export default function ResendConfirmationRoute() {
  return (
    <AuthFrame title="Confirm your e-mail address">
      <ResendConfirmationForm />
    </AuthFrame>
  );
}
