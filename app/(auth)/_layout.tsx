import { Redirect, Slot, usePathname } from 'expo-router';
import { useMeQuery } from '../../hooks/api/auth';

/** Links from e-mails open whoever is signed in here (a confirmation link signs its owner in itself). */
const OPEN_WHEN_SIGNED_IN = new Set(['/reset-password', '/verify-email']);

/** Pages for signed-out people; a signed-in visitor goes straight to the notebooks (e-mailed links still open). */
export default function AuthLayout() {
  const me = useMeQuery();
  const pathname = usePathname();
  if (me.data && !OPEN_WHEN_SIGNED_IN.has(pathname)) return <Redirect href="/notebooks" />;
  return <Slot />;
}
