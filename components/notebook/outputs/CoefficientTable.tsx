import { ScrollView, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { CopyButton } from '../CopyableFormula';
import { ChipButton } from '../ChipButton';
import { toCsv } from '../csv';
import { monoFont } from '../monoFont';
import { saveTextFile } from '../saveFile';

interface CoefficientTableProps {
  header: string[];
  rows: string[][];
  /** File name (without .csv) for the CSV export. */
  fileName: string;
  testID?: string;
}

/** Numbers with every digit the engine verified, copyable as tab-separated text or saved as CSV. */
export function CoefficientTable({ header, rows, fileName, testID }: CoefficientTableProps) {
  const tabSeparated = [header, ...rows].map((row) => row.join('\t')).join('\n');
  return (
    <View style={styles.wrap} testID={testID}>
      <ScrollView horizontal contentContainerStyle={styles.table}>
        <View>
          <View style={[styles.row, styles.headerRow]}>
            {header.map((cell, index) => (
              <Text key={index} style={[styles.cell, styles.headerCell, index === 0 && styles.firstCell]}>
                {cell}
              </Text>
            ))}
          </View>
          {rows.map((row, rowIndex) => (
            <View key={rowIndex} style={styles.row}>
              {row.map((cell, index) => (
                <Text key={index} selectable style={[styles.cell, index === 0 ? styles.firstCell : styles.number]}>
                  {cell}
                </Text>
              ))}
            </View>
          ))}
        </View>
      </ScrollView>
      <View style={styles.actions}>
        <CopyButton text={tabSeparated} label="Copy table" testID={testID ? `${testID}-copy` : undefined} />
        <ChipButton label="Save CSV" onPress={() => void saveTextFile(`${fileName}.csv`, toCsv(header, rows), 'text/csv')} testID={testID ? `${testID}-csv` : undefined} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.sm },
  table: { borderWidth: 1, borderColor: colors.rule, borderRadius: 6 },
  row: { flexDirection: 'row', borderTopWidth: 1, borderTopColor: colors.rule },
  headerRow: { borderTopWidth: 0, backgroundColor: colors.paper },
  cell: { width: 190, paddingHorizontal: spacing.sm, paddingVertical: 6, fontSize: 13, color: colors.ink },
  firstCell: { width: 110, fontFamily: fonts.medium },
  headerCell: { fontFamily: fonts.semibold, color: colors.inkSoft },
  number: { fontFamily: monoFont },
  actions: { flexDirection: 'row', gap: spacing.sm, flexWrap: 'wrap' },
});
