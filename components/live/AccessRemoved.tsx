import { StyleSheet, View } from 'react-native';
import { router } from 'expo-router';
import { spacing } from '../../constants/theme';
import { ChipButton } from '../notebook/ChipButton';
import { Notice } from '../ui/Notice';

export const ACCESS_REMOVED_MESSAGE = 'Your access to this notebook was removed';

/** What replaces a notebook whose access was taken away while it was open. */
export function AccessRemoved() {
  return (
    <View style={styles.box}>
      <Notice tone="error" message={`${ACCESS_REMOVED_MESSAGE}. Ask its owner to share it with you again.`} testID="access-removed" />
      <View style={styles.row}>
        <ChipButton label="Back to notebooks" onPress={() => router.push('/notebooks')} testID="access-removed-back" />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: spacing.md, width: '100%', maxWidth: 640, alignSelf: 'center' },
  row: { flexDirection: 'row' },
});
