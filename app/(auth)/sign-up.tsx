import { AuthFrame } from '../../components/auth/AuthFrame';
import { SignUpForm } from '../../components/auth/SignUpForm';

export default function SignUpRoute() {
  return (
    <AuthFrame title="Create an account">
      <SignUpForm />
    </AuthFrame>
  );
}
