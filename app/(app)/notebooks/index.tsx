import { NotebooksScreen } from '../../../components/screens/NotebooksScreen';

export default function NotebooksRoute() {
  return <NotebooksScreen />;
}
