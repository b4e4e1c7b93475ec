import { useLocalSearchParams } from 'expo-router';
import { SharedNotebookScreen } from '../../components/screens/SharedNotebookScreen';

/** Outside the signed-in area on purpose: a share link opens for anyone who holds it. */
export default function SharedNotebookRoute() {
  const { token } = useLocalSearchParams<{ token: string }>();
  return <SharedNotebookScreen token={String(token)} />;
}
