import { useCallback } from 'react';
import { router, useLocalSearchParams } from 'expo-router';
import { AccountScreen } from '../../components/screens/AccountScreen';

export default function AccountRoute() {
  const { confirmEmail } = useLocalSearchParams<{ confirmEmail?: string }>();
  // The link works once: drop its token from the address bar so a reload does not try it again.
  const dropToken = useCallback(() => router.setParams({ confirmEmail: undefined }), []);
  return <AccountScreen confirmEmailToken={typeof confirmEmail === 'string' ? confirmEmail : undefined} onConfirmSettled={dropToken} />;
}
