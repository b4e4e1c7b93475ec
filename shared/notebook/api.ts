import type { DatasetView } from './datasets';
import { z } from 'zod';
import { cellInput, cellLabel, type CellInput, type CellKind } from './cells';
import type { CellState } from './dependencies';
import { listFilter, type NotebookRole } from './sharing';

/** Request bodies of the notebook API. */
export const createNotebookInput = z.strictObject({
  title: z.string().trim().min(1, 'Give the notebook a title').max(200),
  summary: z.string().trim().max(2000).default(''),
  groupId: z.string().regex(/^[a-z0-9]{10,40}$/).nullable().default(null),
});

export const updateNotebookInput = z.strictObject({
  title: z.string().trim().min(1, 'Give the notebook a title').max(200).optional(),
  summary: z.string().trim().max(2000).optional(),
  groupId: z.string().regex(/^[a-z0-9]{10,40}$/).nullable().optional(),
});

export const createCellInput = z.strictObject({
  label: cellLabel,
  input: cellInput,
  /** 0-based; appended at the end when omitted. */
  position: z.number().int().min(0).max(500).optional(),
});

export const updateCellInput = z.strictObject({
  label: cellLabel.optional(),
  input: cellInput.optional(),
  /** The revision the edit was made on; a different current revision means someone else saved first (409). */
  revision: z.number().int().min(1),
});

export const moveCellInput = z.strictObject({ position: z.number().int().min(0).max(500) });
export const saveVersionInput = z.strictObject({ message: z.string().trim().min(1, 'Say what this version is').max(500) });
export const listNotebooksQuery = z.strictObject({
  q: z.string().trim().max(200).optional(),
  /** mine = I own it; shared = someone else owns it and it reaches me; group = it reaches me through a group. */
  filter: listFilter.optional(),
  /** With filter=group: only notebooks shared with this one of my groups. */
  groupId: z.string().regex(/^[a-z0-9]{10,40}$/).optional(),
});

/** Reply shapes. */
export interface RunView {
  id: string;
  status: 'queued' | 'running' | 'done' | 'failed' | 'cancelled';
  progress: number;
  cached: boolean;
  engineVersion: string;
  durationMs: number | null;
  result: unknown | null;
  error: { code: string; message: string } | null;
  startedAt: string | null;
  finishedAt: string | null;
  /** Set while the run waits for a worker (status 'queued'). */
  queue: QueueStanding | null;
}

export interface QueueStanding {
  /** Jobs that get a worker before this one. */
  ahead: number;
  /** When the run joined the queue (ISO time). */
  since: string;
  /** A run still waiting after this long is given up (error code 'queue-wait'). */
  waitLimitMs: number;
}

/** Reply of run-all: the runs started or queued, and the labels of cells left waiting because the queue was full. */
export interface RunAllReply {
  runs: RunView[];
  waiting: string[];
}

export interface CellView {
  id: string;
  position: number;
  label: string;
  kind: CellKind;
  input: CellInput;
  revision: number;
  state: CellState;
  /** Labels of cells that take input from this one. */
  dependents: string[];
  lastRun: RunView | null;
  updatedAt: string;
}

export interface NotebookSummary {
  id: string;
  title: string;
  summary: string;
  ownerId: string;
  ownerName: string;
  /** The group the notebook is filed under (its owner's choice); that group holds at least an editor grant. */
  groupId: string | null;
  groupName: string | null;
  cellCount: number;
  updatedAt: string;
  /** The caller's role: the stronger of their own grant and their groups' grants (owner for the owner). */
  role: NotebookRole;
  /** How the notebook reaches the caller when they do not own it: who granted it, and through which group if any. */
  sharedBy: { personName: string | null; groupName: string | null } | null;
  /** role is editor or owner. */
  canEdit: boolean;
}

export interface NotebookDetail extends NotebookSummary {
  cells: CellView[];
  /** The notebook's datasets, without their points (GET …/datasets/:datasetId has those). */
  datasets: DatasetView[];
}

export interface VersionSummary {
  id: string;
  number: number;
  message: string;
  authorName: string;
  createdAt: string;
  automatic: boolean;
}

export interface VersionCellSnapshot {
  label: string;
  kind: CellKind;
  input: CellInput;
  output: unknown | null;
}

export interface VersionDetail extends VersionSummary {
  title: string;
  summary: string;
  cells: VersionCellSnapshot[];
  /** The datasets this version holds (absent in versions saved before datasets existed). */
  datasets?: DatasetView[];
}

export interface TextChange {
  value: string;
  added?: boolean;
  removed?: boolean;
}

/** One value that differs, at a JSON path such as `points[3].values.nuInv` (texts shortened). */
export interface ValueChange {
  path: string;
  before: string | null;
  after: string | null;
}

/** What differs between two inputs or two results, found by walking both (a bounded walk). */
export interface ValueDifferences {
  /** Values that differ (counted as far as the walk went). */
  changed: number;
  /** The first of them; `more` are not listed. */
  listed: ValueChange[];
  more: number;
  /** False when the walk stopped at its size limit before seeing everything. */
  complete: boolean;
  /** Size of each side as compact JSON, in characters (0 when absent). */
  sizeBefore: number;
  sizeAfter: number;
}

export interface CellComparison {
  label: string;
  change: 'added' | 'removed' | 'changed' | 'unchanged';
  /** Line-by-line text diffs; empty for a part whose text is too large to diff (see the `*Summarised` flags). */
  input: TextChange[];
  output: TextChange[];
  inputSummarised: boolean;
  outputSummarised: boolean;
  inputValues: ValueDifferences;
  outputValues: ValueDifferences;
}

export interface VersionComparison {
  from: VersionSummary;
  to: VersionSummary;
  cells: CellComparison[];
}
