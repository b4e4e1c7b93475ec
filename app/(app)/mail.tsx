import { Redirect } from 'expo-router';
import { MailScreen } from '../../components/screens/MailScreen';
import { useMeQuery } from '../../hooks/api/auth';

export default function MailRoute() {
  const me = useMeQuery();
  if (me.data?.siteRole !== 'admin') return <Redirect href="/notebooks" />;
  return <MailScreen />;
}
