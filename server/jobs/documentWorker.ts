// Runs in a worker thread: typesetting an export (every formula checked with KaTeX) and comparing two
// versions (parsing and walking their results) grow with the notebook, long enough to hold up other
// people's requests if done on the request thread.
import { compareSnapshots, type VersionSnapshot } from '../../shared/notebook/comparison';
import type { CellComparison } from '../../shared/notebook/api';
import { toLatexDocument, type NotebookDocument } from '../../shared/notebook/exports';

export function compareVersions({ fromJson, toJson }: { fromJson: string; toJson: string }): CellComparison[] {
  return compareSnapshots(JSON.parse(fromJson) as VersionSnapshot, JSON.parse(toJson) as VersionSnapshot);
}

export default function renderLatex(document: NotebookDocument): string {
  return toLatexDocument(document);
}
