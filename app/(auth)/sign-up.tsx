import { useLocalSearchParams } from 'expo-router';
import { AuthFrame } from '../../components/auth/AuthFrame';
import { SignUpForm } from '../../components/auth/SignUpForm';

/** `?email=…&invited=1` comes from an invitation e-mail: the address is filled in and the invitation explained. */
export default function SignUpRoute() {
  const { email, invited } = useLocalSearchParams<{ email?: string; invited?: string }>();
  return (
    <AuthFrame title="Create an account">
      <SignUpForm initialEmail={typeof email === 'string' ? email : ''} invited={invited === '1'} />
    </AuthFrame>
  );
}
