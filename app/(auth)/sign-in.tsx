import { router } from 'expo-router';
import { AuthFrame } from '../../components/auth/AuthFrame';
import { SignInForm } from '../../components/auth/SignInForm';

export default function SignInRoute() {
  return (
    <AuthFrame title="Sign in">
      <SignInForm onSignedIn={() => router.replace('/notebooks')} />
    </AuthFrame>
  );
}
