import { useState } from 'react';
import { ScrollView, StyleSheet, Text, View, type ViewStyle } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { toCsv } from '../csv';
import { useDisplayDigits } from '../displayPrecision';
import { monoFont } from '../monoFont';
import { WithResultMenu } from '../ResultMenu';
import { saveTextFile } from '../saveFile';
import { displayedValue, ShortValue } from './ShortValue';

interface CoefficientTableProps {
  header: string[];
  rows: string[][];
  /** File name (without .csv) for the CSV export. */
  fileName: string;
  testID?: string;
}

/** Narrowest and widest column (px); a longer cell wraps inside its column. */
const COLUMN_WIDTH = { min: 72, max: 320, perChar: 7.6, padding: 20 };

function columnWidths(header: string[], rows: string[][], digits: number): number[] {
  return header.map((title, column) => {
    const longest = Math.max(title.length, ...rows.map((row) => displayedValue(row[column] ?? '', digits).length));
    return Math.round(Math.min(COLUMN_WIDTH.max, Math.max(COLUMN_WIDTH.min, longest * COLUMN_WIDTH.perChar + COLUMN_WIDTH.padding)));
  });
}

/** On the web the first column stays in view while the others scroll (CSS sticky; native simply scrolls). */
const STICKY = { position: 'sticky', left: 0, zIndex: 1 } as unknown as ViewStyle;

/**
 * Numbers at the display precision (a tap shows every digit), the first column held in place while wider
 * tables scroll sideways behind a visible cue; copies and the CSV carry every digit the engine verified.
 */
export function CoefficientTable({ header, rows, fileName, testID }: CoefficientTableProps) {
  const digits = useDisplayDigits();
  const [viewWidth, setViewWidth] = useState(0);
  const widths = columnWidths(header, rows, digits);
  const contentWidth = widths.reduce((sum, width) => sum + width, 0) + 2;
  const scrolls = viewWidth > 0 && contentWidth > viewWidth + 1;
  const tabSeparated = [header, ...rows].map((row) => row.join('\t')).join('\n');
  const actions = [
    { label: 'Copy table', text: tabSeparated },
    { label: 'Save CSV', run: () => void saveTextFile(`${fileName}.csv`, toCsv(header, rows), 'text/csv') },
  ];
  return (
    <View style={styles.wrap} testID={testID}>
      <WithResultMenu actions={actions} testID={testID ? `${testID}-actions` : undefined}>
        {scrolls ? <Text style={styles.cue} testID={testID ? `${testID}-cue` : undefined}>Scroll sideways for every column →</Text> : <Text style={styles.cueSpace}> </Text>}
      </WithResultMenu>
      <ScrollView horizontal onLayout={(event) => setViewWidth(event.nativeEvent.layout.width)} style={styles.scroller} testID={testID ? `${testID}-hscroll` : undefined}>
        <View style={styles.table}>
          <View style={[styles.row, styles.headerRow]}>
            {header.map((cell, index) => (
              <Text key={index} style={[styles.cell, styles.headerCell, { width: widths[index] }, index === 0 && [STICKY, styles.stickyHeader]]}>
                {cell}
              </Text>
            ))}
          </View>
          {rows.map((row, rowIndex) => (
            <View key={rowIndex} style={styles.row}>
              {row.map((cell, index) =>
                index === 0 ? (
                  <Text key={index} selectable style={[styles.cell, styles.firstCell, { width: widths[index] }, STICKY, styles.stickyCell]}>{cell}</Text>
                ) : (
                  <ShortValue key={index} value={cell} style={[styles.cell, styles.number, { width: widths[index] }]} />
                ),
              )}
            </View>
          ))}
        </View>
      </ScrollView>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.xs, alignSelf: 'stretch' },
  cue: { fontFamily: fonts.medium, fontSize: 12, lineHeight: 32, color: colors.amberDeep },
  cueSpace: { lineHeight: 32 },
  scroller: { alignSelf: 'stretch', maxWidth: '100%' },
  table: { borderWidth: 1, borderColor: colors.rule, borderRadius: 6 },
  row: { flexDirection: 'row', borderTopWidth: 1, borderTopColor: colors.rule },
  headerRow: { borderTopWidth: 0, backgroundColor: colors.paper },
  cell: { paddingHorizontal: spacing.sm, paddingVertical: 6, fontSize: 13, color: colors.ink },
  firstCell: { fontFamily: fonts.medium },
  stickyCell: { backgroundColor: colors.surface, borderRightWidth: 1, borderRightColor: colors.rule },
  stickyHeader: { backgroundColor: colors.paper, borderRightWidth: 1, borderRightColor: colors.rule },
  headerCell: { fontFamily: fonts.semibold, color: colors.inkSoft },
  number: { fontFamily: monoFont },
});
