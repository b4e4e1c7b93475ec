import { StyleSheet, Text } from 'react-native';
import { colors, fonts } from '../../constants/theme';
import { notePlainText } from './noteMarkdown';

/** Native: the note as plain text, formulas as their TeX source. */
export function NoteView({ text, large = false, testID }: { text: string; large?: boolean; testID?: string }) {
  return (
    <Text style={[styles.text, large && styles.large]} testID={testID}>
      {notePlainText(text)}
    </Text>
  );
}

const styles = StyleSheet.create({
  text: { fontFamily: fonts.regular, fontSize: 15, lineHeight: 23, color: colors.ink },
  large: { fontSize: 26, lineHeight: 38 },
});
