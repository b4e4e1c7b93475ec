import { useLocalSearchParams } from 'expo-router';
import { NotebookEditorScreen } from '../../../../components/screens/NotebookEditorScreen';

export default function NotebookEditorRoute() {
  const { notebookId } = useLocalSearchParams<{ notebookId: string }>();
  return <NotebookEditorScreen key={String(notebookId)} notebookId={String(notebookId)} />;
}
