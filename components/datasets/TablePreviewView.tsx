import { useState } from 'react';
import { ScrollView, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import type { TablePreview } from '../../shared/notebook/datasets';
import { monoFont } from '../notebook/monoFont';
import { columnTitle } from './ColumnMapping';

const DELIMITER_NAMES: Record<TablePreview['delimiter'], string> = { ',': 'commas', '\t': 'tabs', ';': 'semicolons', ' ': 'spaces' };

export function previewSummary(preview: TablePreview): string {
  const rows = `${preview.rowCount.toLocaleString('en')} ${preview.rowCount === 1 ? 'row' : 'rows'}`;
  const header = preview.header ? 'the first row names the columns' : 'no header row';
  return `${rows} · ${preview.columns.length} columns separated by ${DELIMITER_NAMES[preview.delimiter]} · ${header}`;
}

/** The first rows as read, in a table that scrolls sideways when it is wider than the screen. */
export function TablePreviewView({ preview }: { preview: TablePreview }) {
  const [frameWidth, setFrameWidth] = useState(0);
  const [tableWidth, setTableWidth] = useState(0);
  const [scrolled, setScrolled] = useState(false);
  const overflows = tableWidth > frameWidth + 1 && frameWidth > 0;
  return (
    <View style={styles.wrap} testID="dataset-preview">
      <Text style={styles.summary} testID="dataset-preview-summary">{previewSummary(preview)}</Text>
      <ScrollView
        horizontal
        style={styles.frame}
        onLayout={(event) => setFrameWidth(event.nativeEvent.layout.width)}
        onContentSizeChange={(width) => setTableWidth(width)}
        onScroll={(event) => setScrolled(event.nativeEvent.contentOffset.x > 0)}
        scrollEventThrottle={100}
      >
        <View>
          <View style={[styles.row, styles.headRow]}>
            {preview.columns.map((name, index) => (
              <Text key={index} style={[styles.cell, styles.head]} numberOfLines={1}>{columnTitle(name, index)}</Text>
            ))}
          </View>
          {preview.rows.map((row, rowIndex) => (
            <View key={rowIndex} style={styles.row}>
              {preview.columns.map((_, index) => (
                <Text key={index} style={styles.cell} numberOfLines={1}>{row[index] ?? ''}</Text>
              ))}
            </View>
          ))}
        </View>
      </ScrollView>
      {overflows && !scrolled ? <Text style={styles.cue} testID="dataset-preview-more">More columns → scroll the table sideways</Text> : null}
      {preview.rowCount > preview.rows.length ? <Text style={styles.cue}>First {preview.rows.length} of {preview.rowCount.toLocaleString('en')} rows</Text> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.xs },
  summary: { fontFamily: fonts.medium, fontSize: 13, color: colors.inkSoft },
  frame: { borderWidth: 1, borderColor: colors.rule, borderRadius: 6, backgroundColor: colors.surface, flexGrow: 0 },
  row: { flexDirection: 'row', borderBottomWidth: StyleSheet.hairlineWidth, borderBottomColor: colors.rule },
  headRow: { backgroundColor: colors.paper },
  cell: { width: 112, paddingHorizontal: spacing.sm, paddingVertical: spacing.xs, fontFamily: monoFont, fontSize: 12, color: colors.ink },
  head: { fontFamily: fonts.semibold, color: colors.inkSoft },
  cue: { fontFamily: fonts.regular, fontSize: 12, color: colors.inkFaint },
});
