import { StyleSheet } from 'react-native';
import { spacing } from '../../constants/theme';

export const formStyles = StyleSheet.create({
  form: { gap: spacing.lg },
  links: { gap: spacing.sm },
});
