import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { spacing } from '../../constants/theme';
import { Formula } from '../formula';
import { ChipButton } from './ChipButton';
import { copyText } from './clipboard';

/** A typeset formula with its TeX one tap away. */
export function CopyableFormula({ tex, label, testID }: { tex: string; label?: string; testID?: string }) {
  return (
    <View style={styles.row} testID={testID}>
      <View style={styles.formula}>
        <Formula tex={tex} display label={label} />
      </View>
      <CopyButton text={tex} label="Copy TeX" testID={testID ? `${testID}-copy` : 'copy-tex'} />
    </View>
  );
}

export function CopyButton({ text, label, testID }: { text: string; label: string; testID?: string }) {
  const [copied, setCopied] = useState<boolean | null>(null);
  const copy = async () => {
    setCopied(await copyText(text));
    setTimeout(() => setCopied(null), 1500);
  };
  return <ChipButton label={copied === null ? label : copied ? 'Copied' : 'Copy failed'} onPress={() => void copy()} testID={testID} />;
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm },
  formula: { flex: 1, minWidth: 0, overflow: 'hidden' },
});
