import { useRef, useState } from 'react';
import { ScrollView, StyleSheet, Text, View } from 'react-native';
import { router } from 'expo-router';
import { colors, fonts, spacing } from '../../constants/theme';
import { fetchNotebookExport, useAddCellMutation, useNotebookQuery, useRunAllMutation } from '../../hooks/api/notebooks';
import { useWideLayout } from '../../hooks/useWideLayout';
import type { CellKind, CellView, NotebookDetail } from '../../shared/notebook';
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

export function NotebookEditorScreen({ notebookId }: { notebookId: string }) {
  const notebook = useNotebookQuery(notebookId);
  if (notebook.isError) return <Centered><Notice tone="error" message={notebook.error.message} /></Centered>;
  if (!notebook.data) return <Centered><Text style={styles.muted}>Loading the notebook…</Text></Centered>;
  return <NotebookEditor notebook={notebook.data} />;
}

export function waitingMessage(labels: string[]): string {
  const cells = labels.length === 1 ? `1 cell (${labels[0]}) is` : `${labels.length} cells (${labels.join(', ')}) are`;
  return `${cells} waiting for a free slot in your queue. Run all again once some of your queued jobs have started.`;
}

function Centered({ children }: { children: React.ReactNode }) {
  return <View style={styles.centered}>{children}</View>;
}

function NotebookEditor({ notebook }: { notebook: NotebookDetail }) {
  const wide = useWideLayout();
  const scroll = useRef<ScrollView>(null);
  const cellOffsets = useRef(new Map<string, number>());
  const runners = useRef(new Map<string, () => void>());
  const [selectedId, setSelectedId] = useState<string | null>(notebook.cells[0]?.id ?? null);
  const [adding, setAdding] = useState(false);
  const [justAdded, setJustAdded] = useState<string | null>(null);
  const [versionFormOpen, setVersionFormOpen] = useState(false);
  const [helpOpen, setHelpOpen] = useState(false);
  const [exportError, setExportError] = useState<string | null>(null);
  const addCell = useAddCellMutation(notebook.id);
  const runAll = useRunAllMutation(notebook.id);

  // Cells run-all could not queue (queue limit) and that are still not up to date; run all again picks them up.
  const runAllWaiting = (runAll.data?.waiting ?? []).filter((label) => notebook.cells.some((cell) => cell.label === label && cell.state !== 'up-to-date' && cell.state !== 'running'));
  const selectedIndex = notebook.cells.findIndex((cell) => cell.id === selectedId);
  const add = (kind: CellKind) => {
    const label = freshLabel(kind, notebook.cells);
    const position = selectedIndex >= 0 && selectedIndex < notebook.cells.length - 1 ? selectedIndex + 1 : undefined;
    addCell.mutate(
      { label, input: defaultInput(kind, notebook.cells.slice(0, position ?? notebook.cells.length)), position },
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
    scroll.current?.scrollTo({ y: Math.max(0, (cellOffsets.current.get(cell.id) ?? 0) - spacing.lg), animated: true });
  };
  const exportAs = async (format: 'tex' | 'json') => {
    setExportError(null);
    try {
      const text = await fetchNotebookExport(notebook.id, format);
      const base = notebook.title.replace(/[^A-Za-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'notebook';
      await saveTextFile(`${base}.${format}`, text, format === 'tex' ? 'application/x-tex' : 'application/json');
    } catch (error) {
      setExportError(error instanceof Error ? error.message : 'The export failed.');
    }
  };

  useKeyboardShortcuts(
    {
      runCell: () => (selectedId ? runners.current.get(selectedId)?.() : undefined),
      runAll: () => runAll.mutate(),
      addCell: () => setAdding(true),
      help: () => setHelpOpen((open) => !open),
    },
    wide && notebook.canEdit,
  );

  const body = (
    <ScrollView ref={scroll} style={styles.scroll} contentContainerStyle={styles.content}>
      <View style={styles.column}>
        <NotebookTitle notebook={notebook} />
        <View style={styles.toolbar}>
          {notebook.canEdit ? <ChipButton label={runAll.isPending ? 'Starting…' : 'Run all'} tone="accent" onPress={() => runAll.mutate()} testID="run-all" /> : null}
          {notebook.canEdit ? <ChipButton label="Save version" selected={versionFormOpen} onPress={() => setVersionFormOpen(!versionFormOpen)} testID="save-version" /> : null}
          <ChipButton label="History" onPress={() => router.push(`/notebooks/${notebook.id}/versions`)} testID="open-history" />
          <ChipButton label="Present" onPress={() => router.push(`/notebooks/${notebook.id}/present`)} testID="open-present" />
          <ChipButton label="LaTeX" onPress={() => void exportAs('tex')} testID="export-tex" accessibilityLabel="Export as LaTeX" />
          <ChipButton label="JSON" onPress={() => void exportAs('json')} testID="export-json" accessibilityLabel="Export as JSON" />
          {wide ? <ChipButton label="Shortcuts" onPress={() => setHelpOpen(true)} testID="open-shortcuts" /> : null}
        </View>
        {runAll.data && runAll.data.runs.length === 0 && runAll.data.waiting.length === 0 ? <Notice tone="info" message="Every cell is already up to date." testID="run-all-nothing" /> : null}
        {runAllWaiting.length ? <Notice tone="info" message={waitingMessage(runAllWaiting)} testID="run-all-waiting" /> : null}
        {runAll.isError ? <Notice tone="error" message={runAll.error.message} /> : null}
        {exportError ? <Notice tone="error" message={exportError} /> : null}
        {versionFormOpen ? <SaveVersionForm notebookId={notebook.id} /> : null}

        {notebook.cells.length === 0 ? <Notice tone="info" message="This notebook has no cells yet. Start with a model & parameters cell, then add what it should compute." /> : null}
        {notebook.cells.map((cell, index) => (
          <View key={cell.id} onLayout={(event) => cellOffsets.current.set(cell.id, event.nativeEvent.layout.y)}>
            <CellCard
              notebook={notebook}
              cell={cell}
              index={index}
              wide={wide}
              selected={cell.id === selectedId}
              onSelect={() => setSelectedId(cell.id)}
              startEditing={cell.id === justAdded}
              registerRunner={(run) => runners.current.set(cell.id, run)}
            />
          </View>
        ))}
        {notebook.canEdit ? (
          adding || notebook.cells.length === 0 ? (
            <AddCellBar onAdd={add} busy={addCell.isPending} onClose={notebook.cells.length ? () => setAdding(false) : undefined} />
          ) : (
            <View style={styles.toolbar}>
              <ChipButton label="+ Add cell" onPress={() => setAdding(true)} testID="add-cell" />
            </View>
          )
        ) : null}
        {addCell.isError ? <Notice tone="error" message={addCell.error.message} /> : null}
      </View>
    </ScrollView>
  );

  return (
    <View style={styles.root}>
      {wide ? <NotebookOutline cells={notebook.cells} selectedId={selectedId} onPick={jumpTo} /> : null}
      {body}
      <ShortcutSheet visible={helpOpen} onClose={() => setHelpOpen(false)} />
    </View>
  );
}

const styles = StyleSheet.create({
  root: { flex: 1, flexDirection: 'row', backgroundColor: colors.paper },
  scroll: { flex: 1 },
  content: { padding: spacing.lg, paddingBottom: spacing.xxl * 3 },
  column: { width: '100%', maxWidth: 960, alignSelf: 'center', gap: spacing.lg },
  toolbar: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm },
  centered: { flex: 1, padding: spacing.xl, backgroundColor: colors.paper },
  muted: { fontFamily: fonts.regular, fontSize: 14, color: colors.inkFaint },
});
