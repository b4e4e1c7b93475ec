import { createContext, useContext, useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { dependenciesOf, type CellInput, type CellKind, type CellView } from '../../shared/notebook';
import { ChipButton } from './ChipButton';

/** A cell editor holding changes that are not saved yet; a run uses the saved copy unless they are saved first. */
export interface UnsavedEdit {
  cellId: string;
  /** The saved label: the one other cells refer to. */
  label: string;
  kind: CellKind;
  valid: boolean;
  /** Saves the edits; false when the save failed (the cell itself says why). */
  save: () => Promise<boolean>;
}

/** The open editors of a notebook with unsaved changes, by cell id. */
export class UnsavedEdits {
  private readonly edits = new Map<string, UnsavedEdit>();
  set(edit: UnsavedEdit) {
    this.edits.set(edit.cellId, edit);
  }
  remove(cellId: string) {
    this.edits.delete(cellId);
  }
  /** Unsaved edits of the cells a run of `cell` reads, transitively (a comparison reads its scan, the scan its setup). */
  behind(cell: { label: string; input: CellInput }, cells: Pick<CellView, 'label' | 'input'>[]): UnsavedEdit[] {
    const upstream = upstreamLabels(cell, cells);
    return [...this.edits.values()].filter((edit) => upstream.includes(edit.label));
  }
  /** Unsaved edits a run of every cell would read: those of cells that run or feed a cell that does. */
  behindAll(cells: Pick<CellView, 'id' | 'kind' | 'dependents'>[]): UnsavedEdit[] {
    return [...this.edits.values()].filter((edit) => cells.some((cell) => cell.id === edit.cellId && (cell.dependents.length > 0 || (cell.kind !== 'note' && cell.kind !== 'setup'))));
  }
}

/** Labels of the cells `cell` takes input from, nearest first. */
export function upstreamLabels(cell: { label: string; input: CellInput }, cells: Pick<CellView, 'label' | 'input'>[]): string[] {
  const found: string[] = [];
  const frontier = dependenciesOf(cell.input);
  while (frontier.length) {
    const label = frontier.shift()!;
    if (found.includes(label) || label === cell.label) continue;
    found.push(label);
    const source = cells.find((other) => other.label === label);
    if (source) frontier.push(...dependenciesOf(source.input));
  }
  return found;
}

// Without a provider every card shares one registry: cell ids are unique and cards remove themselves when they go.
const UnsavedEditsContext = createContext(new UnsavedEdits());
export const UnsavedEditsProvider = UnsavedEditsContext.Provider;
export const useUnsavedEdits = () => useContext(UnsavedEditsContext);

/** Saves the edits one after another; false as soon as one fails. */
export async function saveAll(edits: UnsavedEdit[]): Promise<boolean> {
  for (const edit of edits) if (!(await edit.save())) return false;
  return true;
}

const kindWords: Partial<Record<CellKind, string>> = { setup: 'model & parameters cell', scan: 'scan cell' };
const quoted = (labels: string[]) => labels.map((label) => `"${label}"`).join(labels.length === 2 ? ' and ' : ', ');

/** What the question says: which cells hold the edits, in the product's words. */
export function unsavedQuestion(edits: UnsavedEdit[]): string {
  if (edits.length === 1) {
    const [edit] = edits;
    return `The ${kindWords[edit.kind] ?? 'cell'} "${edit.label}" has unsaved changes. This run would use its saved version.`;
  }
  return `The cells ${quoted(edits.map((edit) => edit.label))} have unsaved changes. This run would use their saved versions.`;
}

/**
 * Runs through a question when cells the run reads hold unsaved edits: save them first, run what is saved,
 * or do nothing. `guard(edits, run)` runs at once when there is nothing to ask.
 */
export function useUnsavedPrompt(testID: string) {
  const [pending, setPending] = useState<{ edits: UnsavedEdit[]; run: () => void } | null>(null);
  const [failed, setFailed] = useState<string | null>(null);
  const [saving, setSaving] = useState(false);
  const guard = (edits: UnsavedEdit[], run: () => void) => {
    setFailed(null);
    if (edits.length === 0) return run();
    setPending({ edits, run });
  };
  const saveAndRun = async () => {
    if (!pending) return;
    setSaving(true);
    const saved = await saveAll(pending.edits);
    setSaving(false);
    if (!saved) return setFailed('A save failed, so nothing was run: the cell that could not be saved says why.');
    setPending(null);
    pending.run();
  };
  const runSaved = () => {
    setPending(null);
    pending?.run();
  };
  const prompt = pending ? (
    <UnsavedPrompt edits={pending.edits} saving={saving} failed={failed} onSaveAndRun={() => void saveAndRun()} onRunSaved={runSaved} onCancel={() => setPending(null)} testID={testID} />
  ) : null;
  return { guard, prompt };
}

function UnsavedPrompt({ edits, saving, failed, onSaveAndRun, onRunSaved, onCancel, testID }: {
  edits: UnsavedEdit[];
  saving: boolean;
  failed: string | null;
  onSaveAndRun: () => void;
  onRunSaved: () => void;
  onCancel: () => void;
  testID: string;
}) {
  const invalid = edits.filter((edit) => !edit.valid).map((edit) => edit.label);
  return (
    <View style={styles.box} accessibilityRole="alert" testID={testID}>
      <Text style={styles.question} testID={`${testID}-question`}>{unsavedQuestion(edits)}</Text>
      {invalid.length ? <Text style={styles.reason} testID={`${testID}-invalid`}>Fix the marked fields of {quoted(invalid)} before saving.</Text> : null}
      {failed ? <Text style={styles.reason} testID={`${testID}-failed`}>{failed}</Text> : null}
      <View style={styles.actions}>
        <ChipButton label={saving ? 'Saving…' : 'Save and run'} tone="accent" disabled={saving || invalid.length > 0} onPress={onSaveAndRun} testID={`${testID}-save-and-run`} />
        <ChipButton label="Run the saved setup" disabled={saving} onPress={onRunSaved} testID={`${testID}-run-saved`} />
        <ChipButton label="Cancel" disabled={saving} onPress={onCancel} testID={`${testID}-cancel`} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: spacing.sm, padding: spacing.md, borderRadius: 6, borderLeftWidth: 4, borderLeftColor: colors.amber, backgroundColor: colors.amberWash },
  question: { fontFamily: fonts.medium, fontSize: 14, lineHeight: 20, color: colors.ink },
  reason: { fontFamily: fonts.regular, fontSize: 13, color: colors.danger },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm },
});
