// Comparing two saved versions of a notebook, cell by cell. Pure and synchronous: the server runs it in
// a worker thread, and its limits bound the work whatever the size of the results compared.
import { diffLines } from 'diff';
import type { CellComparison, TextChange, ValueChange, ValueDifferences, VersionCellSnapshot } from './api';

export interface VersionSnapshot {
  title: string;
  summary: string;
  cells: VersionCellSnapshot[];
}

/** Limits that keep a comparison cheap whatever the size of the results being compared. */
export const COMPARISON_LIMITS = {
  /** A part (input or result) is diffed line by line only when both sides print to at most this many characters. */
  maxTextDiffChars: 20_000,
  /** Values visited by the structural walk of one part. */
  maxNodesPerPart: 50_000,
  /** Values visited over the whole comparison. */
  maxNodesPerComparison: 400_000,
  /** Changed values listed per part (the rest are counted). */
  maxListedChanges: 20,
  /** Characters of a listed before/after value. */
  maxValueChars: 120,
} as const;

const compactSize = (value: unknown) => (value === null || value === undefined ? 0 : JSON.stringify(value).length);
const pretty = (value: unknown) => (value === null || value === undefined ? '' : `${JSON.stringify(value, null, 2)}\n`);

function textChanges(before: unknown, after: unknown): TextChange[] {
  return diffLines(pretty(before), pretty(after)).map((part) => ({ value: part.value, ...(part.added ? { added: true } : {}), ...(part.removed ? { removed: true } : {}) }));
}

function shortText(value: unknown): string | null {
  if (value === undefined || value === null) return null;
  const text = typeof value === 'string' ? value : JSON.stringify(value);
  return text.length > COMPARISON_LIMITS.maxValueChars ? `${text.slice(0, COMPARISON_LIMITS.maxValueChars - 1)}…` : text;
}

const isContainer = (v: unknown): v is Record<string, unknown> | unknown[] => typeof v === 'object' && v !== null;

/**
 * The values that differ between two JSON values, walking both side by side. The walk visits at most
 * `budget.nodes` values, so its cost is bounded whatever the size of the inputs.
 */
export function valueDifferences(before: unknown, after: unknown, budget: { nodes: number }): ValueDifferences {
  const listed: ValueChange[] = [];
  let changed = 0;
  let nodes = Math.min(budget.nodes, COMPARISON_LIMITS.maxNodesPerPart);
  const startNodes = nodes;
  // the path is kept as segments and printed only for the few changes that are listed
  const segments: (string | number)[] = [];
  const pathText = () => segments.map((s, i) => (typeof s === 'number' ? `[${s}]` : i === 0 ? s : `.${s}`)).join('') || '(whole value)';
  const note = (b: unknown, a: unknown) => {
    changed++;
    if (listed.length < COMPARISON_LIMITS.maxListedChanges) listed.push({ path: pathText(), before: shortText(b), after: shortText(a) });
  };
  function child(segment: string | number, b: unknown, a: unknown): void {
    segments.push(segment);
    walk(b, a);
    segments.pop();
  }
  function walk(b: unknown, a: unknown): void {
    if (nodes <= 0) return;
    nodes--;
    if (Array.isArray(b) && Array.isArray(a)) {
      if (b.length !== a.length) {
        segments.push('length');
        note(b.length, a.length);
        segments.pop();
      }
      for (let i = 0; i < Math.max(b.length, a.length) && nodes > 0; i++) child(i, b[i], a[i]);
      return;
    }
    if (isContainer(b) && isContainer(a) && !Array.isArray(b) && !Array.isArray(a)) {
      for (const key of Object.keys(b)) if (nodes > 0) child(key, b[key], Object.hasOwn(a, key) ? a[key] : undefined);
      for (const key of Object.keys(a)) if (nodes > 0 && !Object.hasOwn(b, key)) child(key, undefined, a[key]);
      return;
    }
    if (b === a || (b ?? null) === (a ?? null)) return;
    // a value that changed shape, appeared or vanished counts once, not leaf by leaf
    note(b, a);
  }
  walk(before, after);
  budget.nodes -= startNodes - nodes;
  const sizeBefore = compactSize(before);
  return { changed, listed, more: changed - listed.length, complete: nodes > 0, sizeBefore, sizeAfter: compactSize(after) };
}

/** Line diff of one part when both sides are small enough to print, otherwise only its value differences. */
function comparePart(before: unknown, after: unknown, budget: { nodes: number }) {
  const values = valueDifferences(before, after, budget);
  const same = values.complete ? values.changed === 0 : JSON.stringify(before ?? null) === JSON.stringify(after ?? null);
  if (same) return { text: [] as TextChange[], summarised: false, values, same };
  // pretty text is never shorter than compact JSON, so the compact size decides most cases without printing
  const small = values.sizeBefore <= COMPARISON_LIMITS.maxTextDiffChars && values.sizeAfter <= COMPARISON_LIMITS.maxTextDiffChars;
  const before_ = small ? pretty(before) : '';
  const after_ = small ? pretty(after) : '';
  if (!small || before_.length > COMPARISON_LIMITS.maxTextDiffChars || after_.length > COMPARISON_LIMITS.maxTextDiffChars) return { text: [] as TextChange[], summarised: true, values, same };
  return { text: textChanges(before, after), summarised: false, values, same };
}

/** One cell of a comparison: which parts changed, with line diffs below the size cap and value summaries always. */
export function compareCell(label: string, before: VersionCellSnapshot | undefined, after: VersionCellSnapshot | undefined, budget: { nodes: number }): CellComparison {
  const input = comparePart(before?.input, after?.input, budget);
  const output = comparePart(before?.output, after?.output, budget);
  const change = !before ? 'added' : !after ? 'removed' : input.same && output.same ? 'unchanged' : 'changed';
  return {
    label,
    change,
    input: input.text,
    output: output.text,
    inputSummarised: input.summarised,
    outputSummarised: output.summarised,
    inputValues: input.values,
    outputValues: output.values,
  };
}

/** Every cell of two snapshots, in the order they first appear, within one comparison budget. */
export function compareSnapshots(from: VersionSnapshot, to: VersionSnapshot): CellComparison[] {
  const labels = [...new Set([...from.cells.map((c) => c.label), ...to.cells.map((c) => c.label)])];
  const beforeByLabel = new Map(from.cells.map((c) => [c.label, c]));
  const afterByLabel = new Map(to.cells.map((c) => [c.label, c]));
  const budget = { nodes: COMPARISON_LIMITS.maxNodesPerComparison };
  return labels.map((label) => compareCell(label, beforeByLabel.get(label), afterByLabel.get(label), budget));
}
