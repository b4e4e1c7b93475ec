import { useState } from 'react';
import { Pressable, ScrollView, StyleSheet, Text, View, type GestureResponderEvent, type LayoutChangeEvent } from 'react-native';
import { router } from 'expo-router';
import { colors, fonts, spacing } from '../../constants/theme';
import { useNotebookQuery } from '../../hooks/api/notebooks';
import { cellKindTitles, type NotebookDetail } from '../../shared/notebook';
import { CellOutput } from '../notebook/CellOutput';
import { CellStateBadge } from '../notebook/CellStateBadge';
import { cellSummary } from '../notebook/cellSummary';
import { ChipButton } from '../notebook/ChipButton';
import { LargeType } from '../notebook/LargeType';
import { NoteView } from '../notebook/NoteView';
import { useKeyboardShortcuts } from '../notebook/useKeyboardShortcuts';
import { Notice } from '../ui/Notice';

export function NotebookPresentScreen({ notebookId }: { notebookId: string }) {
  const notebook = useNotebookQuery(notebookId);
  if (notebook.isError) return <View style={styles.root}><Notice tone="error" message={notebook.error.message} /></View>;
  if (!notebook.data) return <View style={styles.root}><Text style={styles.muted}>Loading…</Text></View>;
  return <Presentation notebook={notebook.data} />;
}

/** One cell at a time in large type; tap the right or left part of the slide, or use the arrow keys. */
function Presentation({ notebook }: { notebook: NotebookDetail }) {
  const [index, setIndex] = useState(0);
  const [slideWidth, setSlideWidth] = useState(0);
  const count = notebook.cells.length;
  const at = Math.min(index, Math.max(0, count - 1));
  const next = () => setIndex(Math.min(count - 1, at + 1));
  const previous = () => setIndex(Math.max(0, at - 1));
  useKeyboardShortcuts({ next, previous }, true);
  const onSlidePress = (event: GestureResponderEvent) => (event.nativeEvent.locationX < slideWidth / 3 ? previous() : next());
  const cell = notebook.cells[at];
  return (
    <View style={styles.root} testID="presentation">
      <View style={styles.bar}>
        <Text style={styles.barTitle} numberOfLines={1}>{notebook.title}</Text>
        <Text style={styles.counter} testID="presentation-counter">{count ? `${at + 1} / ${count}` : '0 / 0'}</Text>
        <ChipButton label="Previous" disabled={at === 0} onPress={previous} testID="presentation-previous" />
        <ChipButton label="Next" disabled={at >= count - 1} onPress={next} testID="presentation-next" />
        <ChipButton label="Leave" onPress={() => router.push(`/notebooks/${notebook.id}`)} testID="presentation-leave" />
      </View>
      {cell ? (
        <ScrollView contentContainerStyle={styles.scroll}>
          <Pressable onPress={onSlidePress} onLayout={(event: LayoutChangeEvent) => setSlideWidth(event.nativeEvent.layout.width)} style={styles.slide} testID={`slide-${cell.label}`} accessibilityHint="Tap the right part for the next cell, the left part for the previous one">
            <View style={styles.slideHead}>
              <Text style={styles.kind}>{cellKindTitles[cell.kind]}</Text>
              <Text style={styles.label}>{cell.label}</Text>
              <CellStateBadge state={cell.state} />
            </View>
            <LargeType size={26}>
              {cell.input.kind === 'note' ? (
                <NoteView text={cell.input.text} large />
              ) : (
                <View style={styles.body}>
                  <Text style={styles.summary}>{cellSummary(cell.input)}</Text>
                  <CellOutput notebook={notebook} cell={cell} />
                </View>
              )}
            </LargeType>
          </Pressable>
        </ScrollView>
      ) : (
        <Notice tone="info" message="This notebook has no cells to show." />
      )}
    </View>
  );
}

const styles = StyleSheet.create({
  root: { flex: 1, backgroundColor: colors.paper },
  bar: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm, padding: spacing.md, backgroundColor: colors.surface, borderBottomWidth: 1, borderBottomColor: colors.rule, flexWrap: 'wrap' },
  barTitle: { flex: 1, minWidth: 120, fontFamily: fonts.semibold, fontSize: 15, color: colors.ink },
  counter: { fontFamily: fonts.medium, fontSize: 14, color: colors.inkSoft },
  scroll: { padding: spacing.xl, flexGrow: 1 },
  slide: { flexGrow: 1, width: '100%', maxWidth: 1200, alignSelf: 'center', gap: spacing.xl },
  slideHead: { flexDirection: 'row', alignItems: 'center', gap: spacing.md, flexWrap: 'wrap' },
  kind: { fontFamily: fonts.semibold, fontSize: 34, color: colors.ink },
  label: { fontFamily: fonts.medium, fontSize: 20, color: colors.inkFaint },
  body: { gap: spacing.lg },
  summary: { fontFamily: fonts.regular, fontSize: 22, lineHeight: 32, color: colors.inkSoft },
  muted: { fontFamily: fonts.regular, fontSize: 14, color: colors.inkFaint, padding: spacing.xl },
});
