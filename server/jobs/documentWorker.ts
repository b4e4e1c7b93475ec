// Runs in a worker thread: typesetting an export (every formula checked with KaTeX), comparing two
// versions (parsing and walking their results) and reading a version to restore grow with the notebook,
// long enough to hold up other people's requests if done on the request thread.
import { compareSnapshots, type VersionSnapshot } from '../../shared/notebook/comparison';
import type { CellComparison } from '../../shared/notebook/api';
import type { CellInput } from '../../shared/notebook/cells';
import { toLatexDocument, type NotebookDocument } from '../../shared/notebook/exports';

/** What a restore needs of a snapshot: its inputs, not its outputs. */
export interface RestorableSnapshot {
  title: string;
  summary: string;
  cells: { label: string; kind: CellInput['kind']; input: CellInput }[];
}

export function compareVersions({ fromJson, toJson }: { fromJson: string; toJson: string }): CellComparison[] {
  return compareSnapshots(JSON.parse(fromJson) as VersionSnapshot, JSON.parse(toJson) as VersionSnapshot);
}

export function latex(documentJson: string): string {
  return toLatexDocument(JSON.parse(documentJson) as NotebookDocument);
}

export function restorable(snapshotJson: string): RestorableSnapshot {
  const snapshot = JSON.parse(snapshotJson) as VersionSnapshot;
  return {
    title: snapshot.title,
    summary: snapshot.summary,
    cells: snapshot.cells.map((cell) => ({ label: cell.label, kind: cell.kind, input: cell.input as CellInput })),
  };
}

export default latex;
