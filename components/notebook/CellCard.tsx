import { useEffect, useMemo, useRef, useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useCommentsQuery } from '../../hooks/api/comments';
import { isConflict, useDeleteCellMutation, useMoveCellMutation, useReloadNotebook, useRunCellMutation, useUpdateCellMutation } from '../../hooks/api/notebooks';
import { cellKindTitles, type CellView, type NotebookDetail, type RunView } from '../../shared/notebook';
import { can } from '../../shared/notebook/sharing';
import { CellComments } from '../comments/CellComments';
import { groupThreads, visibleCount } from '../comments/threads';
import { TextField } from '../ui/TextField';
import { Notice } from '../ui/Notice';
import { errorsFromServer } from '../auth/formErrors';
import { CellActions } from './CellActions';
import { CellOutput } from './CellOutput';
import { CellStateBadge } from './CellStateBadge';
import { cellSummary } from './cellSummary';
import { ChipButton } from './ChipButton';
import { CellEditor } from './editors/CellEditor';
import { monoFont } from './monoFont';
import { NoteView } from './NoteView';
import { useUnsavedEdits, useUnsavedPrompt } from './unsavedEdits';
import { useCellDraft } from './useCellDraft';

export interface CellCardProps {
  notebook: NotebookDetail;
  cell: CellView;
  index: number;
  wide: boolean;
  selected: boolean;
  onSelect: () => void;
  /** Open the editor straight away (a cell just added); it closes after the first save. */
  startEditing?: boolean;
  /** The editor of a just-added cell was opened: the screen need not ask again. */
  onStartedEditing?: () => void;
  /** Hands the screen this cell's run (save first if edited), for the keyboard shortcut. */
  registerRunner?: (run: () => void) => void;
  /** Open the cell's comment threads (a link to the cell from a comment or the activity list). */
  openComments?: boolean;
  /** The notebook was opened through a share link: comments go through the link's routes. */
  shareToken?: string;
}

export const runsJob = (cell: Pick<CellView, 'kind'>) => cell.kind !== 'note' && cell.kind !== 'setup';

function duration(ms: number): string {
  if (ms < 120_000) return `${Math.round(ms / 1000)} s`;
  if (ms < 7_200_000) return `${Math.round(ms / 60_000)} min`;
  return `${Math.round(ms / 3_600_000)} h`;
}

/** What a queued run is waiting for, and when the wait is given up. */
export function queueNote(run: RunView, now = Date.now()): string | null {
  if (run.status !== 'queued' || !run.queue) return null;
  const { ahead, since, waitLimitMs } = run.queue;
  const waited = Math.max(0, now - Date.parse(since));
  const lead = ahead === 0 ? 'Next in line for a worker' : `${ahead} job${ahead === 1 ? '' : 's'} ahead in the queue`;
  return `${lead}; waiting ${duration(waited)} so far, given up after ${duration(waitLimitMs)}.`;
}

/**
 * The cell's threads behind a count. The count reads comments the notebook's comment panel already fetched
 * (no request per cell); opening the threads fetches them.
 */
function useCellComments(notebook: NotebookDetail, cell: CellView, openFromLink: boolean, shareToken?: string) {
  const [open, setOpen] = useState(openFromLink);
  useEffect(() => {
    if (openFromLink) setOpen(true);
  }, [openFromLink]);
  const comments = useCommentsQuery({ notebookId: notebook.id, shareToken }, { enabled: open });
  const count = visibleCount(groupThreads((comments.data ?? []).filter((comment) => comment.cellId === cell.id)));
  const mayComment = can(notebook.role, 'comment');
  const hidden = !open && !mayComment && comments.data !== undefined && count === 0;
  const label = count ? `${count} comment${count === 1 ? '' : 's'}` : mayComment ? 'Comment' : 'Comments';
  return { open, toggle: () => setOpen(!open), hidden, label };
}

/** The d of each model & parameters cell, as saved: scan ranges are checked against it. */
function useSetupDimensions(cells: CellView[]) {
  const key = cells.map((cell) => (cell.input.kind === 'setup' ? `${cell.label}=${cell.input.d ?? ''}` : '')).join(';');
  // eslint-disable-next-line react-hooks/exhaustive-deps
  return useMemo(() => new Map(cells.flatMap((cell) => (cell.input.kind === 'setup' ? [[cell.label, cell.input.d] as const] : []))), [key]);
}

/** Open once when asked (a cell just added) and close after the first save that follows. */
function useEditorOpening(startEditing: boolean, onStartedEditing?: () => void) {
  const [editing, setEditing] = useState(startEditing);
  const closeAfterSave = useRef(startEditing);
  useEffect(() => {
    if (!startEditing) return;
    setEditing(true);
    closeAfterSave.current = true;
    onStartedEditing?.();
    // Only the request to open counts, not a new callback.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [startEditing]);
  const saved = () => {
    if (!closeAfterSave.current) return;
    closeAfterSave.current = false;
    setEditing(false);
  };
  return { editing, setEditing, saved };
}

export function CellCard({ notebook, cell, index, wide, selected, onSelect, startEditing = false, onStartedEditing, registerRunner, openComments = false, shareToken }: CellCardProps) {
  const { editing, setEditing, saved: closeIfNew } = useEditorOpening(startEditing, onStartedEditing);
  const comments = useCellComments(notebook, cell, openComments, shareToken);
  const setupDimensions = useSetupDimensions(notebook.cells);
  const { draft, dirty, errors, valid, setInput, setLabel, reset } = useCellDraft(cell, { setupDimensions });
  const unsaved = useUnsavedEdits();
  const unsavedPrompt = useUnsavedPrompt(`cell-${cell.label}-unsaved`);
  const reloadNotebook = useReloadNotebook(notebook.id);
  const update = useUpdateCellMutation(notebook.id);
  const run = useRunCellMutation(notebook.id);
  const move = useMoveCellMutation(notebook.id);
  const remove = useDeleteCellMutation(notebook.id);
  const setupLabels = notebook.cells.filter((other) => other.kind === 'setup' && other.id !== cell.id).map((other) => other.label);
  const scanLabels = notebook.cells.filter((other) => other.kind === 'scan' && other.id !== cell.id).map((other) => other.label);
  const testPrefix = `cell-${cell.label}`;
  const conflict = isConflict(update.error);
  const serverErrors = update.error && !conflict ? errorsFromServer(update.error) : null;
  const fieldErrors = { ...(serverErrors?.fields ?? {}), ...errors };

  const save = async (revision = draft.baseRevision) => {
    const saved = await update.mutateAsync({ cellId: cell.id, revision, label: draft.label !== cell.label ? draft.label : undefined, input: draft.input });
    const fresh = saved.notebook.cells.find((other) => other.id === cell.id);
    if (fresh) reset(fresh);
    closeIfNew();
  };
  const saveQuietly = () => save().then(() => true, () => false);
  const latestSave = useRef(saveQuietly);
  latestSave.current = saveQuietly;
  useEffect(() => {
    if (dirty) unsaved.set({ cellId: cell.id, label: cell.label, kind: cell.kind, valid, save: () => latestSave.current() });
    else unsaved.remove(cell.id);
  }, [unsaved, dirty, valid, cell.id, cell.label, cell.kind]);
  useEffect(() => () => unsaved.remove(cell.id), [unsaved, cell.id]);

  const runWithOwnEdits = async () => {
    if (dirty) {
      if (!valid) return setEditing(true);
      try {
        await save();
      } catch {
        return;
      }
    }
    run.mutate(cell.id);
  };
  // Edits of this cell are saved with its run; edits of the cells it reads are asked about.
  const runNow = () => {
    onSelect();
    unsavedPrompt.guard(unsaved.behind({ label: cell.label, input: draft.input }, notebook.cells), () => void runWithOwnEdits());
  };
  const reloadTheirs = async () => {
    const fresh = (await reloadNotebook()).cells.find((other) => other.id === cell.id);
    update.reset();
    if (fresh) reset(fresh);
  };
  const keepMine = async () => {
    const fresh = (await reloadNotebook()).cells.find((other) => other.id === cell.id);
    if (fresh) await save(fresh.revision).catch(() => undefined);
  };

  if (runsJob(cell)) registerRunner?.(runNow);
  const stale = cell.state === 'out-of-date';
  const waitingNote = cell.state === 'running' && cell.lastRun ? queueNote(cell.lastRun) : null;
  return (
    <View style={[styles.card, stale && styles.stale, selected && wide && styles.selected]} testID={testPrefix} onStartShouldSetResponderCapture={() => { onSelect(); return false; }}>
      <View style={styles.head}>
        <View style={styles.headText}>
          <Text style={styles.kind}>{cellKindTitles[cell.kind]}</Text>
          <Text style={styles.label} testID={`${testPrefix}-label`}>{cell.label}</Text>
          {runsJob(cell) ? <CellStateBadge state={cell.state} run={cell.lastRun} testID={`${testPrefix}-state`} /> : null}
        </View>
        <View style={styles.headActions}>
          {comments.hidden ? null : (
            <ChipButton label={comments.label} selected={comments.open} accessibilityLabel={comments.open ? 'Hide comments' : `${comments.label} on ${cell.label}`} onPress={comments.toggle} testID={`cell-comments-${cell.label}`} />
          )}
          {notebook.canEdit ? (
            <CellActions
              wide={wide}
              testPrefix={testPrefix}
              canRun={runsJob(cell)}
              running={cell.state === 'running' || run.isPending}
              waiting={cell.lastRun?.status === 'queued'}
              editing={editing}
              isFirst={index === 0}
              isLast={index === notebook.cells.length - 1}
              onRun={runNow}
              onToggleEdit={() => setEditing(!editing)}
              onMove={(offset) => move.mutate({ cellId: cell.id, position: index + offset })}
              onDelete={() => remove.mutate(cell.id)}
            />
          ) : null}
        </View>
      </View>

      {unsavedPrompt.prompt}
      {dirty && !editing ? (
        <Text style={styles.staleText} testID={`${testPrefix}-unsaved-note`}>
          Unsaved changes. Open the editor to save or discard them.
        </Text>
      ) : null}
      {waitingNote ? <Text style={styles.meta} testID={`${testPrefix}-queue`}>{waitingNote}</Text> : null}
      {cell.dependents.length ? <Text style={styles.meta}>Feeds {cell.dependents.join(', ')}</Text> : null}
      {stale ? (
        <Text style={styles.staleText} testID={`${testPrefix}-stale`}>
          Inputs changed since this was computed. Run it again to bring it up to date.
        </Text>
      ) : null}

      {editing ? (
        <View style={styles.editor}>
          <TextField label="Label (other cells refer to it by this)" value={draft.label} onChangeText={setLabel} error={fieldErrors.label} testID={`${testPrefix}-field-label`} />
          <CellEditor input={draft.input} errors={fieldErrors} onChange={setInput} setupLabels={setupLabels} setupDimensions={setupDimensions} scanLabels={scanLabels} datasets={notebook.datasets} testPrefix={`${testPrefix}-field`} />
          {cell.kind === 'note' && draft.input.kind === 'note' && draft.input.text ? <NoteView text={draft.input.text} /> : null}
          {serverErrors?.message ? <Notice tone="error" message={serverErrors.message} testID={`${testPrefix}-save-error`} /> : null}
          <View style={styles.editorActions}>
            <ChipButton label={update.isPending ? 'Saving…' : dirty ? 'Save' : 'Saved'} tone="accent" disabled={!dirty || !valid || update.isPending} onPress={() => void saveQuietly()} testID={`${testPrefix}-save`} />
            {dirty ? <ChipButton label="Discard edits" onPress={() => reset(cell)} testID={`${testPrefix}-discard`} /> : null}
          </View>
        </View>
      ) : cell.kind === 'note' ? (
        cell.input.kind === 'note' && cell.input.text ? <NoteView text={cell.input.text} testID={`${testPrefix}-note`} /> : <Text style={styles.meta}>An empty note. Edit it to write.</Text>
      ) : (
        <Text style={styles.summary}>{cellSummary(cell.input)}</Text>
      )}

      {conflict ? (
        <View style={styles.conflict} testID={`${testPrefix}-conflict`}>
          <Notice tone="error" message="Someone saved this cell after you started editing it." />
          <View style={styles.editorActions}>
            <ChipButton label="Reload theirs" onPress={() => void reloadTheirs()} testID={`${testPrefix}-reload-theirs`} />
            <ChipButton label="Keep mine" tone="accent" onPress={() => void keepMine()} testID={`${testPrefix}-keep-mine`} />
          </View>
        </View>
      ) : null}
      {run.error ? <Notice tone="error" message={run.error.message} testID={`${testPrefix}-run-error`} /> : null}
      {move.error || remove.error ? <Notice tone="error" message={(move.error ?? remove.error)!.message} /> : null}

      <CellOutput notebook={notebook} cell={cell} />
      {comments.open ? <CellComments notebookId={notebook.id} role={notebook.role} cellId={cell.id} cellLabel={cell.label} shareToken={shareToken} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  card: { backgroundColor: colors.surface, borderRadius: 8, borderWidth: 1, borderColor: colors.rule, borderLeftWidth: 4, borderLeftColor: colors.rule, padding: spacing.lg, gap: spacing.md },
  stale: { borderLeftColor: colors.amber, backgroundColor: '#FFFCF6' },
  selected: { borderColor: colors.slate, borderLeftColor: colors.slate },
  head: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', flexWrap: 'wrap', gap: spacing.sm },
  headActions: { flexDirection: 'row', alignItems: 'flex-start', flexWrap: 'wrap', gap: spacing.sm, marginLeft: 'auto' },
  headText: { flexDirection: 'row', alignItems: 'center', flexWrap: 'wrap', gap: spacing.sm, flexShrink: 1 },
  kind: { fontFamily: fonts.semibold, fontSize: 15, color: colors.ink },
  label: { fontFamily: monoFont, fontSize: 13, color: colors.inkSoft, backgroundColor: colors.paper, paddingHorizontal: 6, borderRadius: 4 },
  meta: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  staleText: { fontFamily: fonts.medium, fontSize: 13, color: colors.amberDeep },
  summary: { fontFamily: fonts.regular, fontSize: 14, color: colors.inkSoft },
  editor: { gap: spacing.md, borderTopWidth: 1, borderTopColor: colors.rule, paddingTop: spacing.md },
  editorActions: { flexDirection: 'row', gap: spacing.sm, flexWrap: 'wrap' },
  conflict: { gap: spacing.sm },
});
