import type { CellInput, CellKind, CellView, DatasetView } from '../../shared/notebook';

/** The label a new cell of this kind gets: the kind's own word, numbered when taken. */
export function freshLabel(kind: CellKind, cells: Pick<CellView, 'label'>[]): string {
  const taken = new Set(cells.map((cell) => cell.label));
  if (!taken.has(kind)) return kind;
  for (let n = 2; ; n += 1) if (!taken.has(`${kind}${n}`)) return `${kind}${n}`;
}

/** The model & parameters cell a new cell refers to: the last one above the end of the notebook. */
export function defaultSetupLabel(cells: Pick<CellView, 'label' | 'kind'>[]): string {
  return [...cells].reverse().find((cell) => cell.kind === 'setup')?.label ?? 'setup';
}

/** The scan a new comparison holds data against: the last scan cell above the end of the notebook. */
export function defaultScanLabel(cells: Pick<CellView, 'label' | 'kind'>[]): string {
  return [...cells].reverse().find((cell) => cell.kind === 'scan')?.label ?? 'scan';
}

export function defaultInput(kind: CellKind, cells: Pick<CellView, 'label' | 'kind'>[], datasets: Pick<DatasetView, 'label' | 'shape'>[] = []): CellInput {
  const uses = defaultSetupLabel(cells);
  switch (kind) {
    case 'note':
      return { kind, text: '' };
    case 'setup':
      return { kind, model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 30 };
    case 'integral':
      return { kind, form: 'bubble', a: 's/2', b: 's/2', d: '2*s - eps', order: 2 };
    case 'flow':
    case 'fixedpoints':
      return { kind, uses };
    case 'exponents':
      return { kind, uses };
    case 'scan':
      return { kind, uses, from: '1.55', to: '1.95', points: 41, quantities: ['nuInv', 'eta'] };
    case 'comparison': {
      const dataset = datasets.at(-1);
      return { kind, uses: defaultScanLabel(cells), dataset: dataset?.label ?? 'data', kinks: dataset?.shape === 'boundary' };
    }
  }
}
