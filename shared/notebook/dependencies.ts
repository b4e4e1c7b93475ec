import type { CellInput } from './cells';

export interface CellForStaleness {
  id: string;
  label: string;
  input: CellInput;
  /** Fingerprint of the inputs the last finished run was made from, if any. */
  lastRunFingerprint: string | null;
  lastRunStatus: 'done' | 'failed' | 'cancelled' | 'running' | 'queued' | null;
}

/** 'text': the cell holds no computation of its own (notes, model & parameters). */
export type CellState = 'text' | 'never-run' | 'up-to-date' | 'out-of-date' | 'failed' | 'running' | 'broken-reference';

/** Labels a cell takes input from. */
export function dependenciesOf(input: CellInput): string[] {
  return 'uses' in input && input.uses ? [input.uses] : [];
}

/** The dataset a cell reads, if any. */
export function datasetOf(input: CellInput): string | null {
  return input.kind === 'comparison' ? input.dataset : null;
}

/** Content hash of each dataset of the notebook, by label: a cell reading a dataset is out of date when it changes. */
export type DatasetHashes = Map<string, string>;

/** Canonical JSON: keys sorted, so equal inputs give equal strings whatever their key order. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  if (value && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value);
}

/**
 * The fingerprint of a cell: its own input together with everything it depends on, transitively.
 * A run is current exactly when the fingerprint it was made from equals the cell's fingerprint now.
 */
export function fingerprintOf(
  cell: { label: string; input: CellInput },
  byLabel: Map<string, { label: string; input: CellInput }>,
  datasets: DatasetHashes = new Map(),
  seen = new Set<string>(),
): string {
  if (seen.has(cell.label)) throw new Error(`Cells refer to each other in a loop through "${cell.label}"`);
  seen.add(cell.label);
  const upstream = dependenciesOf(cell.input).map((label) => {
    const dependency = byLabel.get(label);
    return dependency ? fingerprintOf(dependency, byLabel, datasets, new Set(seen)) : `missing:${label}`;
  });
  const dataset = datasetOf(cell.input);
  if (dataset === null) return canonicalJson({ input: cell.input, upstream });
  return canonicalJson({ input: cell.input, upstream, dataset: datasets.get(dataset) ?? `missing:${dataset}` });
}

/** The state of every cell, as shown in the notebook. */
export function cellStates(cells: CellForStaleness[], datasets: DatasetHashes = new Map()): Map<string, CellState> {
  const byLabel = new Map(cells.map((cell) => [cell.label, cell]));
  const states = new Map<string, CellState>();
  for (const cell of cells) {
    if (cell.input.kind === 'note' || cell.input.kind === 'setup') {
      states.set(cell.id, 'text');
      continue;
    }
    const dataset = datasetOf(cell.input);
    if (dependenciesOf(cell.input).some((label) => !byLabel.has(label)) || (dataset !== null && !datasets.has(dataset))) {
      states.set(cell.id, 'broken-reference');
      continue;
    }
    if (cell.lastRunStatus === 'running' || cell.lastRunStatus === 'queued') states.set(cell.id, 'running');
    else if (!cell.lastRunFingerprint) states.set(cell.id, 'never-run');
    else if (cell.lastRunFingerprint !== fingerprintOf(cell, byLabel, datasets)) states.set(cell.id, 'out-of-date');
    else if (cell.lastRunStatus === 'failed' || cell.lastRunStatus === 'cancelled') states.set(cell.id, 'failed');
    else states.set(cell.id, 'up-to-date');
  }
  return states;
}

/** Cells that (transitively) take input from the cell labelled `label`, in notebook order. */
export function dependentsOf(label: string, cells: { label: string; input: CellInput }[]): string[] {
  const result: string[] = [];
  const frontier = [label];
  while (frontier.length) {
    const current = frontier.shift()!;
    for (const cell of cells) {
      if (dependenciesOf(cell.input).includes(current) && !result.includes(cell.label)) {
        result.push(cell.label);
        frontier.push(cell.label);
      }
    }
  }
  return cells.map((c) => c.label).filter((l) => result.includes(l));
}
