import type { ChangeEvent } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { fileSizeProblem, type FileChooserProps } from './chosenFile';

const ACCEPT = '.csv,.tsv,.txt,.dat,text/csv,text/tab-separated-values,text/plain';

/**
 * Web: a real file input laid transparently over a chip, so the browser's own chooser opens on a click
 * and the input stays reachable for keyboard and automation.
 */
export function FileChooser({ onChosen, onRefused, disabled }: FileChooserProps) {
  const changed = (event: ChangeEvent<HTMLInputElement>) => {
    const file = event.target.files?.[0];
    event.target.value = '';
    if (!file) return;
    const problem = fileSizeProblem(file.name, file.size);
    if (problem) return onRefused(problem);
    onChosen({ name: file.name, size: file.size, part: file, read: async () => new Uint8Array(await file.arrayBuffer()) });
  };
  return (
    <View style={[styles.chip, disabled && styles.disabled]}>
      <Text style={styles.label}>Choose a file</Text>
      <input type="file" accept={ACCEPT} disabled={disabled} onChange={changed} data-testid="dataset-file-input" aria-label="Choose a CSV or TSV file" style={overlay} />
    </View>
  );
}

const overlay = { position: 'absolute', top: 0, left: 0, width: '100%', height: '100%', margin: 0, opacity: 0, cursor: 'pointer' } as const;

const styles = StyleSheet.create({
  chip: { position: 'relative', minHeight: 32, paddingHorizontal: spacing.md, borderRadius: 16, borderWidth: 1, borderColor: colors.rule, backgroundColor: colors.surface, alignItems: 'center', justifyContent: 'center', alignSelf: 'flex-start' },
  disabled: { opacity: 0.5 },
  label: { fontFamily: fonts.medium, fontSize: 13, color: colors.ink },
});
