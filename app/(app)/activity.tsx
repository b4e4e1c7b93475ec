import { ActivityScreen } from '../../components/screens/ActivityScreen';

export default function ActivityRoute() {
  return <ActivityScreen />;
}
