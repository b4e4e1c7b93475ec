import { useLocalSearchParams } from 'expo-router';
import { GroupDetailScreen } from '../../../components/screens/GroupDetailScreen';

export default function GroupDetailRoute() {
  const { groupId } = useLocalSearchParams<{ groupId: string }>();
  return <GroupDetailScreen groupId={String(groupId)} />;
}
