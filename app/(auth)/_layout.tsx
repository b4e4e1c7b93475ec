import { Redirect, Slot, usePathname } from 'expo-router';
import { useMeQuery } from '../../hooks/api/auth';

/** Pages for signed-out people; a signed-in visitor goes straight to the notebooks (reset links still open). */
export default function AuthLayout() {
  const me = useMeQuery();
  const pathname = usePathname();
  if (me.data && pathname !== '/reset-password') return <Redirect href="/notebooks" />;
  return <Slot />;
}
