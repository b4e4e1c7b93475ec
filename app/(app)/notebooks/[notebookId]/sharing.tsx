import { useLocalSearchParams } from 'expo-router';
import { SharingScreen } from '../../../../components/screens/SharingScreen';

export default function NotebookSharingRoute() {
  const { notebookId } = useLocalSearchParams<{ notebookId: string }>();
  return <SharingScreen key={String(notebookId)} notebookId={String(notebookId)} />;
}
