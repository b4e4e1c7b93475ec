import { useLocalSearchParams } from 'expo-router';
import { NotebookPresentScreen } from '../../../../components/screens/NotebookPresentScreen';

export default function NotebookPresentRoute() {
  const { notebookId } = useLocalSearchParams<{ notebookId: string }>();
  return <NotebookPresentScreen notebookId={String(notebookId)} />;
}
