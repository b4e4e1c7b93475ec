import { StyleSheet } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';

export const accountStyles = StyleSheet.create({
  section: { gap: spacing.md },
  heading: { fontFamily: fonts.semibold, fontSize: 17, color: colors.ink },
  explain: { fontFamily: fonts.regular, fontSize: 14, lineHeight: 20, color: colors.inkSoft },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm },
});
