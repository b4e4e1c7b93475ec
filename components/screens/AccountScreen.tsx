import { useState } from 'react';
import { StyleSheet, Text } from 'react-native';
import { router } from 'expo-router';
import { colors, fonts } from '../../constants/theme';
import { useMeQuery, useSignOutMutation } from '../../hooks/api/auth';
import { ConfirmEmailChange } from '../account/ConfirmEmailChange';
import { EmailForm } from '../account/EmailForm';
import { NameForm } from '../account/NameForm';
import { PasswordForm } from '../account/PasswordForm';
import { SessionList } from '../account/SessionList';
import { Button } from '../ui/Button';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { ScreenBody } from '../ui/ScreenBody';

interface AccountScreenProps {
  /** The token of an opened address-change link (?confirmEmail=…). */
  confirmEmailToken?: string;
  /** Called once the link was tried, e.g. to drop the token from the address bar. */
  onConfirmSettled?: () => void;
}

export function AccountScreen({ confirmEmailToken, onConfirmSettled }: AccountScreenProps) {
  const me = useMeQuery();
  const signOut = useSignOutMutation();
  // Kept after the address bar drops the token, so the outcome stays on screen.
  const [openedToken] = useState(confirmEmailToken);
  const user = me.data;
  return (
    <ScreenBody title="Account">
      {openedToken ? <ConfirmEmailChange token={openedToken} onSettled={onConfirmSettled} /> : null}
      {signOut.isError ? <Notice tone="error" message={signOut.error.message} /> : null}
      {user ? (
        <>
          <Card testID="account-card">
            <Text style={styles.name}>{user.name}</Text>
            <Text style={styles.detail} testID="account-email-current">{user.email}</Text>
            <Text style={styles.detail}>Site role: {user.siteRole === 'admin' ? 'administrator' : 'member'}</Text>
            {user.emailVerified ? null : (
              <Notice tone="info" message="Your e-mail address is not confirmed yet: until it is, nobody can add you to a research group. Open the link we e-mailed you." testID="email-unverified" />
            )}
            <Button label="Sign out" variant="quiet" busy={signOut.isPending} onPress={() => signOut.mutate(undefined, { onSuccess: () => router.replace('/sign-in') })} testID="sign-out" />
          </Card>
          <Card>
            <NameForm user={user} />
          </Card>
          <Card>
            <EmailForm user={user} />
          </Card>
          <Card>
            <PasswordForm />
          </Card>
          <Card>
            <SessionList />
          </Card>
        </>
      ) : null}
    </ScreenBody>
  );
}

const styles = StyleSheet.create({
  name: { fontFamily: fonts.semibold, fontSize: 18, color: colors.ink },
  detail: { fontFamily: fonts.regular, fontSize: 15, color: colors.inkSoft },
});
