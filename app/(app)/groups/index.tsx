import { GroupsScreen } from '../../../components/screens/GroupsScreen';

export default function GroupsRoute() {
  return <GroupsScreen />;
}
