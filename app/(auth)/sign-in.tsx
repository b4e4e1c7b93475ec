import { router, useLocalSearchParams } from 'expo-router';
import { AuthFrame } from '../../components/auth/AuthFrame';
import { SignInForm } from '../../components/auth/SignInForm';
import { safeNextPath } from '../../components/sharing/paths';

/** `?next=/path` brings the person back where they were (a share link's page, say); only paths of this site. */
export default function SignInRoute() {
  const { next } = useLocalSearchParams<{ next?: string }>();
  return (
    <AuthFrame title="Sign in">
      <SignInForm onSignedIn={() => router.replace(safeNextPath(next))} />
    </AuthFrame>
  );
}
