import { Linking, StyleSheet, Text } from 'react-native';
import { colors, fonts } from '../../constants/theme';
import { useCapturedMailQuery } from '../../hooks/api/mail';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { ScreenBody } from '../ui/ScreenBody';

const URL_PATTERN = /(https?:\/\/[^\s]+)/g;

/** Admin view of the local mail capture: every message the server sent, with its links clickable. */
export function MailScreen() {
  const mail = useCapturedMailQuery();
  return (
    <ScreenBody title="Captured mail" subtitle="Messages the server sent through the local mail capture, newest first.">
      {mail.isError ? <Notice tone="error" message={mail.error.message} /> : null}
      {mail.data?.length === 0 ? <Notice tone="info" message="No messages yet." /> : null}
      {mail.data?.map((message) => (
        <Card key={message.id} testID="captured-message">
          <Text style={styles.subject}>{message.subject}</Text>
          <Text style={styles.meta}>To {message.to} · {new Date(message.receivedAt).toLocaleString()}</Text>
          <Text style={styles.body}>
            {message.text.split(URL_PATTERN).map((part, index) =>
              /^https?:\/\//.test(part) ? (
                <Text key={index} style={styles.link} accessibilityRole="link" onPress={() => void Linking.openURL(part)}>
                  {part}
                </Text>
              ) : (
                part
              ),
            )}
          </Text>
        </Card>
      ))}
    </ScreenBody>
  );
}

const styles = StyleSheet.create({
  subject: { fontFamily: fonts.semibold, fontSize: 16, color: colors.ink },
  meta: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  body: { fontFamily: fonts.regular, fontSize: 14, color: colors.inkSoft, lineHeight: 21 },
  link: { color: colors.amberDeep, textDecorationLine: 'underline' },
});
