import { useState } from 'react';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts } from '../../constants/theme';
import { Formula } from '../formula';
import { usePresentationMode } from '../ui/presentationMode';
import { ChipButton } from './ChipButton';
import { copyText } from './clipboard';
import { useDisplayDigits } from './displayPrecision';
import { WithResultMenu, type CopyAction } from './ResultMenu';
import { FULL_PRECISION } from './texFormat';

/** TeX of a result at a number of significant digits (FULL_PRECISION: every computed digit). */
export type TexAtDigits = (significant: number) => string;

interface CopyableFormulaProps {
  /** The TeX, or how to write it at a given number of significant digits (then shortened on screen, full in copies). */
  tex: string | TexAtDigits;
  /** The result as plain text with every digit ("Copy as text"). */
  text?: string;
  /** The bare numbers with every digit, e.g. a series' coefficients one per line ("Copy full-precision values"). */
  values?: string;
  label?: string;
  testID?: string;
}

/**
 * A typeset result that wraps to its card, shown at the notebook's display precision: a tap shows every
 * digit, and a compact menu copies it as LaTeX, as plain text or as bare values, always with every digit.
 */
export function CopyableFormula({ tex, text, values, label, testID }: CopyableFormulaProps) {
  const digits = useDisplayDigits();
  const [full, setFull] = useState(false);
  // On a slide a tap moves to the next cell, so the formula is not a digits toggle there.
  const presenting = usePresentationMode();
  const fullTex = typeof tex === 'string' ? tex : tex(FULL_PRECISION);
  const shortTex = typeof tex === 'string' ? tex : tex(digits);
  const shortened = shortTex !== fullTex;
  const actions: CopyAction[] = [
    { label: 'Copy LaTeX', text: fullTex },
    ...(values !== undefined ? [{ label: 'Copy full-precision values', text: values }] : []),
    ...(text !== undefined ? [{ label: 'Copy as text', text }] : []),
  ];
  const formula = <Formula tex={full || !shortened ? fullTex : shortTex} display label={label} />;
  return (
    <View testID={testID}>
      <WithResultMenu actions={actions} testID={testID ?? 'formula'}>
        {shortened && !presenting ? (
          <Pressable
            accessibilityRole="button"
            accessibilityHint={full ? 'Shows the value at the display precision' : 'Shows every computed digit'}
            onPress={() => setFull(!full)}
            testID={testID ? `${testID}-digits` : undefined}
          >
            {formula}
            <Text style={styles.hint}>{full ? 'all digits · tap to shorten' : `${digits} digits · tap for all`}</Text>
          </Pressable>
        ) : (
          formula
        )}
      </WithResultMenu>
    </View>
  );
}

/** One copy action as a chip (tables and blocks that are not a single formula). */
export function CopyButton({ text, label, testID }: { text: string; label: string; testID?: string }) {
  const [copied, setCopied] = useState<boolean | null>(null);
  const presenting = usePresentationMode();
  if (presenting) return null;
  const copy = async () => {
    setCopied(await copyText(text));
    setTimeout(() => setCopied(null), 1500);
  };
  return <ChipButton label={copied === null ? label : copied ? 'Copied' : 'Copy failed'} onPress={() => void copy()} testID={testID} />;
}

const styles = StyleSheet.create({
  hint: { fontFamily: fonts.regular, fontSize: 11, color: colors.inkSoft },
});
