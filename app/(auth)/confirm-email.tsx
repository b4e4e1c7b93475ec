import { Link, useLocalSearchParams } from 'expo-router';
import { StyleSheet } from 'react-native';
import { ConfirmEmailChange } from '../../components/account/ConfirmEmailChange';
import { AuthFrame } from '../../components/auth/AuthFrame';
import { colors, fonts } from '../../constants/theme';

/** The address-change link from the e-mail: works signed in or out (the token alone confirms it). */
export default function ConfirmEmailRoute() {
  const { token } = useLocalSearchParams<{ token?: string }>();
  return (
    <AuthFrame title="Confirm your new e-mail address">
      <ConfirmEmailChange token={typeof token === 'string' ? token : ''} />
      <Link href="/account" style={styles.link} testID="confirm-email-account">
        Go to your account
      </Link>
    </AuthFrame>
  );
}

const styles = StyleSheet.create({
  link: { fontFamily: fonts.semibold, color: colors.ink, textDecorationLine: 'underline', marginTop: 12 },
});
