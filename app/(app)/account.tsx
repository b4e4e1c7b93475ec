import { AccountScreen } from '../../components/screens/AccountScreen';

export default function AccountRoute() {
  return <AccountScreen />;
}
