import { Redirect } from 'expo-router';

export default function HomeRoute() {
  return <Redirect href="/notebooks" />;
}
