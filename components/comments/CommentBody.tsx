import { StyleSheet, Text } from 'react-native';
import { colors, fonts } from '../../constants/theme';
import { commentTextParts } from './commentMarkdown';

/** Native: the comment as plain text (formulas keep their TeX source), mentions highlighted. */
export function CommentBody({ text, testID }: { text: string; testID?: string }) {
  return (
    <Text style={styles.text} testID={testID}>
      {commentTextParts(text).map((part, index) => (part.mention ? <Text key={index} style={styles.mention}>{part.text}</Text> : part.text))}
    </Text>
  );
}

const styles = StyleSheet.create({
  text: { fontFamily: fonts.regular, fontSize: 14, lineHeight: 21, color: colors.ink },
  mention: { fontFamily: fonts.semibold, color: colors.amberDeep, backgroundColor: colors.amberWash },
});
