import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import type { LatexExportQuery } from '../../shared/api/schemas';
import { Button } from '../ui/Button';
import { ChipButton } from './ChipButton';

/** How numbers go into the LaTeX export: every computed digit or the notebook's display precision; fractions or decimals. */
export function LatexExportPanel({ displayDigits, busy, onExport }: { displayDigits: number; busy: boolean; onExport: (query: LatexExportQuery) => void }) {
  const [rounded, setRounded] = useState(false);
  const [exact, setExact] = useState(true);
  return (
    <View style={styles.panel} testID="export-tex-panel">
      <Text style={styles.hint}>Numbers in the LaTeX file:</Text>
      <View style={styles.row}>
        <ChipButton label="Every digit" selected={!rounded} onPress={() => setRounded(false)} testID="export-tex-all-digits" />
        <ChipButton label={`${displayDigits} digits`} selected={rounded} onPress={() => setRounded(true)} testID="export-tex-rounded" />
        <ChipButton label={exact ? 'Fractions where exact' : 'Decimals only'} selected={exact} onPress={() => setExact(!exact)} testID="export-tex-exact" accessibilityLabel="Write coefficients that are small-denominator rationals as fractions" />
      </View>
      <Button label="Download .tex" busy={busy} onPress={() => onExport({ ...(rounded ? { digits: displayDigits } : {}), exact: exact ? 'true' : 'false' })} testID="export-tex-download" />
    </View>
  );
}

const styles = StyleSheet.create({
  panel: { gap: spacing.sm, padding: spacing.md, borderRadius: 8, borderWidth: 1, borderColor: colors.rule, backgroundColor: colors.surface },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.xs },
  hint: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkSoft },
});
