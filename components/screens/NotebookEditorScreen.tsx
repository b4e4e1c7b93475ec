import { useEffect, useRef, useState } from 'react';
import { ScrollView, StyleSheet, Text, useWindowDimensions, View } from 'react-native';
import { router } from 'expo-router';
import { colors, fonts, spacing } from '../../constants/theme';
import { useMeQuery } from '../../hooks/api/auth';
import { useNotebookLive, type NotebookLive } from '../../hooks/api/live';
import { fetchNotebookExport, useAddCellMutation, useNotebookQuery, useRunAllMutation } from '../../hooks/api/notebooks';
import { useDisplayDigitsSetting } from '../../hooks/useDisplayDigits';
import { useWideLayout } from '../../hooks/useWideLayout';
import type { CellKind, CellView, NotebookDetail } from '../../shared/notebook';
import { can } from '../../shared/notebook/sharing';
import { NotebookActivity } from '../activity/NotebookActivity';
import { NotebookComments } from '../comments/NotebookComments';
import { AccessRemoved } from '../live/AccessRemoved';
import { LiveStatus } from '../live/LiveStatus';
import { otherViewers, PresenceList } from '../live/PresenceList';
import { PresenterBar } from '../live/PresenterBar';
import { useFollowPresenter } from '../live/useFollowPresenter';
import { sharingHref } from '../sharing/paths';
import { DisplayDigitsPicker } from '../ui/DisplayDigitsPicker';
import { LatexExportPanel } from '../notebook/LatexExportPanel';
import type { LatexExportQuery } from '../../shared/api/schemas';
import { Notice } from '../ui/Notice';
import { AddCellBar } from '../notebook/AddCellBar';
import { CellCard } from '../notebook/CellCard';
import { defaultInput, freshLabel } from '../notebook/cellDefaults';
import { ChipButton } from '../notebook/ChipButton';
import { NotebookOutline } from '../notebook/NotebookOutline';
import { SaveVersionForm } from '../notebook/SaveVersionForm';
import { saveTextFile } from '../notebook/saveFile';
import { ShortcutSheet } from '../notebook/ShortcutSheet';
import { useKeyboardShortcuts } from '../notebook/useKeyboardShortcuts';
import { NotebookTitle } from '../notebook/NotebookTitle';
import { useUnsavedEdits, useUnsavedPrompt } from '../notebook/unsavedEdits';
import { DatasetPanel } from '../datasets/DatasetPanel';
import { DisplayDigitsProvider } from '../notebook/displayPrecision';

/** `focusCellId` (the `?cell=` parameter of links from comments and activity) scrolls to that cell and highlights it. */
export function NotebookEditorScreen({ notebookId, focusCellId }: { notebookId: string; focusCellId?: string }) {
  const notebook = useNotebookQuery(notebookId);
  const live = useNotebookLive(notebookId);
  if (live.connection === 'revoked') return <Centered><AccessRemoved /></Centered>;
  if (notebook.isError) return <Centered><Notice tone="error" message={notebook.error.message} /></Centered>;
  if (!notebook.data) return <Centered><Text style={styles.muted}>Loading the notebook…</Text></Centered>;
  return <NotebookEditor notebook={notebook.data} live={live} focusCellId={focusCellId} />;
}

export function waitingMessage(labels: string[]): string {
  const cells = labels.length === 1 ? `1 cell (${labels[0]}) is` : `${labels.length} cells (${labels.join(', ')}) are`;
  return `${cells} waiting for a free slot in your queue. Run all again once some of your queued jobs have started.`;
}

function Centered({ children }: { children: React.ReactNode }) {
  return <View style={styles.centered}>{children}</View>;
}

/** Scrolls to a cell once its position is known (a cell not laid out yet is scrolled to when it is). */
function useCellScroller(scroll: React.RefObject<ScrollView | null>) {
  const offsets = useRef(new Map<string, number>());
  const pending = useRef<string | null>(null);
  const scrollTo = (cellId: string) => {
    const y = offsets.current.get(cellId);
    if (y === undefined) {
      pending.current = cellId;
      return;
    }
    pending.current = null;
    scroll.current?.scrollTo({ y: Math.max(0, y - spacing.lg), animated: true });
  };
  const laidOut = (cellId: string, y: number) => {
    offsets.current.set(cellId, y);
    if (pending.current === cellId) scrollTo(cellId);
  };
  return { scrollTo, laidOut };
}

/** From this width comments and history sit in a column beside the cells; narrower, below them. */
const SIDE_COLUMN_MIN_WIDTH = 1200;

function NotebookEditor({ notebook, live, focusCellId }: { notebook: NotebookDetail; live: NotebookLive; focusCellId?: string }) {
  const wide = useWideLayout();
  const sideColumn = useWindowDimensions().width >= SIDE_COLUMN_MIN_WIDTH;
  const me = useMeQuery().data;
  const [displayDigits, chooseDisplayDigits] = useDisplayDigitsSetting(notebook.id, me?.id);
  const [latexOpen, setLatexOpen] = useState(false);
  const [exporting, setExporting] = useState(false);
  const scroll = useRef<ScrollView>(null);
  const scroller = useCellScroller(scroll);
  const runners = useRef(new Map<string, () => void>());
  const [selectedId, setSelectedId] = useState<string | null>(focusCellId ?? notebook.cells[0]?.id ?? null);
  const [highlightedId, setHighlightedId] = useState<string | null>(null);
  const [historyOpen, setHistoryOpen] = useState(false);
  const [adding, setAdding] = useState(false);
  const [justAdded, setJustAdded] = useState<string | null>(null);
  const [versionFormOpen, setVersionFormOpen] = useState(false);
  const [helpOpen, setHelpOpen] = useState(false);
  const [dataOpen, setDataOpen] = useState(false);
  const [exportError, setExportError] = useState<string | null>(null);
  const addCell = useAddCellMutation(notebook.id);
  const runAll = useRunAllMutation(notebook.id);
  const unsaved = useUnsavedEdits();
  const runAllPrompt = useUnsavedPrompt('run-all-unsaved');
  const runEverything = () => runAllPrompt.guard(unsaved.behindAll(notebook.cells), () => runAll.mutate());

  // Cells run-all could not queue (queue limit) and that are still not up to date; run all again picks them up.
  const runAllWaiting = (runAll.data?.waiting ?? []).filter((label) => notebook.cells.some((cell) => cell.label === label && cell.state !== 'up-to-date' && cell.state !== 'running'));
  const selectedIndex = notebook.cells.findIndex((cell) => cell.id === selectedId);
  const add = (kind: CellKind) => {
    const label = freshLabel(kind, notebook.cells);
    const position = selectedIndex >= 0 && selectedIndex < notebook.cells.length - 1 ? selectedIndex + 1 : undefined;
    addCell.mutate(
      { label, input: defaultInput(kind, notebook.cells.slice(0, position ?? notebook.cells.length), notebook.datasets), position },
      {
        onSuccess: ({ notebook: updated }) => {
          const created = updated.cells.find((cell) => cell.label === label);
          setAdding(false);
          if (created) {
            setSelectedId(created.id);
            setJustAdded(created.id);
          }
        },
      },
    );
  };
  const jumpTo = (cell: CellView) => {
    setSelectedId(cell.id);
    scroller.scrollTo(cell.id);
  };
  const reveal = (cellId: string) => {
    setSelectedId(cellId);
    setHighlightedId(cellId);
    scroller.scrollTo(cellId);
  };
  const follow = useFollowPresenter(live.presenter, me?.id, reveal);
  const presenterCell = follow.presenter ? notebook.cells.find((cell) => cell.id === follow.presenter?.cellId) ?? null : null;
  const focusKnown = focusCellId !== undefined && notebook.cells.some((cell) => cell.id === focusCellId);
  useEffect(() => {
    if (focusKnown && focusCellId) reveal(focusCellId);
    // Only a new `?cell=` moves the view; later edits of the notebook must not.
  }, [focusCellId, focusKnown]);
  const exportAs = async (format: 'tex' | 'json', query: LatexExportQuery = {}) => {
    setExportError(null);
    setExporting(true);
    try {
      const text = await fetchNotebookExport(notebook.id, format, query);
      const base = notebook.title.replace(/[^A-Za-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'notebook';
      await saveTextFile(`${base}.${format}`, text, format === 'tex' ? 'application/x-tex' : 'application/json');
    } catch (error) {
      setExportError(error instanceof Error ? error.message : 'The export failed.');
    } finally {
      setExporting(false);
    }
  };

  useKeyboardShortcuts(
    {
      runCell: () => (selectedId ? runners.current.get(selectedId)?.() : undefined),
      runAll: runEverything,
      addCell: () => setAdding(true),
      help: () => setHelpOpen((open) => !open),
    },
    wide && notebook.canEdit,
  );

  const discussion = (
    <View style={styles.discussion}>
      <NotebookComments notebookId={notebook.id} role={notebook.role} onShowCell={reveal} />
      <View style={styles.history}>
        <View style={styles.toolbar}>
          <ChipButton label={historyOpen ? 'Hide history' : 'History'} selected={historyOpen} onPress={() => setHistoryOpen(!historyOpen)} testID="toggle-notebook-activity" accessibilityLabel="Who did what in this notebook" />
        </View>
        {historyOpen ? <NotebookActivity notebookId={notebook.id} onShowCell={reveal} /> : null}
      </View>
    </View>
  );

  const body = (
    <ScrollView ref={scroll} style={styles.scroll} contentContainerStyle={styles.content}>
      <View style={styles.column}>
        <NotebookTitle notebook={notebook} />
        <View style={styles.liveRow}>
          <LiveStatus connection={live.connection} />
          <PresenceList viewers={otherViewers(live.viewers, me?.id)} />
        </View>
        <View style={styles.toolbar}>
          {notebook.canEdit ? <ChipButton label={runAll.isPending ? 'Starting…' : 'Run all'} tone="accent" onPress={runEverything} testID="run-all" /> : null}
          {notebook.canEdit ? <ChipButton label="Save version" selected={versionFormOpen} onPress={() => setVersionFormOpen(!versionFormOpen)} testID="save-version" /> : null}
          {can(notebook.role, 'manageSharing') ? (
            <ChipButton label="Share" onPress={() => router.push(sharingHref(notebook.id))} testID="share-button" />
          ) : (
            <ChipButton label="People" onPress={() => router.push(sharingHref(notebook.id))} testID="people-button" accessibilityLabel="Who has access to this notebook" />
          )}
          <ChipButton label="Versions" onPress={() => router.push(`/notebooks/${notebook.id}/versions`)} testID="open-history" />
          <ChipButton label="Present" onPress={() => router.push(`/notebooks/${notebook.id}/present`)} testID="open-present" />
          <ChipButton label="LaTeX" selected={latexOpen} onPress={() => setLatexOpen(!latexOpen)} testID="export-tex" accessibilityLabel="Export as LaTeX" />
          <ChipButton label="JSON" onPress={() => void exportAs('json')} testID="export-json" accessibilityLabel="Export as JSON" />
          <ChipButton label={notebook.datasets?.length ? `Data (${notebook.datasets.length})` : 'Data'} selected={dataOpen} onPress={() => setDataOpen(!dataOpen)} testID="data-toggle" accessibilityLabel="Datasets of this notebook" />
          {wide && notebook.canEdit ? <ChipButton label="Shortcuts" onPress={() => setHelpOpen(true)} testID="open-shortcuts" /> : null}
          <DisplayDigitsPicker digits={displayDigits} onChoose={chooseDisplayDigits} />
        </View>
        {runAllPrompt.prompt}
        {runAll.data && runAll.data.runs.length === 0 && runAll.data.waiting.length === 0 ? <Notice tone="info" message="Every cell is already up to date." testID="run-all-nothing" /> : null}
        {runAllWaiting.length ? <Notice tone="info" message={waitingMessage(runAllWaiting)} testID="run-all-waiting" /> : null}
        {runAll.isError ? <Notice tone="error" message={runAll.error.message} /> : null}
        {latexOpen ? <LatexExportPanel displayDigits={displayDigits} busy={exporting} onExport={(query) => void exportAs('tex', query)} /> : null}
        {exportError ? <Notice tone="error" message={exportError} /> : null}
        {versionFormOpen && notebook.canEdit ? <SaveVersionForm notebookId={notebook.id} /> : null}
        {dataOpen ? <DatasetPanel notebook={notebook} onCellAdded={reveal} /> : null}

        {notebook.cells.length === 0 ? <Notice tone="info" message="This notebook has no cells yet. Start with a model & parameters cell, then add what it should compute." /> : null}
        <DisplayDigitsProvider value={displayDigits}>
          {notebook.cells.map((cell, index) => (
            <View key={cell.id} onLayout={(event) => scroller.laidOut(cell.id, event.nativeEvent.layout.y)} style={cell.id === highlightedId && styles.highlighted} testID={cell.id === highlightedId ? 'highlighted-cell' : undefined}>
              {follow.following && cell.id === presenterCell?.id ? <Text style={styles.presenterHere} testID={`cell-${cell.label}-presenter`}>{follow.presenter?.name} is here</Text> : null}
              <CellCard
                // A role change remounts the card, so an editor open when editing was taken away closes.
                key={notebook.canEdit ? 'editable' : 'read-only'}
                notebook={notebook}
                cell={cell}
                index={index}
                wide={wide}
                selected={cell.id === selectedId}
                onSelect={() => setSelectedId(cell.id)}
                startEditing={cell.id === justAdded}
                onStartedEditing={() => setJustAdded(null)}
                registerRunner={(run) => runners.current.set(cell.id, run)}
                openComments={cell.id === focusCellId}
              />
            </View>
          ))}
        </DisplayDigitsProvider>
        {notebook.canEdit ? (
          adding || notebook.cells.length === 0 ? (
            <AddCellBar onAdd={add} busy={addCell.isPending} onClose={notebook.cells.length ? () => setAdding(false) : undefined} />
          ) : (
            <View style={styles.toolbar}>
              <ChipButton label="+ Add cell" onPress={() => setAdding(true)} testID="add-cell" />
            </View>
          )
        ) : null}
        {addCell.isError && notebook.canEdit ? <Notice tone="error" message={addCell.error.message} /> : null}
        {sideColumn ? null : discussion}
      </View>
    </ScrollView>
  );

  return (
    <View style={styles.root}>
      {wide ? <NotebookOutline cells={notebook.cells} selectedId={selectedId} onPick={jumpTo} presenterCellId={presenterCell?.id ?? null} /> : null}
      <View style={styles.main}>
        <PresenterBar follow={follow} cellLabel={presenterCell?.label ?? null} />
        {body}
      </View>
      {sideColumn ? <ScrollView style={styles.side} contentContainerStyle={styles.sideContent} testID="notebook-side">{discussion}</ScrollView> : null}
      <ShortcutSheet visible={helpOpen} onClose={() => setHelpOpen(false)} />
    </View>
  );
}

const styles = StyleSheet.create({
  root: { flex: 1, flexDirection: 'row', backgroundColor: colors.paper },
  main: { flex: 1, minWidth: 0 },
  scroll: { flex: 1 },
  side: { width: 360, flexGrow: 0, borderLeftWidth: 1, borderLeftColor: colors.rule, backgroundColor: colors.surface },
  sideContent: { padding: spacing.lg, paddingBottom: spacing.xxl * 2 },
  discussion: { gap: spacing.lg },
  history: { gap: spacing.md },
  liveRow: { flexDirection: 'row', alignItems: 'center', flexWrap: 'wrap', gap: spacing.md },
  highlighted: { borderRadius: 10, borderWidth: 2, borderColor: colors.amber, padding: 2, gap: spacing.xs },
  presenterHere: { fontFamily: fonts.semibold, fontSize: 12, color: colors.amberDeep, paddingHorizontal: spacing.sm },
  content: { padding: spacing.lg, paddingBottom: spacing.xxl * 3 },
  column: { width: '100%', maxWidth: 960, alignSelf: 'center', gap: spacing.lg },
  toolbar: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm },
  centered: { flex: 1, padding: spacing.xl, backgroundColor: colors.paper },
  muted: { fontFamily: fonts.regular, fontSize: 14, color: colors.inkFaint },
});
