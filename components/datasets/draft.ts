import type { z } from 'zod';
import { datasetDescription, type AxisKind, type AxisSpec, type DatasetDescription, type TablePreview } from '../../shared/notebook/datasets';

export type YErrorKind = 'none' | 'symmetric' | 'asymmetric';
export type HeaderChoice = 'guess' | 'yes' | 'no';

export interface AxisDraft {
  kind: AxisKind;
  label: string;
}

export interface MappingDraft {
  x: number;
  y: number;
  yErrorKind: YErrorKind;
  yError: number;
  yErrorLower: number;
  yErrorUpper: number;
  xError: number | null;
}

/** Everything the form holds besides the table itself; kept whole when the server refuses an upload. */
export interface DatasetDraft {
  header: HeaderChoice;
  mapping: MappingDraft;
  xAxis: AxisDraft;
  yAxis: AxisDraft;
  shape: 'points' | 'boundary';
  label: string;
  name: string;
  source: string;
  note: string;
}

export const emptyDraft = (): DatasetDraft => ({
  header: 'guess',
  mapping: { x: 0, y: 1, yErrorKind: 'none', yError: 2, yErrorLower: 2, yErrorUpper: 3, xError: null },
  xAxis: { kind: 's', label: '' },
  yAxis: { kind: 'nuInv', label: '' },
  shape: 'points',
  label: '',
  name: '',
  source: '',
  note: '',
});

/** Header spellings of the listed quantities, after `normalName`. */
const AXIS_SPELLINGS: Record<string, Exclude<AxisKind, 'other'>> = {
  s: 's',
  sigma: 's',
  d: 'd',
  dim: 'd',
  deltaphi: 'Delta_phi',
  dphi: 'Delta_phi',
  deltaphi2: 'Delta_phi2',
  dphi2: 'Delta_phi2',
  deltaphisq: 'Delta_phi2',
  deltaphi4: 'Delta_phi4',
  dphi4: 'Delta_phi4',
  '1/nu': 'nuInv',
  nuinv: 'nuInv',
  invnu: 'nuInv',
  nu: 'nu',
  eta: 'eta',
  omega: 'omega',
};

function normalName(column: string): string {
  return column
    .toLowerCase()
    .replace(/δ|∆/g, 'delta')
    .replace(/φ|ϕ/g, 'phi')
    .replace(/ν/g, 'nu')
    .replace(/η/g, 'eta')
    .replace(/ω/g, 'omega')
    .replace(/²/g, '2')
    .replace(/⁴/g, '4')
    .replace(/\^/g, '')
    .replace(/[^a-z0-9/]/g, '');
}

/** The axis a column's name suggests; a name that is none of the listed quantities becomes a labelled `other`. */
export function guessAxis(column: string | undefined, fallback: AxisKind): AxisDraft {
  const kind = column === undefined ? undefined : AXIS_SPELLINGS[normalName(column)];
  if (kind) return { kind, label: '' };
  const label = column?.trim().slice(0, 60) ?? '';
  return label && !/^column\s*\d+$/i.test(label) ? { kind: 'other', label } : { kind: fallback, label: '' };
}

const looksLikeError = (name: string) => /err|sigma|σ|unc|±|delta_?y/i.test(name);

/** First two columns as x and y; columns named like errors after them become the y-error. */
export function guessMapping(columns: string[]): MappingDraft {
  const base = emptyDraft().mapping;
  const errors = columns.map((name, index) => ({ name, index })).filter(({ name, index }) => index >= 2 && looksLikeError(name));
  const lower = errors.find(({ name }) => /lo|minus|low|-/i.test(name));
  const upper = errors.find(({ name }) => /hi|plus|up|\+/i.test(name));
  if (lower && upper && lower.index !== upper.index) return { ...base, yErrorKind: 'asymmetric', yErrorLower: lower.index, yErrorUpper: upper.index };
  if (errors[0]) return { ...base, yErrorKind: 'symmetric', yError: errors[0].index };
  return base;
}

/** A fresh draft for a newly read table: mapping and axes from its column names, the rest kept. */
export function draftForColumns(draft: DatasetDraft, columns: string[]): DatasetDraft {
  const mapping = guessMapping(columns);
  return { ...draft, mapping, xAxis: guessAxis(columns[mapping.x], 's'), yAxis: guessAxis(columns[mapping.y], 'nuInv') };
}

/** A dataset label from a file name: a lower-case word, numbered when the notebook already uses it. */
export function labelFromFileName(fileName: string, taken: string[]): string {
  const stem = fileName.replace(/\.[^.]*$/, '').toLowerCase().replace(/[^a-z0-9_]+/g, '_').replace(/^[^a-z]+/, '').replace(/_+$/, '').slice(0, 28) || 'data';
  const used = new Set(taken);
  if (!used.has(stem)) return stem;
  for (let n = 2; ; n += 1) if (!used.has(`${stem}${n}`)) return `${stem}${n}`;
}

export const nameFromFileName = (fileName: string) => fileName.replace(/\.[^.]*$/, '').replace(/[_-]+/g, ' ').trim();

const axisOf = (axis: AxisDraft): AxisSpec => (axis.kind === 'other' ? { kind: 'other', label: axis.label } : { kind: axis.kind });

export function mappingOf(mapping: MappingDraft): DatasetDescription['mapping'] {
  const yError =
    mapping.yErrorKind === 'symmetric'
      ? { kind: 'symmetric' as const, column: mapping.yError }
      : mapping.yErrorKind === 'asymmetric'
        ? { kind: 'asymmetric' as const, lower: mapping.yErrorLower, upper: mapping.yErrorUpper }
        : { kind: 'none' as const };
  return { x: mapping.x, y: mapping.y, yError, ...(mapping.xError === null ? {} : { xError: mapping.xError }) };
}

/** The description the API receives: the draft, and the header as the preview read it (so both read the same rows). */
export function descriptionOf(draft: DatasetDraft, preview: TablePreview | null): DatasetDescription {
  const header = draft.header === 'guess' ? preview?.header : draft.header === 'yes';
  return {
    label: draft.label.trim(),
    name: draft.name.trim(),
    source: draft.source.trim(),
    note: draft.note,
    shape: draft.shape,
    xAxis: axisOf(draft.xAxis),
    yAxis: axisOf(draft.yAxis),
    mapping: mappingOf(draft.mapping),
    ...(header === undefined ? {} : { header }),
  };
}

/** Field messages keyed by dotted path (`label`, `xAxis.label`, `mapping.y`), the first per field. */
export function fieldProblems(issues: z.ZodError['issues'] | undefined): Record<string, string> {
  const problems: Record<string, string> = {};
  for (const issue of issues ?? []) {
    const key = issue.path.join('.');
    problems[key] ??= issue.message;
  }
  return problems;
}

export function validate(description: DatasetDescription): Record<string, string> {
  const parsed = datasetDescription.safeParse(description);
  return parsed.success ? {} : fieldProblems(parsed.error.issues);
}
