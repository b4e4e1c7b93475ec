import { StyleSheet, Text } from 'react-native';
import { router } from 'expo-router';
import { colors, fonts } from '../../constants/theme';
import { useMeQuery, useSignOutMutation } from '../../hooks/api/auth';
import { Button } from '../ui/Button';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { ScreenBody } from '../ui/ScreenBody';

export function AccountScreen() {
  const me = useMeQuery();
  const signOut = useSignOutMutation();
  const user = me.data;
  return (
    <ScreenBody title="Account">
      {signOut.isError ? <Notice tone="error" message={signOut.error.message} /> : null}
      {user ? (
        <Card testID="account-card">
          <Text style={styles.name}>{user.name}</Text>
          <Text style={styles.detail}>{user.email}</Text>
          <Text style={styles.detail}>Site role: {user.siteRole === 'admin' ? 'administrator' : 'member'}</Text>
          {user.emailVerified ? null : (
            <Notice tone="info" message="Your e-mail address is not confirmed yet: until it is, nobody can add you to a research group. Open the link we e-mailed you." testID="email-unverified" />
          )}
          <Button label="Sign out" variant="quiet" busy={signOut.isPending} onPress={() => signOut.mutate(undefined, { onSuccess: () => router.replace('/sign-in') })} testID="sign-out" />
        </Card>
      ) : null}
    </ScreenBody>
  );
}

const styles = StyleSheet.create({
  name: { fontFamily: fonts.semibold, fontSize: 18, color: colors.ink },
  detail: { fontFamily: fonts.regular, fontSize: 15, color: colors.inkSoft },
});
