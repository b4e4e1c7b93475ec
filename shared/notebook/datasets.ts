import { z } from 'zod';

/**
 * Datasets: numerical results (Monte Carlo exponents, bootstrap boundary curves) attached to a notebook
 * and held against its series. This module is the contract of that boundary: limits, axis kinds, the
 * column mapping chosen at upload, the stored points and the replies the API sends.
 *
 * A dataset's points never change once stored (a new mapping is a new upload); versions of the notebook
 * name the datasets they hold by id, so a restored version brings its datasets back unchanged.
 */
export const DATASET_LIMITS = {
  /** Bytes of an uploaded file. */
  maxFileBytes: 10 * 1024 * 1024,
  /** Data rows of one dataset (the header is not counted). */
  maxRows: 200_000,
  /** Characters of a table pasted into the form. */
  maxPastedChars: 200_000,
  maxColumns: 64,
  /** Datasets a notebook holds at once. */
  maxPerNotebook: 20,
  /** Characters of stored points (JSON) of a notebook's current datasets together: its exchange file stays importable. */
  maxNotebookBytes: 10 * 1024 * 1024,
  /** Characters of stored points of all a notebook keeps, with removed datasets its versions still hold. */
  maxStoredNotebookBytes: 60 * 1024 * 1024,
  /** Points a comparison or kink job takes (choose an x-range to compare part of a larger dataset). */
  maxComparedPoints: 5000,
  /** Fewest points a smoothing spline and the kink locator accept. */
  minKinkPoints: 8,
  maxSourceChars: 500,
  maxNoteChars: 4000,
  maxNameChars: 120,
} as const;

/** What an axis measures: the trade's quantities, or a label of the user's own (`other`). */
export const AXIS_KINDS = ['s', 'Delta_phi', 'd', 'Delta_phi2', 'nuInv', 'nu', 'eta', 'omega', 'Delta_phi4', 'other'] as const;
export type AxisKind = (typeof AXIS_KINDS)[number];

/** How the UI writes each axis kind (KaTeX). */
export const AXIS_TEX: Record<Exclude<AxisKind, 'other'>, string> = {
  s: 's',
  Delta_phi: '\\Delta_\\phi',
  d: 'd',
  Delta_phi2: '\\Delta_{\\phi^2}',
  nuInv: '1/\\nu',
  nu: '\\nu',
  eta: '\\eta',
  omega: '\\omega',
  Delta_phi4: '\\Delta_{\\phi^4}',
};

/** Plain-text names of the axis kinds (menus, CSV headers). */
export const AXIS_NAMES: Record<Exclude<AxisKind, 'other'>, string> = {
  s: 's',
  Delta_phi: 'Δφ',
  d: 'd',
  Delta_phi2: 'Δφ²',
  nuInv: '1/ν',
  nu: 'ν',
  eta: 'η',
  omega: 'ω',
  Delta_phi4: 'Δφ⁴',
};

/** Axes a comparison can put the series on: the series are functions of s at fixed d. */
export const COMPARABLE_X_AXES = ['s', 'Delta_phi'] as const;
/** y-axes that name a series quantity of a scan. */
export const COMPARABLE_Y_AXES = ['nuInv', 'nu', 'eta', 'omega', 'Delta_phi2', 'Delta_phi4'] as const;

export const axisSpec = z.strictObject({
  kind: z.enum(AXIS_KINDS),
  /** Required for `other`; an optional unit or remark for the others. */
  label: z.string().trim().max(60).optional(),
}).refine((axis) => axis.kind !== 'other' || !!axis.label, { message: 'Name this axis (it is not one of the listed quantities)', path: ['label'] });
export type AxisSpec = z.infer<typeof axisSpec>;

/** A column is chosen by its 0-based index in the parsed table. */
const columnIndex = z.number().int().min(0).max(DATASET_LIMITS.maxColumns - 1);

/**
 * Which columns hold what. y-errors are either one symmetric column or a lower and an upper column
 * (both given as positive distances from y).
 */
export const columnMapping = z
  .strictObject({
    x: columnIndex,
    y: columnIndex,
    yError: z
      .discriminatedUnion('kind', [
        z.strictObject({ kind: z.literal('none') }),
        z.strictObject({ kind: z.literal('symmetric'), column: columnIndex }),
        z.strictObject({ kind: z.literal('asymmetric'), lower: columnIndex, upper: columnIndex }),
      ])
      .default({ kind: 'none' }),
    xError: columnIndex.optional(),
  })
  .refine((m) => m.x !== m.y, { message: 'x and y must be different columns', path: ['y'] });
export type ColumnMapping = z.infer<typeof columnMapping>;

/** Points as stored and sent: columns of decimal text exactly as read (no rounding), sorted by x. */
export interface DatasetPoints {
  x: string[];
  y: string[];
  yErrLow?: string[];
  yErrHigh?: string[];
  xErr?: string[];
}

export const datasetLabel = z
  .string()
  .regex(/^[a-z][a-z0-9_]{0,31}$/, 'A label is a lower-case word (letters, digits, _), at most 32 characters');

/** How the data is drawn: separate measurements with error bars, or the edge of an allowed region. */
export const DATASET_SHAPES = ['points', 'boundary'] as const;

/** Everything but the table itself, given with an upload or a pasted table. */
export const datasetDescription = z.strictObject({
  label: datasetLabel,
  name: z.string().trim().min(1, 'Give the dataset a name').max(DATASET_LIMITS.maxNameChars),
  source: z.string().trim().max(DATASET_LIMITS.maxSourceChars).default(''),
  note: z.string().max(DATASET_LIMITS.maxNoteChars).default(''),
  shape: z.enum(DATASET_SHAPES).default('points'),
  xAxis: axisSpec,
  yAxis: axisSpec,
  mapping: columnMapping,
  /** Whether the first row names the columns (default: guessed, a first row with any non-number is a header). */
  header: z.boolean().optional(),
});
export type DatasetDescription = z.infer<typeof datasetDescription>;

/** A pasted table: the same description, with the text in the body. */
export const pastedDataset = datasetDescription.safeExtend({
  text: z.string().min(1, 'Paste a table').max(DATASET_LIMITS.maxPastedChars, `At most ${DATASET_LIMITS.maxPastedChars.toLocaleString('en')} characters can be pasted; upload a file for more`),
});
export type PastedDataset = z.infer<typeof pastedDataset>;

/** Reading a table without storing it: the columns, the first rows and the problems found, for the mapping form. */
export const previewRequest = z.strictObject({ text: z.string().min(1).max(DATASET_LIMITS.maxPastedChars), header: z.boolean().optional() });

export interface TablePreview {
  delimiter: ',' | '\t' | ';' | ' ';
  header: boolean;
  columns: string[];
  /** Up to 20 first data rows, as text. */
  rows: string[][];
  rowCount: number;
}

/** One problem with one row: 1-based line number in the file, the column's name and why. */
export interface RowProblem {
  line: number;
  column?: string;
  reason: string;
}

/** What the API sends for a dataset (without its points). */
export interface DatasetView {
  id: string;
  label: string;
  name: string;
  source: string;
  note: string;
  shape: (typeof DATASET_SHAPES)[number];
  xAxis: AxisSpec;
  yAxis: AxisSpec;
  hasYErrors: 'none' | 'symmetric' | 'asymmetric';
  hasXErrors: boolean;
  rowCount: number;
  xRange: [string, string];
  yRange: [string, string];
  fileName: string | null;
  contentHash: string;
  createdAt: string;
  createdByName: string;
}

export interface DatasetWithPoints extends DatasetView {
  points: DatasetPoints;
}

/** A dataset in the notebook exchange file and in version snapshots of the file format. */
export const exportedDataset = z.strictObject({
  label: datasetLabel,
  name: z.string().trim().min(1).max(DATASET_LIMITS.maxNameChars),
  source: z.string().max(DATASET_LIMITS.maxSourceChars).default(''),
  note: z.string().max(DATASET_LIMITS.maxNoteChars).default(''),
  shape: z.enum(DATASET_SHAPES).default('points'),
  xAxis: axisSpec,
  yAxis: axisSpec,
  fileName: z.string().max(200).nullable().optional(),
  points: z.strictObject({
    x: z.array(z.string().max(60)).max(DATASET_LIMITS.maxRows),
    y: z.array(z.string().max(60)).max(DATASET_LIMITS.maxRows),
    yErrLow: z.array(z.string().max(60)).max(DATASET_LIMITS.maxRows).optional(),
    yErrHigh: z.array(z.string().max(60)).max(DATASET_LIMITS.maxRows).optional(),
    xErr: z.array(z.string().max(60)).max(DATASET_LIMITS.maxRows).optional(),
  }),
});
export type ExportedDataset = z.infer<typeof exportedDataset>;

/** The exact conversion the comparison uses: Δφ = (d − s)/2 in the long-range theory (s < 2), so s = d − 2Δφ. */
export const S_FROM_DELTA_PHI = 's = d - 2*Delta_phi';
