import { useLocalSearchParams } from 'expo-router';
import { NotebookVersionsScreen } from '../../../../components/screens/NotebookVersionsScreen';

export default function NotebookVersionsRoute() {
  const { notebookId } = useLocalSearchParams<{ notebookId: string }>();
  return <NotebookVersionsScreen notebookId={String(notebookId)} />;
}
