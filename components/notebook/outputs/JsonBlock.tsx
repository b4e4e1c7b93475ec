import { ScrollView, StyleSheet, Text } from 'react-native';
import { colors } from '../../../constants/theme';
import { monoFont } from '../monoFont';

/** Any result the screens have no special view for, readable as indented JSON. */
export function JsonBlock({ value, testID }: { value: unknown; testID?: string }) {
  let text: string;
  try {
    text = JSON.stringify(value, null, 2) ?? String(value);
  } catch {
    text = String(value);
  }
  return (
    <ScrollView horizontal style={styles.box} testID={testID}>
      <Text selectable style={styles.text}>
        {text}
      </Text>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  box: { backgroundColor: colors.paper, borderRadius: 6, borderWidth: 1, borderColor: colors.rule, padding: 10, maxHeight: 360 },
  text: { fontFamily: monoFont, fontSize: 12, lineHeight: 18, color: colors.ink },
});
