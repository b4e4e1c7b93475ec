import { Redirect, Slot } from 'expo-router';
import { ActivityIndicator, View } from 'react-native';
import { AppShell } from '../../components/navigation/AppShell';
import { Notice } from '../../components/ui/Notice';
import { colors } from '../../constants/theme';
import { useMeQuery } from '../../hooks/api/auth';

/** The signed-in area. The server enforces access on every route; this only decides what to show. */
export default function SignedInLayout() {
  const me = useMeQuery();
  if (me.isPending) {
    return (
      <View style={{ flex: 1, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.paper }}>
        <ActivityIndicator color={colors.amber} />
      </View>
    );
  }
  if (me.isError) return <View style={{ padding: 24 }}><Notice tone="error" message={me.error.message} /></View>;
  if (!me.data) return <Redirect href="/sign-in" />;
  return (
    <AppShell user={me.data}>
      <Slot />
    </AppShell>
  );
}
