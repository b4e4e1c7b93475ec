import { useState } from 'react';
import { Pressable, ScrollView, StyleSheet, Text, useWindowDimensions, View, type GestureResponderEvent, type LayoutChangeEvent } from 'react-native';
import { router } from 'expo-router';
import { colors, fonts, spacing } from '../../constants/theme';
import { useMeQuery } from '../../hooks/api/auth';
import { stopPresenting, useNotebookLive, usePresenting, type NotebookLive } from '../../hooks/api/live';
import { useNotebookQuery } from '../../hooks/api/notebooks';
import { useDisplayDigitsSetting } from '../../hooks/useDisplayDigits';
import { cellKindTitles, type NotebookDetail } from '../../shared/notebook';
import { can } from '../../shared/notebook/sharing';
import { AccessRemoved } from '../live/AccessRemoved';
import { LiveStatus } from '../live/LiveStatus';
import { otherViewers } from '../live/PresenceList';
import { PresenterBar, PresentingNote } from '../live/PresenterBar';
import { useFollowPresenter } from '../live/useFollowPresenter';
import { CellOutput } from '../notebook/CellOutput';
import { CellStateBadge } from '../notebook/CellStateBadge';
import { cellSummary } from '../notebook/cellSummary';
import { DisplayDigitsProvider } from '../notebook/displayPrecision';
import { ChipButton } from '../notebook/ChipButton';
import { LargeType } from '../notebook/LargeType';
import { NoteView } from '../notebook/NoteView';
import { useKeyboardShortcuts } from '../notebook/useKeyboardShortcuts';
import { Notice } from '../ui/Notice';
import { PointerHighlight, usePointerHighlight } from '../ui/PointerHighlight';
import { PresentationModeProvider } from '../ui/presentationMode';
import { slideScale } from '../ui/slideScale';

export function NotebookPresentScreen({ notebookId }: { notebookId: string }) {
  const notebook = useNotebookQuery(notebookId);
  const live = useNotebookLive(notebookId);
  if (live.connection === 'revoked') return <View style={[styles.root, styles.padded]}><AccessRemoved /></View>;
  if (notebook.isError) return <View style={styles.root}><Notice tone="error" message={notebook.error.message} /></View>;
  if (!notebook.data) return <View style={styles.root}><Text style={styles.muted}>Loading…</Text></View>;
  return <Presentation notebook={notebook.data} live={live} />;
}

/**
 * Whether the caller presents to the others: they may (editor or owner), the stream has said who
 * presents (so opening the view does not take over someone else's presentation), and they follow nobody.
 */
function presentsToOthers(notebook: NotebookDetail, live: NotebookLive, myId: string | undefined, following: boolean): boolean {
  if (!myId || following || !can(notebook.role, 'present') || live.connection === 'revoked') return false;
  // Without a stream (native) nobody else's presentation is known; with one, wait for its greeting.
  if (live.connection !== 'polling' && live.session === 0) return false;
  return live.presenter === null || live.presenter.userId === myId;
}

/**
 * One cell at a time in type scaled to the screen, without editing controls; tap the right or left part of the slide, or use the arrow keys.
 * An editor or owner presents: others who have the notebook open can follow the cell shown here.
 */
function Presentation({ notebook, live }: { notebook: NotebookDetail; live: NotebookLive }) {
  const me = useMeQuery().data;
  const [index, setIndex] = useState(0);
  const [slideWidth, setSlideWidth] = useState(0);
  const window = useWindowDimensions();
  const scale = slideScale(window.width, window.height);
  const [displayDigits] = useDisplayDigitsSetting(notebook.id, me?.id);
  const pointer = usePointerHighlight();
  const count = notebook.cells.length;
  const at = Math.min(index, Math.max(0, count - 1));
  const next = () => setIndex(Math.min(count - 1, at + 1));
  const previous = () => setIndex(Math.max(0, at - 1));
  const showCell = (cellId: string) => {
    const found = notebook.cells.findIndex((candidate) => candidate.id === cellId);
    if (found >= 0) setIndex(found);
  };
  const follow = useFollowPresenter(live.presenter, me?.id, showCell);
  const cell = notebook.cells[at];
  const presenting = presentsToOthers(notebook, live, me?.id, follow.following);
  const ownsPresentation = me !== undefined && me !== null && live.presenter?.userId === me.id;
  const presentation = usePresenting(notebook.id, presenting ? cell?.id ?? null : undefined, { session: live.session, owned: ownsPresentation });
  useKeyboardShortcuts({ next, previous }, true);
  const onSlidePress = (event: GestureResponderEvent) => (event.nativeEvent.locationX < slideWidth / 3 ? previous() : next());
  const presenterCell = notebook.cells.find((candidate) => candidate.id === follow.presenter?.cellId);
  const leave = () => {
    if (ownsPresentation) void stopPresenting(notebook.id);
    router.push(`/notebooks/${notebook.id}`);
  };
  return (
    <View style={styles.root} testID="presentation">
      <View style={[styles.bar, scale.compact && styles.compactBar]}>
        <Text style={[styles.barTitle, scale.compact && styles.compactTitle]} numberOfLines={1}>{notebook.title}</Text>
        <LiveStatus connection={live.connection} />
        <Text style={styles.counter} testID="presentation-counter">{count ? `${at + 1} / ${count}` : '0 / 0'}</Text>
        <ChipButton label="Previous" disabled={at === 0} onPress={previous} testID="presentation-previous" />
        <ChipButton label="Next" disabled={at >= count - 1} onPress={next} testID="presentation-next" />
        <ChipButton label="Leave" onPress={leave} testID="presentation-leave" />
      </View>
      {presenting && live.connection === 'live' ? <PresentingNote followers={otherViewers(live.viewers, me?.id).length} /> : null}
      <PresenterBar follow={follow} cellLabel={presenterCell?.label ?? null} />
      {presentation.error && presenting ? <Notice tone="error" message={`Others cannot follow right now: ${presentation.error}`} testID="presenting-error" /> : null}
      {cell ? (
        <ScrollView contentContainerStyle={[styles.scroll, { padding: scale.padding }]} testID="presentation-scroll">
          <Pressable onPress={onSlidePress} onLayout={(event: LayoutChangeEvent) => setSlideWidth(event.nativeEvent.layout.width)} style={styles.slide} testID={`slide-${cell.label}`} accessibilityHint="Tap the right part for the next cell, the left part for the previous one" {...pointer.handlers}>
            <View style={styles.slideHead}>
              <Text style={[styles.kind, { fontSize: scale.kind }]}>{cellKindTitles[cell.kind]}</Text>
              <Text style={styles.label}>{cell.label}</Text>
              <CellStateBadge state={cell.state} />
            </View>
            <PresentationModeProvider value>
              <DisplayDigitsProvider value={displayDigits}>
                <LargeType size={scale.type}>
                  {cell.input.kind === 'note' ? (
                    <NoteView text={cell.input.text} large />
                  ) : (
                    <View style={styles.body}>
                      <Text style={[styles.summary, scale.compact && styles.compactSummary]}>{cellSummary(cell.input)}</Text>
                      <CellOutput notebook={notebook} cell={cell} />
                    </View>
                  )}
                </LargeType>
              </DisplayDigitsProvider>
            </PresentationModeProvider>
            <PointerHighlight at={pointer.at} />
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
  compactBar: { paddingVertical: spacing.xs, paddingHorizontal: spacing.sm, gap: spacing.xs },
  barTitle: { flex: 1, minWidth: 120, fontFamily: fonts.semibold, fontSize: 15, color: colors.ink },
  compactTitle: { minWidth: 80, fontSize: 13 },
  counter: { fontFamily: fonts.medium, fontSize: 14, color: colors.inkSoft },
  scroll: { flexGrow: 1 },
  slide: { flexGrow: 1, width: '100%', maxWidth: 1200, minWidth: 0, alignSelf: 'center', gap: spacing.lg },
  slideHead: { flexDirection: 'row', alignItems: 'center', gap: spacing.md, flexWrap: 'wrap' },
  kind: { fontFamily: fonts.semibold, fontSize: 34, color: colors.ink },
  label: { fontFamily: fonts.medium, fontSize: 20, color: colors.inkFaint },
  body: { gap: spacing.lg },
  summary: { fontFamily: fonts.regular, fontSize: 22, lineHeight: 32, color: colors.inkSoft },
  compactSummary: { fontSize: 16, lineHeight: 22 },
  padded: { padding: spacing.xl },
  muted: { fontFamily: fonts.regular, fontSize: 14, color: colors.inkFaint, padding: spacing.xl },
});
