import { useEffect, useMemo, useState } from 'react';
import { canonicalJson, type CellInput, type CellView } from '../../shared/notebook';
import { cellFieldErrors, type FieldContext } from './fieldErrors';

export interface CellDraft {
  label: string;
  input: CellInput;
  /** The revision the draft was started from; sent with the save so a newer save elsewhere is noticed. */
  baseRevision: number;
}

/** A cell's unsaved edits, following the server's copy for as long as nothing has been changed here. */
export function useCellDraft(cell: CellView, context: FieldContext = {}) {
  const [draft, setDraft] = useState<CellDraft>({ label: cell.label, input: cell.input, baseRevision: cell.revision });
  const dirty = draft.label !== cell.label || canonicalJson(draft.input) !== canonicalJson(cell.input);
  useEffect(() => {
    if (!dirty) setDraft({ label: cell.label, input: cell.input, baseRevision: cell.revision });
    // Follow the server only while there are no local edits to keep.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [cell.revision, cell.label, canonicalJson(cell.input)]);
  const { setupDimensions } = context;
  const errors = useMemo(() => cellFieldErrors(draft.label, draft.input, { setupDimensions }), [draft.label, draft.input, setupDimensions]);
  return {
    draft,
    dirty,
    errors,
    valid: Object.keys(errors).length === 0,
    setInput: (input: CellInput) => setDraft((current) => ({ ...current, input })),
    setLabel: (label: string) => setDraft((current) => ({ ...current, label })),
    reset: (from: CellView) => setDraft({ label: from.label, input: from.input, baseRevision: from.revision }),
    rebase: (revision: number) => setDraft((current) => ({ ...current, baseRevision: revision })),
  };
}
