import { Redirect, Slot, useLocalSearchParams, usePathname } from 'expo-router';
import { safeNextPath } from '../../components/sharing/paths';
import { useMeQuery } from '../../hooks/api/auth';

/** Links from e-mails open whoever is signed in here (a confirmation link signs its owner in itself). */
const OPEN_WHEN_SIGNED_IN = new Set(['/reset-password', '/verify-email', '/confirm-email']);

/** Pages for signed-out people; a signed-in visitor goes straight on (to `next` or the notebooks; e-mailed links still open). */
export default function AuthLayout() {
  const me = useMeQuery();
  const pathname = usePathname();
  const { next } = useLocalSearchParams<{ next?: string }>();
  // a same-site `next` (e.g. back to a share link) wins over the notebook list
  if (me.data && !OPEN_WHEN_SIGNED_IN.has(pathname)) return <Redirect href={safeNextPath(next) as '/notebooks'} />;
  return <Slot />;
}
