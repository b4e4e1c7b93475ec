import { z } from 'zod';
import { COMPARABLE_Y_AXES, DATASET_SHAPES, datasetLabel } from './datasets';
import { JOB_LIMITS, MAX_ABS_N, MAX_FIELDS, MAX_SCAN_POINTS } from '../jobs/contract';

/**
 * Cell kinds of a notebook and their inputs. Inputs are validated here, at the edge, before any job
 * is built; the job itself is validated again by the engine's job schema.
 */
export const cellKinds = ['note', 'setup', 'integral', 'flow', 'fixedpoints', 'exponents', 'scan', 'comparison'] as const;
export type CellKind = (typeof cellKinds)[number];

/** What the UI calls each kind. */
export const cellKindTitles: Record<CellKind, string> = {
  note: 'Note',
  setup: 'Model & parameters',
  integral: 'Loop integral',
  flow: 'RG flow',
  fixedpoints: 'Fixed points',
  exponents: 'Critical exponents',
  scan: 'Scan over s',
  comparison: 'Series against data',
};

export const cellLabel = z
  .string()
  .regex(/^[a-z][a-z0-9_]{0,31}$/, 'A label is a lower-case word (letters, digits, _), at most 32 characters');

const decimal = z.string().trim().regex(/^[+-]?(\d+\.?\d*|\.\d+)$/, 'Enter a decimal number, e.g. 1.75');
const symbolOrNumber = z.string().trim().regex(/^([A-Za-z]\w*|[+-]?\d+(\.\d+)?)$/, 'Enter a number, or a symbol name such as N');

const fieldCount = z.number().int().min(1, 'At least one field').max(MAX_FIELDS, `At most ${MAX_FIELDS} field components`);

/** N of a preset: any real number (a decimal is read exactly by the engine) with |N| ≤ MAX_ABS_N; "N" keeps O(N) symbolic. */
const numericN = z.union([z.number(), decimal]).refine((N) => Math.abs(Number(N)) <= MAX_ABS_N, `N must lie between −${MAX_ABS_N} and ${MAX_ABS_N}`);

export const modelSpec = z.discriminatedUnion('preset', [
  z.strictObject({ preset: z.literal('on'), N: z.union([numericN, z.literal('N')], { error: 'Enter a number (e.g. 3, 0.5, −1) or N' }) }),
  z.strictObject({ preset: z.literal('cubic'), N: numericN }),
  z.strictObject({
    preset: z.literal('custom'),
    fields: fieldCount,
    potential: z.string().trim().min(1, 'Type the quartic potential').max(JOB_LIMITS.maxExpressionLength),
  }),
]);
export type ModelSpec = z.infer<typeof modelSpec>;

export const noteInput = z.strictObject({ kind: z.literal('note'), text: z.string().max(20_000) });

const dimension = decimal.refine((v) => Number(v) > 0, 'd must be positive');
const propagatorPower = decimal.refine((v) => Number(v) > 0 && Number(v) <= 2, 's must lie in (0, 2]: s = 2 is the short-range theory');

export const setupInput = z.strictObject({
  kind: z.literal('setup'),
  model: modelSpec,
  d: dimension.optional(),
  s: propagatorPower.optional(),
  loops: z.union([z.literal(1), z.literal(2)]),
  digits: z.number().int().min(JOB_LIMITS.minDigits, `At least ${JOB_LIMITS.minDigits} digits`).max(JOB_LIMITS.maxFlowDigits, `At most ${JOB_LIMITS.maxFlowDigits} digits in a notebook`),
});

const uses = cellLabel.describe('label of the setup cell this cell takes its model and parameters from');

export const integralInput = z.strictObject({
  kind: z.literal('integral'),
  uses: uses.optional(),
  form: z.enum(['laurent', 'bubble']),
  expr: z.string().trim().max(JOB_LIMITS.maxExpressionLength).optional(),
  a: z.string().trim().max(200).optional(),
  b: z.string().trim().max(200).optional(),
  d: z.string().trim().min(1).max(200),
  order: z.number().int().min(0).max(12),
});

export const flowInput = z.strictObject({ kind: z.literal('flow'), uses });
export const fixedPointsInput = z.strictObject({ kind: z.literal('fixedpoints'), uses });
export const exponentsInput = z.strictObject({
  kind: z.literal('exponents'),
  uses,
  fixedPoint: z.string().trim().max(JOB_LIMITS.maxFixedPointName).optional(),
});
export const scanInput = z.strictObject({
  kind: z.literal('scan'),
  uses,
  from: decimal,
  to: decimal,
  points: z.number().int().min(2).max(MAX_SCAN_POINTS),
  quantities: z.array(z.enum(['nuInv', 'nu', 'eta', 'gamma', 'omega', 'Delta_phi2', 'Delta_phi4'])).min(1).max(6),
  deltaSigmaShortRange: decimal.optional(),
});

/**
 * Holds a dataset of the notebook against the series of a scan cell: `uses` names the scan cell (its model,
 * d and range of s), `dataset` the dataset's label. `quantity` defaults to the dataset's y-axis; `xFrom`/`xTo`
 * keep only data inside a range of the data's x (a large dataset must be narrowed to DATASET_LIMITS.maxComparedPoints).
 */
export const comparisonInput = z.strictObject({
  kind: z.literal('comparison'),
  uses: cellLabel.describe('label of the scan cell whose series are compared'),
  dataset: datasetLabel,
  quantity: z.enum(COMPARABLE_Y_AXES).optional(),
  show: z.enum(DATASET_SHAPES).optional(),
  kinks: z.boolean().default(false),
  xFrom: decimal.optional(),
  xTo: decimal.optional(),
}).refine((input) => input.xFrom === undefined || input.xTo === undefined || Number(input.xFrom) < Number(input.xTo), {
  message: 'The end of the range must be larger than its start',
  path: ['xTo'],
});

export const cellInput = z.discriminatedUnion('kind', [noteInput, setupInput, integralInput, flowInput, fixedPointsInput, exponentsInput, scanInput, comparisonInput]);
export type CellInput = z.infer<typeof cellInput>;

export { symbolOrNumber };
