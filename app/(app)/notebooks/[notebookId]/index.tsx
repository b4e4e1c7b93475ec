import { useLocalSearchParams } from 'expo-router';
import { NotebookEditorScreen } from '../../../../components/screens/NotebookEditorScreen';

export default function NotebookEditorRoute() {
  const { notebookId, cell } = useLocalSearchParams<{ notebookId: string; cell?: string }>();
  return <NotebookEditorScreen key={String(notebookId)} notebookId={String(notebookId)} focusCellId={typeof cell === 'string' && cell ? cell : undefined} />;
}
